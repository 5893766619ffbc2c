// The forecast (src/analysis/forecast.ts): top probabilities year by year as ages grow, with a
// planned renewal restarting a component's age. Checked against the Weibull CDF
// F(t) = 1 − exp(−(t/η)^β) (W. Weibull 1951; Abernethy, The New Weibull Handbook) evaluated here
// at ages counted by hand from the calendar (1 year = 365.25 days, DESIGN.md).
import { describe, expect, it } from 'vitest';
import { analyze } from '../../src/analysis/analyze.js';
import { yearsAfter } from '../../src/analysis/forecast.js';
import { studyOf } from './helpers.js';

const SHAPE = 3.2;
const SCALE = 45;
const F = (t: number) => -Math.expm1(-Math.pow(t / SCALE, SHAPE));

// Invented: one generator (a Weibull component, no exercise) and a fixed-probability switchboard.
const study = studyOf({
  events: `
events:
  gen: { title: Generator fails, model: weibull, shape: { value: ${SHAPE}, source: test-data }, scale: { value: ${SCALE} years, source: test-data }, installed: 2006-06-30 }
  board: { title: Board fails, model: fixed, probability: { value: 1e-3, source: test-data } }
`,
  logic: `
tops:
  gen-only: { title: Generator fails, gate: g1 }
  either: { title: Generator or board fails, gate: g2 }
gates:
  g1: { any: [gen] }
  g2: { any: [gen, board] }
scenarios:
  renew-gen:
    title: Generator replaced mid-2031 (invented)
    renew: { gen: 2031-06-30 }
  no-renewal:
    title: Board data doubled (invented)
    set: { board.probability: 2e-3 }
`,
  settings: '  samples: 0\n  seed: 1\n  horizon: 10',
});
const results = analyze(study);
// Age at as_of 2026-06-30 from 2006-06-30: 7305 days (leap days 2008, 2012, 2016, 2020, 2024) = 20 years.
const AGE0 = 7305 / 365.25;
// Renewal 2031-06-30 is 365 + 366 (2028) + 365 + 365 + 365 = 1826 days after as_of.
const RENEWAL = 1826 / 365.25;

describe('forecast', () => {
  const base = results.forecast!.find((f) => f.scenario === undefined)!;
  const renewed = results.forecast!.find((f) => f.scenario === 'renew-gen')!;

  it('year 0 equals the point estimate, for every top', () => {
    for (const top of results.tops) expect(base.years[0]!.tops[top.id]).toBe(top.probability.exact);
    expect(base.years[0]!.date).toBe('2026-06-30');
  });

  it('covers years 0 … horizon, the ages growing by a year each', () => {
    expect(base.years.map((y) => y.year)).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10]);
    expect(base.years[10]!.date).toBe('2036-06-30');
    for (const y of base.years) expect(y.tops['gen-only']).toBeCloseTo(F(AGE0 + y.year), 14);
  });

  it('a renewal in year k drops the component to its new age: F(k − renewal) after it, unchanged before', () => {
    for (const y of renewed.years) {
      const age = y.year >= RENEWAL ? y.year - RENEWAL : AGE0 + y.year;
      expect(y.tops['gen-only']).toBeCloseTo(F(age), 14);
    }
    // Year 4 is before the renewal date (1826 days > 4 × 365.25), year 5 after (1826 < 1826.25).
    expect(renewed.years[4]!.tops['gen-only']).toBe(base.years[4]!.tops['gen-only']);
    expect(renewed.years[5]!.tops['gen-only']).toBeLessThan(1e-9);
    // One-quarter day after renewal: F(0.25/365.25) = (6.84e-4/45)^3.2, hand arithmetic ≈ 3.7e-16.
    expect(renewed.years[5]!.tops['gen-only']).toBeCloseTo(Math.pow((5 - RENEWAL) / SCALE, SHAPE), 20);
    expect(renewed.title).toBe('Generator replaced mid-2031 (invented)');
  });

  it('the other top includes the board: 1 − (1 − F)(1 − 1e-3)', () => {
    for (const y of renewed.years) {
      const age = y.year >= RENEWAL ? y.year - RENEWAL : AGE0 + y.year;
      expect(y.tops['either']).toBeCloseTo(1 - (1 - F(age)) * (1 - 1e-3), 14);
    }
  });

  it('only scenarios that renew something get a forecast', () => {
    expect(results.forecast!.map((f) => f.scenario)).toEqual([undefined, 'renew-gen']);
  });

  it('renewals take effect on their dates, so at as_of the renewal scenario equals the base case', () => {
    const s = results.scenarios!.find((x) => x.id === 'renew-gen')!;
    expect(s.tops.map((t) => t.ratio)).toEqual([1, 1]);
    expect(s.renew).toEqual([{ event: 'gen', date: '2031-06-30' }]);
  });
});

describe('yearsAfter', () => {
  it('keeps month and day; 29 February falls back to the 28th in a common year (common practice, no source)', () => {
    expect(yearsAfter('2026-06-30', 3)).toBe('2029-06-30');
    expect(yearsAfter('2024-02-29', 1)).toBe('2025-02-28');
    expect(yearsAfter('2024-02-29', 4)).toBe('2028-02-29');
    expect(yearsAfter('2026-06', 1)).toBe('2027-06-01');
  });
});
