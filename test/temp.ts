/**
 * Temporary folders for tests, removed after each test file: every helper that makes one calls
 * `tempDir`, and test/setup.ts removes them all in an afterAll hook, so no test leaves its
 * folders in the system's temporary directory (a test that forgets its own cleanup included).
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const made: string[] = [];

/** A new empty folder under the system's temporary directory, removed when the test file ends. */
export function tempDir(prefix = 'faultbook-test-'): string {
  const dir = mkdtempSync(join(tmpdir(), prefix));
  made.push(dir);
  return dir;
}

/** Remove every folder `tempDir` made so far (the setup file calls it after each test file). */
export function removeTempDirs(): void {
  for (const dir of made.splice(0)) rmSync(dir, { recursive: true, force: true });
}
