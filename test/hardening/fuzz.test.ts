/**
 * Fuzzing the reader and the analysis behind it (fast-check; generators in fuzz-model.ts): whatever
 * the study folder holds, the result is a Study (and results) or a StudyError / StudyErrors with real
 * positions, never another exception, never a hang. Seeds are fixed so a failure reproduces; the
 * longer, nightly-style run is `npx tsx scripts/fuzz-long.ts [cases] [seed]`.
 */
import { join } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { tempDir } from '../cli/helpers.js';
import { BASE_FILES, extremeValueCase, rawBytesCase, runCase, structureCase, textMutationCase } from './fuzz-model.js';

const CASES = { raw: 800, text: 1000, structure: 1200, extreme: 1000 };

describe('fuzzing the study reader', () => {
  const dir = join(tempDir('faultbook-fuzz-'), 'study');

  it('the unmutated base is accepted (so refusals below are the mutations’ doing)', () => {
    expect(runCase(dir, BASE_FILES)).toBe('accepted');
  });

  it(`raw bytes in a study file: ${CASES.raw} cases`, () => {
    fc.assert(fc.property(rawBytesCase(), (c) => void runCase(dir, c)), { numRuns: CASES.raw, seed: 1 });
  }, 120_000);

  it(`YAML-significant edits of the valid text: ${CASES.text} cases`, () => {
    let accepted = 0;
    fc.assert(fc.property(textMutationCase(), (c) => void (runCase(dir, c) === 'accepted' && accepted++)), { numRuns: CASES.text, seed: 2 });
    // Some edits land in comments or titles and leave a valid study: the generator reaches both outcomes.
    expect(accepted).toBeGreaterThan(0);
  }, 120_000);

  it(`mutated study structures: ${CASES.structure} cases`, () => {
    let accepted = 0;
    fc.assert(fc.property(structureCase(), (c) => void (runCase(dir, c) === 'accepted' && accepted++)), { numRuns: CASES.structure, seed: 3 });
    expect(accepted).toBeGreaterThan(0);
  }, 120_000);

  it(`extreme numbers in a valid study: ${CASES.extreme} cases`, () => {
    let accepted = 0;
    fc.assert(fc.property(extremeValueCase(), (c) => void (runCase(dir, c) === 'accepted' && accepted++)), { numRuns: CASES.extreme, seed: 4 });
    // A good share are valid studies (the rest put a number where a date or a unit belongs), so the
    // failure models, the logic and the analyses do see the extremes.
    expect(accepted).toBeGreaterThan(CASES.extreme / 10);
  }, 120_000);
});
