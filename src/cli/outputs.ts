/**
 * Writing a run's outputs so that a failure never leaves a half-written appendix over a good one:
 * everything is computed in memory first, each file is written beside its final name and renamed
 * into place only when all of them were written.
 */
import { mkdirSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';

export interface OutputFile {
  name: string;
  data: string | Buffer;
}

export function writeOutputs(dir: string, files: OutputFile[]): string[] {
  mkdirSync(dir, { recursive: true });
  const staged: { tmp: string; final: string }[] = [];
  try {
    for (const f of files) {
      const final = join(dir, f.name);
      mkdirSync(dirname(final), { recursive: true });
      const tmp = join(dirname(final), `.${f.name.replace(/[\\/]/g, '_')}.${process.pid}.partial`);
      writeFileSync(tmp, f.data);
      staged.push({ tmp, final });
    }
  } catch (err) {
    for (const s of staged) rmSync(s.tmp, { force: true });
    throw err;
  }
  for (const s of staged) renameSync(s.tmp, s.final);
  return staged.map((s) => s.final);
}
