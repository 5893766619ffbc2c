// Uncertainty distributions against @stdlib/stats-base-dists-* and NUREG/CR-6823 (Handbook of
// Parameter Estimation for Probabilistic Risk Assessment, US NRC 2003) for the error-factor lognormal.
import { describe, expect, it } from 'vitest';
import * as lognormal from '@stdlib/stats-base-dists-lognormal';
import * as normal from '@stdlib/stats-base-dists-normal';
import * as uniform from '@stdlib/stats-base-dists-uniform';
import * as triangular from '@stdlib/stats-base-dists-triangular';
import * as betaDist from '@stdlib/stats-base-dists-beta';
import * as gammaDist from '@stdlib/stats-base-dists-gamma';
import {
  ERROR_FACTOR_Z,
  describe as describeUncertainty,
  lognormalFromMean,
  lognormalMoments,
  lognormalSigma,
  sampleQuantile,
  uncertaintyMean,
} from '../../src/reliability/distributions.js';
import { createRng, latinHypercube } from '../../src/reliability/random.js';
import type { Uncertainty } from '../../src/study/types.js';

const rel = (a: number, e: number) => (a === e ? 0 : Math.abs(a - e) / Math.abs(e));
const PS = [0.001, 0.01, 0.05, 0.2, 0.5, 0.8, 0.95, 0.99, 0.999];

describe('lognormal by median and error factor', () => {
  it('σ = ln(EF)/1.645 and mean = m·exp(σ²/2) (NUREG/CR-6823)', () => {
    expect(ERROR_FACTOR_Z).toBe(1.645);
    // Hand: EF = 3: σ = 1.0986123/1.645 = 0.6678494; σ²/2 = 0.2230114; mean/median = e^0.2230114
    // = 1.25·e^(−1.321e-4) (since ln 1.25 = 0.2231436) = 1.2498348.
    expect(lognormalSigma(3)).toBeCloseTo(0.6678494, 7);
    expect(lognormalMoments(1e-3, 3).mean).toBeCloseTo(1.2498348e-3, 9);
    for (const ef of [1.5, 3, 10, 30]) {
      const sigma = Math.log(ef) / 1.645;
      // Source: @stdlib lognormal mean/variance with μ = ln m.
      const m = lognormalMoments(2e-4, ef);
      expect(rel(m.mean, lognormal.mean(Math.log(2e-4), sigma))).toBeLessThan(1e-14);
      expect(rel(m.variance, lognormal.variance(Math.log(2e-4), sigma))).toBeLessThan(1e-13);
    }
  });

  it('quantiles match @stdlib lognormal quantile; the 95th percentile is EF × median (to the 1.645 rounding)', () => {
    for (const ef of [1.5, 3, 10, 100]) {
      const u: Uncertainty = { kind: 'lognormal', median: 3e-3, ef };
      for (const p of PS) {
        expect(rel(sampleQuantile(u, p), lognormal.quantile(p, Math.log(3e-3), Math.log(ef) / 1.645))).toBeLessThan(1e-12);
      }
      // Definition EF = P95/P50 (NUREG/CR-6823); 1.645 vs Φ⁻¹(0.95) = 1.6448536 leaves EF^(−1e-4) relative.
      expect(rel(describeUncertainty(u).p95 / 3e-3, ef)).toBeLessThan(1e-3);
      expect(rel(3e-3 / describeUncertainty(u).p05, ef)).toBeLessThan(1e-3);
    }
  });

  it('sampled moments with a fixed seed agree with m·exp(σ²/2)', () => {
    // 200 000 plain Monte Carlo draws, EF = 3: the sample mean is within 4 standard errors.
    const u: Uncertainty = { kind: 'lognormal', median: 1e-3, ef: 3 };
    const { mean, sd } = lognormalMoments(1e-3, 3);
    const rng = createRng(20260630);
    const n = 200000;
    let sum = 0;
    let sumLog = 0;
    for (let i = 0; i < n; i++) {
      const x = sampleQuantile(u, rng.next());
      sum += x;
      sumLog += Math.log(x);
    }
    expect(Math.abs(sum / n - mean)).toBeLessThan((4 * sd) / Math.sqrt(n));
    // ln X is normal with mean ln m (median) and sd σ.
    expect(Math.abs(sumLog / n - Math.log(1e-3))).toBeLessThan((4 * lognormalSigma(3)) / Math.sqrt(n));
  });

  it('Latin hypercube through the same inverse-CDF path hits the mean more closely than its standard error', () => {
    const u: Uncertainty = { kind: 'lognormal', median: 1e-3, ef: 3 };
    const { mean, sd } = lognormalMoments(1e-3, 3);
    const n = 20000;
    const xs = latinHypercube(createRng(1), n).map((p) => sampleQuantile(u, p));
    const sampleMean = xs.reduce((a, b) => a + b, 0) / n;
    expect(Math.abs(sampleMean - mean)).toBeLessThan(sd / Math.sqrt(n));
  });

  it('lognormalFromMean inverts the mean', () => {
    for (const ef of [2, 5, 10]) {
      const u = lognormalFromMean(4e-3, ef);
      expect(u.kind).toBe('lognormal');
      expect(rel(lognormalMoments(u.median, u.ef).mean, 4e-3)).toBeLessThan(1e-15);
      expect(rel(uncertaintyMean(u), 4e-3)).toBeLessThan(1e-15);
    }
  });
});

