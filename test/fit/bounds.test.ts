// Confidence bounds: Fisher information and likelihood ratio (src/reliability/fit/bounds.ts).
import { describe, expect, it } from 'vitest';
import * as weibull from '@stdlib/stats-base-dists-weibull';
import * as chisquare from '@stdlib/stats-base-dists-chisquare';
import { fitWeibull, weibullCdfBounds, FitError, type Bound } from '../../src/reliability/fit/index.js';
import { logCovariance } from '../../src/reliability/fit/bounds.js';
import { weibullLogLikelihood } from '../../src/reliability/fit/likelihood.js';
import { weibullMle, mleScaleForShape } from '../../src/reliability/fit/mle.js';
import { INVENTED_CENSORED, ballBearings, weibullSample } from './helpers.js';

const width = (b: { lower: number; upper: number }): number => b.upper / b.lower;

describe('Fisher-information bounds', () => {
  it('widen as the data shrink (every other bearing)', () => {
    // Fewer lives, less information, wider bounds (common practice, no source).
    const all = ballBearings();
    const half = all.filter((_, i) => i % 2 === 0);
    const big = fitWeibull(all, { method: 'mle', confidence: 0.95 });
    const small = fitWeibull(half, { method: 'mle', confidence: 0.95 });
    expect(width(small.bounds.fisher.shape)).toBeGreaterThan(width(big.bounds.fisher.shape));
    expect(width(small.bounds.fisher.scale)).toBeGreaterThan(width(big.bounds.fisher.scale));
    expect(width(small.bounds.fisher.b10)).toBeGreaterThan(width(big.bounds.fisher.b10));
    expect(width(small.bounds.likelihoodRatio!.shape!)).toBeGreaterThan(width(big.bounds.likelihoodRatio!.shape!));
  });

  it('collapse to the estimate at level 50% (each bound one-sided), for both kinds', () => {
    for (const method of ['mle', 'rank'] as const) {
      const fit = fitWeibull(INVENTED_CENSORED, { method, confidence: 0.5 });
      const pairs: [Bound, number][] = [
        [fit.bounds.fisher.shape, fit.shape],
        [fit.bounds.fisher.scale, fit.scale],
        [fit.bounds.fisher.b10, fit.b10],
      ];
      if (method === 'mle') pairs.push([fit.bounds.likelihoodRatio!.shape!, fit.shape], [fit.bounds.likelihoodRatio!.scale!, fit.scale]);
      for (const [b, est] of pairs) {
        expect(b.lower).toBeCloseTo(est, 10);
        expect(b.upper).toBeCloseTo(est, 10);
      }
    }
  });

  it('covariance of (ln β, ln η) matches the expected information for a large complete sample', () => {
    // Expected information per complete observation, worked by hand with Y = (t/η)^β ~ Exp(1),
    // E[Y ln Y] = 1 − γ_E, E[Y ln²Y] = (1 − γ_E)² + π²/6 − 1 (γ_E Euler's constant):
    //   on (ln β, ln η): [[1 + E[Y ln²Y], −β(1 − γ_E)], [−β(1 − γ_E), β²]], determinant β²π²/6.
    // Inverse: n·Var(ln β) = 6/π² = 0.6079, n·β²·Var(ln η) = 1 + 6(1 − γ_E)²/π² = 1.1087,
    // n·β·Cov = 6(1 − γ_E)/π² = 0.2570 — the extreme-value figures quoted by W. Q. Meeker and
    // L. A. Escobar, Statistical Methods for Reliability Data, 1998 (from memory).
    const n = 6000;
    const shape = 2.5;
    const data = weibullSample(11, n, shape, 30);
    const fit = fitWeibull(data, { method: 'mle' });
    const g = 0.5772156649015329;
    const [[vaa, vab], [, vbb]] = fit.covarianceLog;
    expect(n * vaa).toBeCloseTo(6 / Math.PI ** 2, 1);
    expect(Math.abs((n * vaa) / (6 / Math.PI ** 2) - 1)).toBeLessThan(0.06);
    expect(Math.abs((n * fit.shape ** 2 * vbb) / (1 + (6 * (1 - g) ** 2) / Math.PI ** 2) - 1)).toBeLessThan(0.06);
    expect(Math.abs((n * fit.shape * vab) / ((6 * (1 - g)) / Math.PI ** 2) - 1)).toBeLessThan(0.15);
  });

  it('two-sided 90% intervals cover the true β and η about 90% of the time (simulation)', () => {
    // Coverage is what a confidence interval promises (common practice, no source). 400 invented
    // samples of 40 with random censoring; binomial standard error of the coverage is 1.5%.
    const [shape, scale, runs] = [1.8, 50, 400];
    let hitShape = 0;
    let hitScale = 0;
    for (let k = 0; k < runs; k++) {
      const data = weibullSample(1000 + k, 40, shape, scale, { censorMax: 150 });
      const fit = fitWeibull(data, { method: 'mle', confidence: 0.95 });
      const s = fit.bounds.fisher.shape;
      const e = fit.bounds.fisher.scale;
      if (s.lower <= shape && shape <= s.upper) hitShape += 1;
      if (e.lower <= scale && scale <= e.upper) hitScale += 1;
    }
    expect(hitShape / runs).toBeGreaterThan(0.84);
    expect(hitShape / runs).toBeLessThan(0.95);
    expect(hitScale / runs).toBeGreaterThan(0.84);
    expect(hitScale / runs).toBeLessThan(0.95);
  });

  it('are not available when the curvature is not positive definite', () => {
    // Far from the peak (scale 1000 against lives of 3–28): (t/η)^β is tiny, and
    // −∂²ℓ/∂η² = (β/η²)((β + 1)Σ(t/η)^β − r) is negative.
    expect(logCovariance(INVENTED_CENSORED, 3, 1000)).toBeUndefined();
    expect(logCovariance(INVENTED_CENSORED, 2, 15)).toBeDefined();
  });
});

