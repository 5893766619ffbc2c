// The quantile paths the Monte Carlo draws through: the normal quantile by AS 241 (M. J. Wichura,
// Applied Statistics 37, 1988), the prepared gamma and beta inverses (GammaInverse, BetaInverse)
// and the prepared distributions (quantileFunction, DirichletSampler). Outside references:
// @stdlib/stats-base-dists-* (a general-purpose numerical library) and an independent 70-digit
// evaluation of Φ (high-precision.ts: the Maclaurin series of erf, DLMF 7.6.1, in BigInt).
import * as normal from '@stdlib/stats-base-dists-normal';
import * as gammaDist from '@stdlib/stats-base-dists-gamma';
import * as betaDist from '@stdlib/stats-base-dists-beta';
import { describe, expect, it } from 'vitest';
import { DirichletSampler, dirichletFromUniforms, quantileFunction, sampleQuantile } from '../../src/reliability/distributions.js';
import { createRng } from '../../src/reliability/random.js';
import {
  BetaInverse,
  GammaInverse,
  betaQuantile,
  gammaQuantile,
  normalCdf,
  normalQuantile,
  regularizedBeta,
  regularizedGammaP,
  regularizedGammaQ,
} from '../../src/reliability/special.js';
import type { Uncertainty } from '../../src/study/types.js';
import { PI_FROM_DIGITS, normalCdfFixed, quantileError } from './high-precision.js';

const rel = (a: number, e: number) => (a === e ? 0 : Math.abs(a - e) / Math.abs(e));

/** Probabilities from 1e-15 to 1 − 1e-15: decades in both tails and a fine grid between. */
function probabilities(): number[] {
  const ps: number[] = [];
  for (let e = -15; e <= -2; e += 0.5) ps.push(10 ** e, 1 - 10 ** e);
  for (let k = 1; k < 100; k++) ps.push(k / 100);
  return ps.sort((a, b) => a - b);
}

describe('the 70-digit oracle itself', () => {
  it('holds π to the double and Φ to @stdlib normal cdf within 1e-14 relative', () => {
    expect(PI_FROM_DIGITS).toBe(Math.PI);
    expect(normalCdfFixed(0)).toBe(10n ** 70n / 2n);
    for (let z = -8.5; z <= 3; z += 0.25) {
      const phi = Number((normalCdfFixed(z) * 10n ** 40n) / 10n ** 70n) / 1e40;
      // Source: @stdlib/stats-base-dists-normal cdf (its own error grows to 4e-15 at z = −8.5).
      expect(rel(phi, normal.cdf(z, 0, 1)), `z = ${z}`).toBeLessThan(1e-14);
    }
  });
});

describe('normalQuantile (AS 241)', () => {
  it('is within 1e-15 relative of the exact quantile (70-digit Φ) from p = 1e-18 to ½', () => {
    let worst = 0;
    let at = 0;
    const ps: number[] = [];
    for (let e = -18; e < -0.31; e += 0.037) ps.push(10 ** e);
    for (let k = 1; k < 500; k++) ps.push(k / 1000);
    for (const p of ps) {
      const err = Math.abs(quantileError(normalQuantile(p), p));
      if (err > worst) {
        worst = err;
        at = p;
      }
    }
    expect(worst, `worst at p = ${at}`).toBeLessThan(1e-15);
  });

  it('keeps relative accuracy next to the median, where z is tiny', () => {
    for (const near of [1e-12, 1e-9, 3e-7, 1e-4]) {
      const p = 0.5 - near;
      const d = 0.5 - p; // exact (Sterbenz): the distance p really has
      expect(Math.abs(quantileError(normalQuantile(p), p)), `p = ½ − ${d}`).toBeLessThan(1e-15);
      // Φ⁻¹(½ − d) = −d·√(2π)·(1 + (π/3)d² + …) (series of the inverse of Φ about ½, common practice, no source).
      expect(rel(normalQuantile(p), -d * Math.sqrt(2 * Math.PI))).toBeLessThan(2 * d * d + 1e-15);
    }
  });

  it('matches @stdlib normal quantile to 5e-12 from 1e-6 to 1 − 1e-6 and mirrors exactly', () => {
    // Source: @stdlib/stats-base-dists-normal quantile. The tolerance is the library's own accuracy
    // (1e-12 off at p = 1e-6, where the 70-digit oracle above puts AS 241 within 1e-15; it drifts
    // further outside this range, see special.test.ts).
    for (let p = 1e-6; p < 1 - 1e-6; p += 0.000731) {
      const ref = normal.quantile(p, 0, 1);
      if (Math.abs(ref) > 1e-3) expect(rel(normalQuantile(p), ref), `p = ${p}`).toBeLessThan(5e-12);
    }
    for (const p of [1 / 64, 0.125, 0.3, 0.4999]) expect(normalQuantile(1 - p)).toBe(-normalQuantile(p));
  });

  it('in the far tail (below e^−25) is refined to Φ: round trip within 5e-13 down to 1e-300', () => {
    for (let e = -300; e <= -11; e += 0.37) {
      const p = 10 ** e;
      expect(rel(normalCdf(normalQuantile(p)), p), `p = 1e${e}`).toBeLessThan(5e-13);
    }
  });
});

