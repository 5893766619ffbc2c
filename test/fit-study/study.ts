// The small study the fit-in-a-study tests run: test/fixtures/fit-study (an INVENTED scenario)
// copied into a fresh folder, with the shared reference life records copied into its data/ folder.
import { copyFileSync, cpSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { analyze } from '../../src/analysis/analyze.js';
import type { FitResult, Results } from '../../src/analysis/results.js';
import { readStudy } from '../../src/study/read.js';
import type { Study } from '../../src/study/types.js';
import { tempDir } from '../cli/helpers.js';
import { BALL_BEARINGS_PATH } from '../fit/helpers.js';

export { BALL_BEARINGS_PATH };

export const FIXTURE = join('test', 'fixtures', 'fit-study');

/** The study's data file, as the study names it. */
export const DATA = 'data/ball-bearings.csv';

/**
 * A fresh copy of the fixture study with the reference CSV as its data. `edit` may change the copied
 * files (given the study folder) before anything reads them.
 */
export function buildStudy(edit?: (dir: string) => void): string {
  const dir = join(tempDir('faultbook-fit-study-'), 'study');
  cpSync(FIXTURE, dir, { recursive: true });
  mkdirSync(join(dir, 'data'), { recursive: true });
  copyFileSync(BALL_BEARINGS_PATH, join(dir, DATA));
  edit?.(dir);
  return dir;
}

/** Replace text in one file of a study folder; fails loudly when the text is not there. */
export function replaceIn(dir: string, file: string, from: string | RegExp, to: string): void {
  const path = join(dir, file);
  const text = readFileSync(path, 'utf8');
  const next = text.replace(from, to);
  if (next === text) throw new Error(`replaceIn: ${String(from)} not found in ${file}`);
  writeFileSync(path, next);
}

/** Read and analyse a study in-process (no outputs written). */
export function analyzeStudy(dir: string): { study: Study; results: Results } {
  const study = readStudy(dir);
  return { study, results: analyze(study) };
}

export function onlyFit(results: Results): FitResult {
  const fits = results.fits ?? [];
  if (fits.length !== 1) throw new Error(`expected one fit, got ${fits.length}`);
  return fits[0]!;
}

/** The 23 lives of the reference file, in file order (they are sorted there). */
export function referenceLives(): number[] {
  return readFileSync(BALL_BEARINGS_PATH, 'utf8')
    .split('\n')
    .filter((l) => /^\d/.test(l))
    .map((l) => Number(l.split(',')[0]));
}