describe('likelihood-ratio bounds', () => {
  it('contain the MLE and sit where the profile has dropped by χ²₁(2C − 1)/2', () => {
    // Profile-likelihood interval (Meeker & Escobar 1998, §8.3; from memory); χ² quantile from @stdlib.
    const level = 0.95;
    const fit = fitWeibull(INVENTED_CENSORED, { method: 'mle', confidence: level });
    const lr = fit.bounds.likelihoodRatio!;
    expect(lr.shape!.lower).toBeLessThan(fit.shape);
    expect(lr.shape!.upper).toBeGreaterThan(fit.shape);
    expect(lr.scale!.lower).toBeLessThan(fit.scale);
    expect(lr.scale!.upper).toBeGreaterThan(fit.scale);
    const drop = chisquare.quantile(2 * level - 1, 1) / 2;
    for (const b of [lr.shape!.lower, lr.shape!.upper]) {
      const l = weibullLogLikelihood(INVENTED_CENSORED, b, mleScaleForShape(INVENTED_CENSORED, b));
      expect(fit.logLikelihood - l).toBeCloseTo(drop, 8);
    }
    // For the scale, the profile over β is maximised here by brute force on a fine grid.
    for (const eta of [lr.scale!.lower, lr.scale!.upper]) {
      let best = -Infinity;
      for (let b = 0.3; b < 6; b += 0.0005) best = Math.max(best, weibullLogLikelihood(INVENTED_CENSORED, b, eta));
      expect(fit.logLikelihood - best).toBeCloseTo(drop, 4);
    }
  });

  it('are close to the Fisher bounds for large n', () => {
    // Both are first-order equivalent as n grows (common practice, no source).
    const data = weibullSample(5, 3000, 1.4, 12, { censorMax: 40 });
    const fit = fitWeibull(data, { method: 'mle', confidence: 0.95 });
    const lr = fit.bounds.likelihoodRatio!;
    for (const [a, b] of [
      [lr.shape!, fit.bounds.fisher.shape],
      [lr.scale!, fit.bounds.fisher.scale],
    ] as const) {
      expect(Math.abs(a.lower / b.lower - 1)).toBeLessThan(0.005);
      expect(Math.abs(a.upper / b.upper - 1)).toBeLessThan(0.005);
    }
  });

  it('are left out where the profile is too flat, with a warning', () => {
    // One failure and two later suspensions: above η̂ the profile over β falls only like −ln ln η
    // (worked by hand: with β ~ c/ln η the terms stay bounded but for ln β), so at 99% the upper
    // scale bound lies beyond the e^30 search window.
    const data = [
      { time: 1, failed: true },
      { time: 3, failed: false },
      { time: 3, failed: false },
    ];
    const fit = fitWeibull(data, { method: 'mle', confidence: 0.99 });
    expect(fit.warnings).toContain('no likelihood-ratio bound found (the profile likelihood is too flat): upper scale');
    expect(fit.bounds.likelihoodRatio!.scale).toBeUndefined();
    expect(fit.bounds.likelihoodRatio!.shape!.lower).toBeLessThan(fit.shape);
    expect(JSON.stringify(fit)).not.toContain('null');
  });
});

