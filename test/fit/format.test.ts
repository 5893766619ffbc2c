// The terminal table of a fit (src/reliability/fit/format.ts) and the plain-data contract of fitWeibull.
import { describe, expect, it } from 'vitest';
import { fitWeibull, formatFit } from '../../src/reliability/fit/index.js';
import { INVENTED_CENSORED, ballBearings } from './helpers.js';

describe('formatFit', () => {
  it('shows the estimates to 4 significant figures, the level convention and the verdict', () => {
    const fit = fitWeibull(ballBearings(), { method: 'mle', confidence: 0.95 });
    const text = formatFit(fit, 'million revolutions');
    expect(text).toMatch(/^Weibull fit, 2 parameters, maximum likelihood\n23 lives: 23 failures, 0 suspensions\n/);
    expect(text).toMatch(/shape β\s+2\.102\s/);
    expect(text).toMatch(/scale η \(million revolutions\)\s+81\.88\s/);
    expect(text).toContain('each one-sided at 95% (together a two-sided 90% interval)');
    expect(text).toMatch(/vs 5% critical 0\.757: not rejected/);
    // every estimate and bound in the table is the fit's own number, rounded
    for (const v of [fit.bounds.fisher.shape.lower, fit.bounds.fisher.scale.upper, fit.b10, fit.bounds.likelihoodRatio!.shape!.upper]) {
      expect(text).toContain(v.toPrecision(4));
    }
  });

  it('lists warnings and the location for a three-parameter fit', () => {
    const text = formatFit(fitWeibull(ballBearings(), { method: 'rank', threeParameter: true }));
    expect(text).toContain('3 parameters, median-rank regression (life on rank)');
    expect(text).toMatch(/location γ\s+\d/);
    expect(text).toContain('Warnings:\n  - the location does not improve the fit materially');
    expect(text).not.toContain('LR lower');
  });
});

describe('fitWeibull result', () => {
  it('is plain, finite JSON and deterministic', () => {
    for (const options of [{ method: 'mle' }, { method: 'rank' }, { method: 'mle', threeParameter: true }] as const) {
      const a = fitWeibull(INVENTED_CENSORED, options);
      const b = fitWeibull([...INVENTED_CENSORED].reverse(), options); // input order does not matter
      expect(JSON.stringify(a)).toBe(JSON.stringify(b));
      expect(JSON.parse(JSON.stringify(a))).toEqual(a); // no NaN, Infinity or undefined hiding in it
      expect(a.covarianceLog[0][1]).toBe(a.covarianceLog[1][0]);
      expect(a.plot.points).toHaveLength(a.failures);
    }
  });
});