describe('GammaInverse and BetaInverse (the prepared quantiles)', () => {
  it('give the one-off functions’ bits', () => {
    for (const shape of [0.3, 2.5, 37.5]) {
      const inv = new GammaInverse(shape);
      for (const p of probabilities()) expect(inv.quantile(p) * 0.04).toBe(gammaQuantile(p, shape, 0.04));
    }
    const beta = new BetaInverse(1.5, 1500);
    for (const p of probabilities()) expect(beta.quantile(p)).toBe(betaQuantile(p, 1.5, 1500));
  });

  it('gamma: round trip within 1e-12 of the smaller tail, shapes 0.05 to 10 000, p from 1e-15 to 1 − 1e-15', () => {
    // P is held to @stdlib gamma cdf in special.test.ts; the round trip pins the inverse everywhere.
    for (const shape of [0.05, 0.2, 0.5, 1, 1.7, 4, 12, 37.5, 150, 1000, 10000]) {
      const inv = new GammaInverse(shape);
      for (const p of probabilities()) {
        const x = inv.quantile(p);
        const back = p > 0.5 ? 1 - regularizedGammaQ(shape, x) : regularizedGammaP(shape, x);
        const tail = Math.min(p, 1 - p);
        const err = p > 0.5 ? Math.abs(regularizedGammaQ(shape, x) - (1 - p)) / tail : Math.abs(back - p) / tail;
        expect(err, `shape ${shape}, p ${p}`).toBeLessThan(1e-12);
      }
    }
  });

  it('gamma: matches @stdlib gamma quantile to 1e-10 for shapes 0.5 to 100 over p in [1e-9, 1 − 1e-9]', () => {
    // Source: @stdlib/stats-base-dists-gamma quantile (rate = 1/scale); its own accuracy limits the range.
    for (const shape of [0.5, 1, 2.5, 10, 37.5, 100]) {
      const inv = new GammaInverse(shape);
      for (const p of probabilities().filter((q) => q >= 1e-9 && q <= 1 - 1e-9)) {
        expect(rel(inv.quantile(p), gammaDist.quantile(p, shape, 1)), `shape ${shape}, p ${p}`).toBeLessThan(1e-10);
      }
    }
  });

  it('beta: round trip within 1e-11 of the smaller tail, a and b from 0.1 to 5 000, p from 1e-15 to 1 − 1e-15', () => {
    for (const a of [0.1, 0.5, 1.5, 8, 60, 5000]) {
      for (const b of [0.1, 0.7, 3, 40, 1500, 5000]) {
        const inv = new BetaInverse(a, b);
        for (const p of probabilities()) {
          const x = inv.quantile(p);
          // x itself is known to one unit in its last place at best (and a quantile near 1, taken
          // as 1 − x′ above the median, to one unit of 1): the check allows I to move that much.
          const slack = betaDist.pdf(x, a, b) * Number.EPSILON * Math.max(x, 0.5);
          const tail = Math.min(p, 1 - p);
          expect(Math.abs(regularizedBeta(x, a, b) - p) / tail - slack / tail, `a ${a}, b ${b}, p ${p}`).toBeLessThan(1e-11);
        }
      }
    }
  });

  it('beta: matches @stdlib beta quantile to 1e-11 over p in [1e-8, 0.99]', () => {
    // Source: @stdlib/stats-base-dists-beta quantile.
    for (const [a, b] of [
      [1.5, 1500],
      [0.5, 120.5],
      [2, 3],
      [20, 300],
    ] as const) {
      const inv = new BetaInverse(a, b);
      for (const p of probabilities().filter((q) => q >= 1e-8 && q <= 0.99)) {
        expect(rel(inv.quantile(p), betaDist.quantile(p, a, b)), `a ${a}, b ${b}, p ${p}`).toBeLessThan(1e-11);
      }
    }
  });
});

