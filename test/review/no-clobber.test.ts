/** The general check that no command writes over a file it read (run, compare, archive, import…). */
import { linkSync, mkdirSync, mkdtempSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { refuseOutputsThatAreInputs } from '../../src/cli/no-clobber.js';
import { StudyError } from '../../src/study/errors.js';

const dir = mkdtempSync(join(tmpdir(), 'faultbook-clobber-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('refuseOutputsThatAreInputs', () => {
  const study = join(dir, 'study');
  mkdirSync(join(study, 'data'), { recursive: true });
  const input = join(study, 'data', 'lives.csv');
  writeFileSync(input, 'life\n');
  const inputs = [input, join(study, 'study.yaml')];

  it('refuses an output that is an input, by the same path written differently', () => {
    expect(() => refuseOutputsThatAreInputs('run', [join(study, 'data', '..', 'data', 'lives.csv')], inputs)).toThrow(StudyError);
    expect(() => refuseOutputsThatAreInputs('run', [input], inputs)).toThrow(/a file this command reads/);
  });

  it('refuses an input reached through a symbolic link to its folder, a link to the file, or a hard link', () => {
    symlinkSync(study, join(dir, 'study-link'));
    expect(() => refuseOutputsThatAreInputs('run', [join(dir, 'study-link', 'data', 'lives.csv')], inputs)).toThrow(StudyError);
    symlinkSync(input, join(dir, 'file-link.csv'));
    expect(() => refuseOutputsThatAreInputs('run', [join(dir, 'file-link.csv')], inputs)).toThrow(StudyError);
    linkSync(input, join(dir, 'hard-link.csv'));
    expect(() => refuseOutputsThatAreInputs('archive', [join(dir, 'hard-link.csv')], inputs)).toThrow(StudyError);
  });

  it('accepts outputs beside the inputs and outputs in folders that do not exist yet', () => {
    expect(() => refuseOutputsThatAreInputs('run', [join(study, 'data', 'results.json'), join(dir, 'out', 'new', 'appendix.pdf')], inputs)).not.toThrow();
  });
});
