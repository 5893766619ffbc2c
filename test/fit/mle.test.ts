// Weibull maximum likelihood with right-censoring (src/reliability/fit/mle.ts, likelihood.ts).
import { describe, expect, it } from 'vitest';
import * as weibull from '@stdlib/stats-base-dists-weibull';
import { weibullMle } from '../../src/reliability/fit/mle.js';
import { likelihoodParts, weibullLogLikelihood } from '../../src/reliability/fit/likelihood.js';
import { FitError, fitWeibull } from '../../src/reliability/fit/index.js';
import { INVENTED_CENSORED, ballBearings, maximise, weibullSample } from './helpers.js';

/** ℓ written from @stdlib's Weibull logpdf and cdf (stdlib's argument order: x, shape k, scale λ). */
function stdlibLogLikelihood(data: { time: number; failed: boolean }[], shape: number, scale: number): number {
  return data.reduce(
    (s, d) => s + (d.failed ? weibull.logpdf(d.time, shape, scale) : Math.log1p(-weibull.cdf(d.time, shape, scale))),
    0,
  );
}

describe('reference: Lieblein & Zelen ball bearings', () => {
  it('MLE β̂ = 2.102, η̂ = 81.88 to 4 significant figures', () => {
    // Lieblein & Zelen (1956) data; estimates as reported by J. F. Lawless, Statistical Models and
    // Methods for Lifetime Data, 2nd ed. 2003 (from memory, per /work/shared/reference/README.md).
    const fit = fitWeibull(ballBearings(), { method: 'mle' });
    expect(fit.shape.toPrecision(4)).toBe('2.102');
    expect(fit.scale.toPrecision(4)).toBe('81.88');
    expect(fit.n).toBe(23);
    expect(fit.failures).toBe(23);
    expect(fit.suspensions).toBe(0);
  });
});

describe('censored MLE', () => {
  it('satisfies both likelihood equations to 1e-8', () => {
    // The MLE is where ∂ℓ/∂β = ∂ℓ/∂η = 0 (common practice, no source). Scores here are computed
    // from @stdlib's log-likelihood by central differences, not from our own derivative formulas.
    const m = weibullMle(INVENTED_CENSORED);
    const h = 1e-5;
    const dB = (stdlibLogLikelihood(INVENTED_CENSORED, m.shape + h, m.scale) - stdlibLogLikelihood(INVENTED_CENSORED, m.shape - h, m.scale)) / (2 * h);
    const dE = (stdlibLogLikelihood(INVENTED_CENSORED, m.shape, m.scale + h) - stdlibLogLikelihood(INVENTED_CENSORED, m.shape, m.scale - h)) / (2 * h);
    expect(Math.abs(dB)).toBeLessThan(1e-6); // finite differences carry ~1e-8 noise of their own
    expect(Math.abs(dE)).toBeLessThan(1e-6);
    // And our analytic score (checked against finite differences below) is zero to 1e-8.
    const { score } = likelihoodParts(INVENTED_CENSORED, m.shape, m.scale);
    expect(Math.abs(score[0])).toBeLessThan(1e-8);
    expect(Math.abs(score[1])).toBeLessThan(1e-8);
  });

  it('matches direct numerical maximisation of the log-likelihood (grid + golden section)', () => {
    // No published censored example is cited from memory here; instead ℓ (from @stdlib) is maximised
    // over η for each β by golden section, and that profile over β by a grid and golden section.
    const data = INVENTED_CENSORED;
    const bestScale = (shape: number): number => maximise((eta) => stdlibLogLikelihood(data, shape, eta), 1, 200, 90);
    const profile = (shape: number): number => stdlibLogLikelihood(data, shape, bestScale(shape));
    const grid = Array.from({ length: 60 }, (_, k) => 0.2 + k * 0.1);
    const values = grid.map(profile);
    const k0 = values.indexOf(Math.max(...values));
    const shape = maximise(profile, grid[Math.max(0, k0 - 1)]!, grid[k0 + 1]!, 90);
    const scale = bestScale(shape);
    const m = weibullMle(data);
    expect(m.shape).toBeCloseTo(shape, 5);
    expect(m.scale).toBeCloseTo(scale, 4);
    expect(m.logLikelihood).toBeCloseTo(profile(shape), 8);
  });

  it('log-likelihood equals the sum of @stdlib logpdf (failures) and log survivor (suspensions)', () => {
    for (const [b, e] of [[0.7, 9], [1.9, 14], [4, 20]] as const) {
      expect(weibullLogLikelihood(INVENTED_CENSORED, b, e)).toBeCloseTo(stdlibLogLikelihood(INVENTED_CENSORED, b, e), 10);
    }
  });

  it('analytic score and Hessian agree with central differences', () => {
    const [b, e] = [1.6, 15];
    const h = 1e-4;
    const l = (x: number, y: number): number => weibullLogLikelihood(INVENTED_CENSORED, x, y);
    const p = likelihoodParts(INVENTED_CENSORED, b, e);
    const rel = (a: number, ref: number): number => Math.abs(a - ref) / Math.max(1, Math.abs(ref));
    expect(rel(p.score[0], (l(b + h, e) - l(b - h, e)) / (2 * h))).toBeLessThan(1e-6);
    expect(rel(p.score[1], (l(b, e + h) - l(b, e - h)) / (2 * h))).toBeLessThan(1e-6);
    expect(rel(p.hessian[0][0], (l(b + h, e) - 2 * l(b, e) + l(b - h, e)) / (h * h))).toBeLessThan(1e-4);
    expect(rel(p.hessian[1][1], (l(b, e + h) - 2 * l(b, e) + l(b, e - h)) / (h * h))).toBeLessThan(1e-4);
    const cross = (l(b + h, e + h) - l(b + h, e - h) - l(b - h, e + h) + l(b - h, e - h)) / (4 * h * h);
    expect(rel(p.hessian[0][1], cross)).toBeLessThan(1e-4);
  });
});

