/** Run the faultbook command in-process with captured output. */
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../../src/cli/main.js';

export interface Captured {
  code: number;
  stdout: string;
  stderr: string;
}

export async function faultbook(...argv: string[]): Promise<Captured> {
  let stdout = '';
  let stderr = '';
  const code = await main(argv, { stdout: (t) => (stdout += t), stderr: (t) => (stderr += t), isTTY: false });
  return { code, stdout, stderr };
}

export function tempDir(prefix = 'faultbook-test-'): string {
  return mkdtempSync(join(tmpdir(), prefix));
}
