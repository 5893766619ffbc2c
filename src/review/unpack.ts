/**
 * Unpacking checked archive entries into a fresh temporary folder. The entry paths were already
 * refused by readTar if unsafe; here each target is checked once more to lie inside the folder,
 * and files are created exclusively (never written through something that is already there).
 */
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, isAbsolute, join, relative, resolve } from 'node:path';
import { ArchiveFormatError, checkPath, type TarFile } from './tar.js';

export interface Unpacked {
  dir: string;
  /** Remove the folder and everything in it. */
  dispose(): void;
}

export function unpackToTemp(files: TarFile[], prefix = 'faultbook-verify-'): Unpacked {
  const dir = mkdtempSync(join(tmpdir(), prefix));
  const dispose = () => rmSync(dir, { recursive: true, force: true });
  try {
    for (const f of files) {
      checkPath(f.path, false);
      const target = resolve(dir, ...f.path.split('/'));
      const rel = relative(dir, target);
      if (rel === '' || rel.startsWith('..') || isAbsolute(rel)) throw new ArchiveFormatError(`entry '${f.path}' would land outside the folder it is unpacked into`);
      mkdirSync(dirname(target), { recursive: true });
      writeFileSync(target, f.data, { flag: 'wx', mode: 0o644 });
    }
  } catch (err) {
    dispose();
    throw err;
  }
  return { dir, dispose };
}
