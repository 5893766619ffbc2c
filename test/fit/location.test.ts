// Three-parameter Weibull by profiling the location (src/reliability/fit/location.ts, fit-weibull.ts).
import { describe, expect, it } from 'vitest';
import * as weibull from '@stdlib/stats-base-dists-weibull';
import * as chisquare from '@stdlib/stats-base-dists-chisquare';
import { fitWeibull, FitError } from '../../src/reliability/fit/index.js';
import { weibullMle } from '../../src/reliability/fit/mle.js';
import type { LifeObservation } from '../../src/reliability/fit/index.js';
import { ballBearings, weibullSample } from './helpers.js';

/** ℓ of a three-parameter Weibull from @stdlib (suspensions before the location survive surely). */
function logLik3(data: LifeObservation[], shape: number, scale: number, location: number): number {
  return data.reduce((s, d) => {
    const x = d.time - location;
    if (d.failed) return s + weibull.logpdf(x, shape, scale);
    return s + (x <= 0 ? 0 : Math.log1p(-weibull.cdf(x, shape, scale)));
  }, 0);
}

/** max over (β, η) of ℓ with lives shifted by γ, the MLE being checked separately in mle.test.ts. */
function profile(data: LifeObservation[], location: number): number {
  const shifted = data.map((d) => ({ time: Math.max(0, d.time - location), failed: d.failed }));
  const m = weibullMle(shifted);
  return logLik3(data, m.shape, m.scale, location);
}

describe('three-parameter fit', () => {
  it('recovers a clear failure-free life from an invented sample (γ = 50, β = 2, η = 100, n = 300)', () => {
    const data = weibullSample(3, 300, 2, 100, { location: 50 });
    for (const method of ['mle', 'rank'] as const) {
      const fit = fitWeibull(data, { method, threeParameter: true });
      expect(fit.location).toBeGreaterThan(40);
      expect(fit.location).toBeLessThan(60);
      expect(fit.shape).toBeGreaterThan(1.6);
      expect(fit.shape).toBeLessThan(2.4);
      expect(fit.locationTest!.statistic).toBeGreaterThan(fit.locationTest!.critical05);
      expect(fit.warnings.some((w) => w.includes('does not improve'))).toBe(false);
      // B10 includes the location: F(B10) = 10% under the fitted three-parameter law (@stdlib cdf)
      expect(weibull.cdf(fit.b10 - fit.location!, fit.shape, fit.scale)).toBeCloseTo(0.1, 12);
    }
  });

  it('MLE location is the highest local maximum of the profile likelihood (checked on a fine grid)', () => {
    const data = weibullSample(3, 300, 2, 100, { location: 50 });
    const fit = fitWeibull(data, { method: 'mle', threeParameter: true });
    const first = Math.min(...data.filter((d) => d.failed).map((d) => d.time));
    const step = first / 1500;
    let bestG = 0;
    let bestL = -Infinity;
    for (let g = 0; g < first * 0.99; g += step) {
      const l = profile(data, g);
      if (l > bestL) {
        bestL = l;
        bestG = g;
      }
    }
    expect(Math.abs(fit.location! - bestG)).toBeLessThan(2 * step);
    expect(fit.logLikelihood).toBeGreaterThanOrEqual(bestL - 1e-9);
    expect(fit.logLikelihood).toBeCloseTo(logLik3(data, fit.shape, fit.scale, fit.location!), 9);
  });

  it('ball bearings: the location is not supported at 5% (likelihood-ratio test, χ²₁)', () => {
    // Statistic 2[ℓ(γ̂) − ℓ(γ = 0)] recomputed here from @stdlib log densities; critical χ²₁(0.95)
    // = 3.841 from @stdlib.
    const data = ballBearings();
    const fit = fitWeibull(data, { method: 'mle', threeParameter: true });
    const two = weibullMle(data);
    const statistic = 2 * (logLik3(data, fit.shape, fit.scale, fit.location!) - logLik3(data, two.shape, two.scale, 0));
    expect(fit.locationTest!.statistic).toBeCloseTo(statistic, 8);
    expect(fit.locationTest!.critical05).toBeCloseTo(chisquare.quantile(0.95, 1), 10);
    expect(statistic).toBeLessThan(3.841);
    expect(fit.warnings.some((w) => w.startsWith('the location does not improve the fit materially'))).toBe(true);
    expect(fit.location).toBeGreaterThan(0);
    expect(fit.location).toBeLessThan(17.88);
  });

  it('falls back to two parameters, with a warning, when the profile only rises toward the first failure', () => {
    // Shape 0.6: the likelihood grows as γ approaches the first failure and has no interior peak here.
    const data = weibullSample(4, 40, 0.6, 100, { location: 5 });
    const fit = fitWeibull(data, { method: 'mle', threeParameter: true });
    const two = fitWeibull(data, { method: 'mle' });
    expect(fit.location).toBe(0);
    expect(fit.shape).toBe(two.shape);
    expect(fit.warnings.some((w) => w.startsWith('the location runs up to the first failure life'))).toBe(true);
    // the profile does rise toward the first failure (recomputed here)
    const first = Math.min(...data.map((d) => d.time));
    expect(profile(data, first * 0.999)).toBeGreaterThan(profile(data, first * 0.5));
    expect(profile(data, first * 0.5)).toBeGreaterThan(profile(data, 0));
  });

  it('reports γ = 0 when the profile is highest there', () => {
    // An invented sample where the profile falls from γ = 0 (checked here, not assumed).
    const data = weibullSample(4, 15, 3.5, 10);
    const first = Math.min(...data.map((d) => d.time));
    expect(profile(data, 0)).toBeGreaterThan(profile(data, first * 0.01));
    expect(profile(data, 0)).toBeGreaterThan(profile(data, first * 0.5));
    const fit = fitWeibull(data, { method: 'mle', threeParameter: true });
    expect(fit.location).toBe(0);
    expect(fit.warnings).toContain('the best location is 0: the three-parameter fit reduces to the two-parameter one');
  });

  it('needs three failures', () => {
    const data = [
      { time: 2, failed: true },
      { time: 3, failed: true },
      { time: 5, failed: false },
    ];
    expect(() => fitWeibull(data, { method: 'mle', threeParameter: true })).toThrow(FitError);
  });
});
