// Run by vitest before each test file (vitest.config.ts setupFiles): clean up its temporary folders.
import { afterAll } from 'vitest';
import { removeTempDirs } from './temp.js';

afterAll(() => removeTempDirs());