describe('F(t) bounds for charts', () => {
  const fit = fitWeibull(INVENTED_CENSORED, { method: 'mle', confidence: 0.9 });

  it('F(η) = 1 − 1/e whatever the shape, and F matches @stdlib', () => {
    // F(η) = 1 − e⁻¹ = 0.6321 (common practice, no source; /work/shared/reference/README.md).
    expect(weibullCdfBounds(fit, fit.scale, 0.9).F).toBeCloseTo(1 - Math.exp(-1), 14);
    for (const t of [1, 5, 12, 30]) {
      expect(weibullCdfBounds(fit, t, 0.9).F).toBeCloseTo(weibull.cdf(t, fit.shape, fit.scale), 14);
    }
  });

  it('bracket F, grow with t, and collapse at 50%', () => {
    let previous = { F: 0, lower: 0, upper: 0 };
    for (let t = 1; t <= 40; t += 1) {
      const b = weibullCdfBounds(fit, t, 0.9);
      expect(b.lower).toBeLessThan(b.F);
      expect(b.upper).toBeGreaterThan(b.F);
      expect(b.lower).toBeGreaterThanOrEqual(previous.lower);
      expect(b.upper).toBeGreaterThanOrEqual(previous.upper);
      previous = b;
      const c = weibullCdfBounds(fit, t, 0.5);
      expect(c.lower).toBeCloseTo(c.F, 14);
      expect(c.upper).toBeCloseTo(c.F, 14);
    }
    expect(() => weibullCdfBounds(fit, 3, 0.3)).toThrow(FitError);
  });

  it('at the B10 estimate, the F bounds agree with the B10 bounds to first order', () => {
    // Delta method: at t = t₁₀, sd of ln(−ln R) is β times the sd of ln t₁₀, so the F-bound at
    // the lower B10 bound is about 10% (derived by hand; agreement only to first order).
    const b = weibullCdfBounds(fit, fit.bounds.fisher.b10.lower, 0.9);
    expect(b.upper).toBeGreaterThan(0.1);
    expect(b.F).toBeLessThan(0.1);
    expect(Math.abs(b.upper - 0.1)).toBeLessThan(0.03);
  });
});

describe('MLE and rank on the same censored data', () => {
  it('rank bounds come from the information at the rank estimates', () => {
    const rank = fitWeibull(INVENTED_CENSORED, { method: 'rank' });
    const mle = weibullMle(INVENTED_CENSORED);
    expect(rank.bounds.likelihoodRatio).toBeUndefined();
    expect(rank.covarianceLog).toEqual(logCovariance(INVENTED_CENSORED, rank.shape, rank.scale));
    expect(rank.shape).not.toBeCloseTo(mle.shape, 3);
  });
});

describe('Fisher-information bounds at any scale', () => {
  // The Weibull is a scale family: multiplying every life by c multiplies η and its bounds by c
  // and leaves β and its bounds unchanged (common practice, no source). So bounds relative to η
  // must be the same for data ×1e-200, ×1 and ×1e200 (forming the information in (β, η) and
  // scaling by η² gave null bounds or a false "not positive definite" error out there).
  for (const method of ['mle', 'rank'] as const) {
    it(`${method}: β bounds and η bounds relative to η are the same for data ×1e-200, ×1, ×1e200`, () => {
      const fits = [1e-200, 1, 1e200].map((c) => fitWeibull(INVENTED_CENSORED.map((o) => ({ ...o, time: o.time * c })), { method, confidence: 0.9 }));
      const base = fits[1]!;
      for (const [i, c] of [1e-200, 1, 1e200].entries()) {
        const f = fits[i]!;
        const rel = (x: number, y: number) => Math.abs(x - y) / Math.abs(y);
        expect(rel(f.shape, base.shape)).toBeLessThan(1e-9);
        expect(rel(f.scale / c, base.scale)).toBeLessThan(1e-9);
        expect(rel(f.bounds.fisher.shape.lower, base.bounds.fisher.shape.lower)).toBeLessThan(1e-9);
        expect(rel(f.bounds.fisher.shape.upper, base.bounds.fisher.shape.upper)).toBeLessThan(1e-9);
        expect(rel(f.bounds.fisher.scale.lower / f.scale, base.bounds.fisher.scale.lower / base.scale)).toBeLessThan(1e-9);
        expect(rel(f.bounds.fisher.scale.upper / f.scale, base.bounds.fisher.scale.upper / base.scale)).toBeLessThan(1e-9);
        for (const row of [0, 1] as const) for (const col of [0, 1] as const) expect(rel(f.covarianceLog[row][col], base.covarianceLog[row][col])).toBeLessThan(1e-8);
      }
    });
  }
});
