/** Where faultbook is installed and what version it is: read once from its own package.json. */
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

/** src/package.ts and dist/package.js both sit one level below the package root. */
export const packageRoot = join(dirname(fileURLToPath(import.meta.url)), '..');

const manifest = JSON.parse(readFileSync(join(packageRoot, 'package.json'), 'utf8')) as { version: string };

export const toolVersion: string = manifest.version;
