/**
 * No command writes over a file it read: `archive STUDY --out STUDY/events.yaml` would replace an
 * input with the archive of it. Every command that reads files and writes outputs (run, compare,
 * archive, import, …) calls `refuseOutputsThatAreInputs` with both lists before it writes.
 *
 * Two paths are the same file when they resolve to the same place after following links in the
 * folders above them, or (both existing) when they are the same file on disk: a hard link or a
 * symbolic link to an input counts as the input.
 */
import { realpathSync, statSync } from 'node:fs';
import { basename, dirname, resolve } from 'node:path';
import { StudyError } from '../study/errors.js';

/** The path with every existing folder above it resolved through links. */
function canonical(path: string): string {
  const full = resolve(path);
  try {
    return realpathSync(full);
  } catch {
    // Not there yet (an output): resolve the nearest folder that exists.
    const parent = dirname(full);
    return parent === full ? full : resolve(canonical(parent), basename(full));
  }
}

/** Device and inode of an existing file, to catch hard links; undefined when there is none. */
function identity(path: string): string | undefined {
  try {
    const s = statSync(path);
    return s.isFile() ? `${s.dev}:${s.ino}` : undefined;
  } catch {
    return undefined;
  }
}

/** Throws an input error (exit 2, nothing written) when an output path is one of the input files. */
export function refuseOutputsThatAreInputs(command: string, outputs: string[], inputs: string[]): void {
  const byPath = new Map<string, string>();
  const byIdentity = new Map<string, string>();
  for (const input of inputs) {
    byPath.set(canonical(input), input);
    const id = identity(input);
    if (id) byIdentity.set(id, input);
  }
  for (const output of outputs) {
    const input = byPath.get(canonical(output)) ?? byIdentity.get(identity(output) ?? '');
    if (input !== undefined) {
      throw new StudyError(
        `faultbook ${command}: the output ${output} is ${input}, a file this command reads; writing it would destroy that input`,
        undefined,
        'an output path outside the inputs, e.g. a file or folder under out/',
      );
    }
  }
}
