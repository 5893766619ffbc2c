/** Run the faultbook command in-process with captured output. */
import { main } from '../../src/cli/main.js';
import { tempDir } from '../temp.js';

/** Temporary folders are made (and removed after each test file) by test/temp.ts. */
export { tempDir };

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