describe('prepared distributions (quantileFunction)', () => {
  it('every kind gives what sampleQuantile gives, and NaN outside [0, 1]', () => {
    const kinds: Uncertainty[] = [
      { kind: 'lognormal', median: 2e-3, ef: 3 },
      { kind: 'lognormal', median: 2e-3, ef: 1 },
      { kind: 'normal', mean: 3.1, sd: 0.4 },
      { kind: 'normal', mean: 0.5, sd: 1, min: 0 },
      { kind: 'normal', mean: 0, sd: 1, min: 3, max: 5 },
      { kind: 'normal', mean: 2, sd: 0, min: 0, max: 1 },
      { kind: 'uniform', min: 2, max: 4 },
      { kind: 'triangular', min: 0, mode: 2, max: 10 },
      { kind: 'beta', a: 1.5, b: 1500 },
      { kind: 'gamma', shape: 37.5, scale: 0.04 },
    ];
    const rng = createRng(7);
    for (const u of kinds) {
      const q = quantileFunction(u);
      for (let k = 0; k < 200; k++) {
        const p = rng.next();
        expect(q(p)).toBe(sampleQuantile(u, p));
      }
      expect(Number.isNaN(q(1.5))).toBe(true);
      expect(Number.isNaN(q(-0.1))).toBe(true);
    }
  });

  it('a truncated normal above its mean is drawn through the mirrored lower tail: within its window, CDF returns p (@stdlib)', () => {
    // Truncated CDF F(x) = (Φ((x−μ)/σ) − Φ(α))/(Φ(β) − Φ(α)) (common practice, no source); Φ from @stdlib.
    const q = quantileFunction({ kind: 'normal', mean: 0, sd: 1, min: 4, max: 6 });
    const lo = normal.cdf(4, 0, 1);
    const hi = normal.cdf(6, 0, 1);
    for (const p of [1e-6, 0.01, 0.3, 0.5, 0.9, 0.999]) {
      const x = q(p);
      expect(x).toBeGreaterThanOrEqual(4);
      expect(x).toBeLessThanOrEqual(6);
      expect(Math.abs((normal.cdf(x, 0, 1) - lo) / (hi - lo) - p)).toBeLessThan(1e-9);
    }
  });

  it('DirichletSampler draws what dirichletFromUniforms draws, reading its uniforms at the given dimensions', () => {
    const a = [18, 1.5, 0.5];
    const sampler = new DirichletSampler(a);
    const rng = createRng(11);
    const row = new Float64Array(7);
    const dims = Int32Array.from([5, 1, 3]);
    const out = new Float64Array(3);
    const one = new Float64Array(3);
    for (let t = 0; t < 200; t++) {
      for (let d = 0; d < row.length; d++) row[d] = rng.next();
      expect(sampler.draw(row, out, dims)).toBe(true);
      expect(dirichletFromUniforms(a, [row[5]!, row[1]!, row[3]!], one)).toBe(true);
      expect(Array.from(out)).toEqual(Array.from(one));
    }
  });
});
