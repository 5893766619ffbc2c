/**
 * Unpacking checked archive entries into a fresh temporary folder. The entry paths were already
 * refused by readTar if unsafe; here each target is checked once more to lie inside the folder,
 * and files are created exclusively (never written through something that is already there).
 *
 * The folder is removed by `dispose()`, on any error while unpacking, when the process exits, and
 * on SIGINT, SIGTERM or SIGHUP (after which the signal is raised again, so the exit status still
 * says what stopped the process). Signal handlers are installed only while a folder exists: the
 * long computation that follows runs with the default handlers, so Ctrl-C stops it at once.
 */
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, isAbsolute, join, relative, resolve } from 'node:path';
import { ArchiveFormatError, checkPath, type TarFile } from './tar.js';

export interface Unpacked {
  dir: string;
  /** Remove the folder and everything in it (safe to call twice). */
  dispose(): void;
}

const SIGNALS = ['SIGINT', 'SIGTERM', 'SIGHUP'] as const;
const live = new Set<string>();
let installed = false;

function removeAll(): void {
  for (const dir of live) rmSync(dir, { recursive: true, force: true });
  live.clear();
}

function onSignal(signal: NodeJS.Signals): void {
  removeAll();
  uninstall();
  // With our handlers gone the signal has its usual effect (and exit status) again.
  process.kill(process.pid, signal);
}

function install(): void {
  if (installed) return;
  installed = true;
  for (const s of SIGNALS) process.on(s, onSignal);
  process.on('exit', removeAll);
}

function uninstall(): void {
  if (!installed) return;
  installed = false;
  for (const s of SIGNALS) process.removeListener(s, onSignal);
  process.removeListener('exit', removeAll);
}

/**
 * Let a signal that arrived while synchronous work ran reach the handlers (the event loop delivers
 * it), then remove the handlers if no folder is left. Two turns of the loop: a poll phase, where
 * signals are delivered, always lies between them.
 */
export async function releaseSignalHandlers(): Promise<void> {
  await new Promise<void>((r) => setImmediate(r));
  await new Promise<void>((r) => setImmediate(r));
  if (live.size === 0) uninstall();
}

/** The temporary folders that exist now (for tests). */
export function liveTempFolders(): string[] {
  return [...live];
}

export function unpackToTemp(files: TarFile[], prefix = 'faultbook-verify-'): Unpacked {
  install();
  const dir = mkdtempSync(join(tmpdir(), prefix));
  live.add(dir);
  const dispose = () => {
    rmSync(dir, { recursive: true, force: true });
    live.delete(dir);
  };
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
    const code = (err as NodeJS.ErrnoException)?.code;
    // readTar refuses a path that is both a file and a folder; should one slip through, it is still the archive's fault.
    if (code === 'EEXIST' || code === 'ENOTDIR') throw new ArchiveFormatError(`the archive cannot be unpacked: a path is both a file and a folder (${code})`);
    throw err;
  }
  return { dir, dispose };
}
