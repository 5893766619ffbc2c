// Shared by the life-data fit tests: the reference data and seeded samples.
import { readFileSync } from 'node:fs';
import { createRng } from '../../src/reliability/random.js';
import type { LifeObservation } from '../../src/reliability/fit/index.js';
import { fitData, parseLifeData } from '../../src/study/life-data.js';

// A copy of shared/reference/ball-bearings.csv (Lieblein & Zelen 1956 data, source in its header), kept in
// the repository so the tests do not depend on where the shared folder sits.
export const BALL_BEARINGS_PATH = 'test/fixtures/reference/ball-bearings.csv';

/**
 * The file's lives are millions of revolutions, bare; the fits are unit-free, so they are read as if
 * in years (the unit the published estimates are then in, one for one).
 */
export const BALL_BEARINGS_UNIT = { lifeUnit: 'years' } as const;

/** Lieblein & Zelen (1956) ball-bearing fatigue lives (23, all failures), read through our own parser. */
export function ballBearings(): LifeObservation[] {
  return fitData(parseLifeData(readFileSync(BALL_BEARINGS_PATH, 'utf8'), 'ball-bearings.csv', BALL_BEARINGS_UNIT));
}

/**
 * Weibull lives by inversion, t = γ + η(−ln(1 − u))^(1/β), from the project's seeded generator, with
 * optional random right-censoring at a uniform time on (0, censorMax). An invented sample.
 */
export function weibullSample(
  seed: number,
  n: number,
  shape: number,
  scale: number,
  options: { location?: number; censorMax?: number } = {},
): LifeObservation[] {
  const rng = createRng(seed);
  const out: LifeObservation[] = [];
  for (let i = 0; i < n; i++) {
    const life = (options.location ?? 0) + scale * Math.pow(-Math.log(1 - rng.next()), 1 / shape);
    if (options.censorMax !== undefined) {
      const c = rng.next() * options.censorMax;
      out.push(c < life ? { time: c, failed: false } : { time: life, failed: true });
    } else {
      out.push({ time: life, failed: true });
    }
  }
  return out;
}

/**
 * An invented censored data set (hoist brake lives in years, made up for these tests): 12 failures,
 * 8 suspensions, including a suspension tied with a failure.
 */
export const INVENTED_CENSORED: LifeObservation[] = [
  [3.1, true], [4.7, false], [5.2, true], [6.0, true], [6.0, false], [7.4, true], [8.8, false],
  [9.3, true], [10.1, true], [11.6, false], [12.0, true], [12.9, true], [14.2, false], [15.5, true],
  [16.8, false], [18.3, true], [20.0, false], [21.4, true], [24.9, false], [27.5, true],
].map(([time, failed]) => ({ time: time as number, failed: failed as boolean }));

/** Golden-section maximiser written for the tests (independent of src/reliability/fit/roots.ts). */
export function maximise(f: (x: number) => number, lo: number, hi: number, iterations = 200): number {
  const r = (Math.sqrt(5) - 1) / 2;
  let a = lo;
  let b = hi;
  for (let k = 0; k < iterations; k++) {
    const c = b - r * (b - a);
    const d = a + r * (b - a);
    if (f(c) > f(d)) b = d;
    else a = c;
  }
  return (a + b) / 2;
}
