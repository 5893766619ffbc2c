/**
 * Writing a run's outputs so that a failure never leaves a half-written appendix over a good one:
 * everything is computed in memory first, each file is written beside its final name, and only when
 * all of them were written are they renamed into place. The earlier outputs they replace are moved
 * aside first and put back if any rename fails, so the folder holds either the whole old set or the
 * whole new one; files of the folder that this run does not write are never touched.
 *
 * Staging names are `.NAME.<pid>.<random>.partial` (and `.old` for the earlier file moved aside),
 * created exclusively (O_EXCL: an existing file or symbolic link of that name makes the write fail,
 * it is never followed), so another user of a shared output folder cannot steer the write to a file
 * of their choice. SIGINT and SIGTERM wait until the set is in place or undone; leftovers of a run
 * killed outright (SIGKILL, power loss) are cleaned by the next run into the same folder.
 */
import { randomBytes } from 'node:crypto';
import { existsSync, lstatSync, mkdirSync, readdirSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';

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
  // 'wx': create exclusively, never through an existing name or link.
  write: (path, data) => writeFileSync(path, data, { flag: 'wx' }),
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
  return withSignalsDeferred(() => writeOutputsNow(dir, files, fs));
}

function writeOutputsNow(dir: string, files: OutputFile[], fs: OutputFs): string[] {
  const tag = `${process.pid}.${randomBytes(6).toString('hex')}`;
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
      cleanLeftovers(dirname(final), basename(final), fs);
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

/** `.NAME.<pid>[.<random>].partial|old`: a staging file of ours, with the pid of the run that made it. */
const STAGING = /^\.(.+)\.(\d+)(?:\.[0-9a-f]+)?\.(partial|old)$/;

/**
 * Removes the staging files a killed run left beside `name` in `dir`; an `.old` whose final file is
 * missing was the earlier output moved aside when the run died, so it is put back instead. Files of
 * a run still alive (its pid answers) are left to it.
 */
function cleanLeftovers(dir: string, name: string, fs: OutputFs): void {
  let entries: string[];
  try {
    entries = readdirSync(dir);
  } catch {
    return;
  }
  for (const entry of entries) {
    const m = STAGING.exec(entry);
    if (!m || m[1] !== name || processAlive(Number(m[2]))) continue;
    const path = join(dir, entry);
    const final = join(dir, name);
    tryQuietly(() => {
      if (m[3] === 'old' && fs.kind(final) === undefined && fs.kind(path) === 'file') fs.rename(path, final);
      else if (isLink(path) || fs.kind(path) === 'file') fs.remove(path);
    });
  }
}

function processAlive(pid: number): boolean {
  if (pid === process.pid) return false;
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    // EPERM: it exists but is someone else's, so it may be writing.
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/**
 * Runs `fn` (synchronous) with SIGINT and SIGTERM held: Node delivers a signal to a listener only
 * between synchronous stretches, so the write completes or is undone first, and the process then
 * ends as the signal asked (exit status 128 + its number).
 */
function withSignalsDeferred<T>(fn: () => T): T {
  const signals: NodeJS.Signals[] = ['SIGINT', 'SIGTERM'];
  const codes: Record<string, number> = { SIGINT: 130, SIGTERM: 143 };
  const onSignal = (signal: NodeJS.Signals) => process.exit(codes[signal] ?? 1);
  for (const s of signals) process.on(s, onSignal);
  try {
    return fn();
  } finally {
    // A signal that arrived meanwhile is dispatched on the next turn of the event loop: keep
    // listening until then so it ends the process instead of being lost.
    setImmediate(() => {
      for (const s of signals) process.off(s, onSignal);
    });
  }
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