describe('complete data', () => {
  it('equals the complete-data formulas solved independently', () => {
    // Complete-sample Weibull likelihood equations (Lawless 2003, §5.2; from memory):
    //   Σ tᵢ^β ln tᵢ / Σ tᵢ^β − 1/β − (1/n) Σ ln tᵢ = 0,   η = ((1/n) Σ tᵢ^β)^(1/β)
    // solved here by plain bisection in β on [0.05, 50].
    const data = weibullSample(7, 40, 3.3, 120);
    const t = data.map((d) => d.time);
    const n = t.length;
    const meanLog = t.reduce((s, v) => s + Math.log(v), 0) / n;
    const g = (b: number): number => {
      const s0 = t.reduce((s, v) => s + v ** b, 0);
      const s1 = t.reduce((s, v) => s + v ** b * Math.log(v), 0);
      return s1 / s0 - 1 / b - meanLog;
    };
    let lo = 0.05;
    let hi = 50;
    for (let k = 0; k < 200; k++) {
      const mid = (lo + hi) / 2;
      if (g(mid) < 0) lo = mid;
      else hi = mid;
    }
    const shape = (lo + hi) / 2;
    const scale = (t.reduce((s, v) => s + v ** shape, 0) / n) ** (1 / shape);
    const m = weibullMle(data);
    expect(Math.abs(m.shape / shape - 1)).toBeLessThan(1e-12);
    expect(Math.abs(m.scale / scale - 1)).toBeLessThan(1e-12);
  });

  it('is unchanged by the unit of life except for the scale (fits are unit-free)', () => {
    // Scaling every life by c multiplies η by c and leaves β alone (common practice, no source).
    const years = weibullMle(INVENTED_CENSORED);
    const hours = weibullMle(INVENTED_CENSORED.map((d) => ({ ...d, time: d.time * 8766 })));
    expect(hours.shape).toBeCloseTo(years.shape, 10);
    expect(hours.scale / 8766).toBeCloseTo(years.scale, 8);
  });
});

describe('data that give no estimate', () => {
  it('refuses when every failure is at the longest life', () => {
    // Then g(β) of the profile equation stays negative: ℓ keeps rising as β → ∞.
    const data = [
      { time: 2, failed: false },
      { time: 5, failed: true },
      { time: 5, failed: true },
    ];
    expect(() => weibullMle(data)).toThrow(FitError);
  });

  it('one failure with a later suspension has an estimate', () => {
    const data = [
      { time: 3, failed: true },
      { time: 10, failed: false },
      { time: 12, failed: false },
    ];
    const m = weibullMle(data);
    expect(Math.abs(likelihoodParts(data, m.shape, m.scale).score[0])).toBeLessThan(1e-8);
  });

  it('no failures at all is an error', () => {
    expect(() => fitWeibull([{ time: 3, failed: false }], { method: 'mle' })).toThrow(FitError);
  });
});