describe('other distributions by inverse CDF', () => {
  it('normal matches @stdlib normal quantile', () => {
    const u: Uncertainty = { kind: 'normal', mean: 3.1, sd: 0.4 };
    for (const p of PS) expect(rel(sampleQuantile(u, p), normal.quantile(p, 3.1, 0.4))).toBeLessThan(1e-13);
    expect(uncertaintyMean(u)).toBe(3.1);
  });

  it('truncated normal: its CDF (from @stdlib normal cdf) at the sampled quantile returns p; the mean matches a brute-force integral', () => {
    // Truncated CDF F(x) = (Φ((x−μ)/σ) − Φ(α))/(Φ(β) − Φ(α)) (common practice, no source).
    const cases: Uncertainty[] = [
      { kind: 'normal', mean: 3.1, sd: 1, min: 2.2, max: 4 },
      { kind: 'normal', mean: 0.5, sd: 1, min: 0 },
      { kind: 'normal', mean: 0, sd: 1, min: 3, max: 5 }, // window far above the mean
      { kind: 'normal', mean: 0, sd: 1, max: -4 }, // lower tail only
    ];
    for (const u of cases) {
      if (u.kind !== 'normal') continue;
      const lo = u.min === undefined ? 0 : normal.cdf(u.min, u.mean, u.sd);
      const hi = u.max === undefined ? 1 : normal.cdf(u.max, u.mean, u.sd);
      for (const p of PS) {
        const x = sampleQuantile(u, p);
        if (u.min !== undefined) expect(x).toBeGreaterThanOrEqual(u.min);
        if (u.max !== undefined) expect(x).toBeLessThanOrEqual(u.max);
        expect(Math.abs((normal.cdf(x, u.mean, u.sd) - lo) / (hi - lo) - p)).toBeLessThan(1e-9);
      }
      // Brute-force mean: midpoint rule of x·pdf(x) over the window (±12 sd where open), 400 000 steps.
      const a = u.min ?? u.mean - 12 * u.sd;
      const b = u.max ?? u.mean + 12 * u.sd;
      const n = 400000;
      let num = 0;
      let den = 0;
      for (let i = 0; i < n; i++) {
        const x = a + ((i + 0.5) * (b - a)) / n;
        const f = normal.pdf(x, u.mean, u.sd);
        num += x * f;
        den += f;
      }
      expect(rel(uncertaintyMean(u), num / den)).toBeLessThan(1e-8);
    }
  });

  it('uniform, triangular, beta, gamma match @stdlib quantiles and means', () => {
    const uni: Uncertainty = { kind: 'uniform', min: 2, max: 4 };
    const tri: Uncertainty = { kind: 'triangular', min: 0, mode: 2, max: 10 };
    const bet: Uncertainty = { kind: 'beta', a: 0.5, b: 120.5 };
    const gam: Uncertainty = { kind: 'gamma', shape: 2.5, scale: 4e-3 };
    for (const p of PS) {
      expect(rel(sampleQuantile(uni, p), uniform.quantile(p, 2, 4))).toBeLessThan(1e-15);
      // @stdlib triangular parameters are (a = min, b = max, c = mode).
      expect(rel(sampleQuantile(tri, p), triangular.quantile(p, 0, 10, 2))).toBeLessThan(1e-14);
      expect(rel(sampleQuantile(bet, p), betaDist.quantile(p, 0.5, 120.5))).toBeLessThan(1e-11);
      // @stdlib gamma takes a rate: 1/scale.
      expect(rel(sampleQuantile(gam, p), gammaDist.quantile(p, 2.5, 1 / 4e-3))).toBeLessThan(1e-11);
    }
    expect(uncertaintyMean(uni)).toBe(uniform.mean(2, 4));
    expect(rel(uncertaintyMean(tri), triangular.mean(0, 10, 2))).toBeLessThan(1e-15);
    expect(rel(uncertaintyMean(bet), betaDist.mean(0.5, 120.5))).toBeLessThan(1e-15);
    expect(rel(uncertaintyMean(gam), gammaDist.mean(2.5, 1 / 4e-3))).toBeLessThan(1e-15);
  });

  it('describe gives mean, median, 5th and 95th percentiles', () => {
    const d = describeUncertainty({ kind: 'gamma', shape: 2.5, scale: 4e-3 });
    expect(rel(d.median, gammaDist.quantile(0.5, 2.5, 250))).toBeLessThan(1e-11);
    expect(rel(d.p05, gammaDist.quantile(0.05, 2.5, 250))).toBeLessThan(1e-11);
    expect(rel(d.p95, gammaDist.quantile(0.95, 2.5, 250))).toBeLessThan(1e-11);
    expect(rel(d.mean, 0.01)).toBeLessThan(1e-15);
  });

  it('bad parameters give NaN; fit parameters are refused', () => {
    expect(Number.isNaN(sampleQuantile({ kind: 'lognormal', median: 1e-3, ef: 0.5 }, 0.5))).toBe(true);
    expect(Number.isNaN(sampleQuantile({ kind: 'uniform', min: 3, max: 1 }, 0.5))).toBe(true);
    expect(Number.isNaN(sampleQuantile({ kind: 'triangular', min: 0, mode: 5, max: 4 }, 0.5))).toBe(true);
    expect(Number.isNaN(sampleQuantile({ kind: 'normal', mean: 0, sd: 1 }, 1.5))).toBe(true);
    expect(() => sampleQuantile({ kind: 'fit', fit: 'motor-life', which: 'shape' }, 0.5)).toThrow(/covariance/);
  });
});
