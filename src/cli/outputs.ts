/**
 * Writing a run's outputs so that a failure never leaves a half-written appendix over a good one:
 * everything is computed in memory first, each file is written beside its final name, and only when
 * all of them were written are they renamed into place. The earlier outputs they replace are moved
 * aside first and put back if any rename fails, so the folder holds either the whole old set or the
 * whole new one; files of the folder that this run does not write are never touched.
 */
import { existsSync, lstatSync, mkdirSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';

export interface OutputFile {
  name: string;
  data: string | Buffer;
}

/** The file operations used, so tests can make one of them fail part-way. */
export interface OutputFs {
  mkdir(path: string): void;
  write(path: string, data: string | Buffer): void;
  rename(from: string, to: string): void;
  remove(path: string): void;
  /** 'file', 'other' (a directory, a link…) or undefined when nothing is there. */
  kind(path: string): 'file' | 'other' | undefined;
}

export const nodeOutputFs: OutputFs = {
  mkdir: (path) => mkdirSync(path, { recursive: true }),
  write: (path, data) => writeFileSync(path, data),
  rename: (from, to) => renameSync(from, to),
  remove: (path) => rmSync(path, { force: true }),
  kind: (path) => (existsSync(path) || isLink(path) ? (lstatSync(path).isFile() ? 'file' : 'other') : undefined),
};

function isLink(path: string): boolean {
  try {
    return lstatSync(path).isSymbolicLink();
  } catch {
    return false;
  }
}

/** An output could not be written; the folder was left as it was. */
export class OutputWriteError extends Error {
  constructor(message: string, override readonly cause?: unknown) {
    super(message);
    this.name = 'OutputWriteError';
  }
}

export function writeOutputs(dir: string, files: OutputFile[], fs: OutputFs = nodeOutputFs): string[] {
  const tag = `${process.pid}`;
  const staged: { tmp: string; final: string; old?: string }[] = [];
  const discardStaged = () => {
    for (const s of staged) tryQuietly(() => fs.remove(s.tmp));
  };
  try {
    fs.mkdir(dir);
    for (const f of files) {
      const final = join(dir, f.name);
      // Only regular files are replaced: a directory or link of that name is the user's, not ours.
      if (fs.kind(final) === 'other') throw new OutputWriteError(`${final} exists and is not a file; it was left alone`);
      fs.mkdir(dirname(final));
      const tmp = join(dirname(final), `.${f.name.replace(/[\\/]/g, '_')}.${tag}.partial`);
      staged.push({ tmp, final });
      fs.write(tmp, f.data);
    }
  } catch (err) {
    discardStaged();
    throw asWriteError(err, dir);
  }
  // Move each earlier output aside, then the new one in; on any failure undo what was done.
  const done: { tmp: string; final: string; old?: string }[] = [];
  try {
    for (const s of staged) {
      if (fs.kind(s.final) === 'file') {
        const old = join(dirname(s.final), `.${s.final.slice(dirname(s.final).length + 1)}.${tag}.old`);
        fs.rename(s.final, old);
        s.old = old;
      }
      done.push(s);
      fs.rename(s.tmp, s.final);
    }
  } catch (err) {
    for (const s of done.reverse()) {
      if (s.old) tryQuietly(() => fs.rename(s.old!, s.final));
      else tryQuietly(() => (fs.kind(s.final) === 'file' ? fs.remove(s.final) : undefined));
    }
    discardStaged();
    throw asWriteError(err, dir);
  }
  for (const s of staged) if (s.old) tryQuietly(() => fs.remove(s.old!));
  return staged.map((s) => s.final);
}

function tryQuietly(fn: () => unknown): void {
  try {
    fn();
  } catch {
    // Best effort while undoing; the original failure is what gets reported.
  }
}

function asWriteError(err: unknown, dir: string): OutputWriteError {
  if (err instanceof OutputWriteError) return err;
  const e = err as NodeJS.ErrnoException;
  const what = e?.code ? `${e.code}${e.path ? ` (${e.path})` : ''}` : err instanceof Error ? err.message : String(err);
  return new OutputWriteError(`could not write the outputs to ${dir}: ${what}; earlier outputs there are as they were`, err);
}
