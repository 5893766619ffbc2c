// One-at-a-time sensitivity, the exercise-interval curve and scenarios (src/analysis/sensitivity.ts,
// src/analysis/scenarios.ts) on small invented studies, against top probabilities worked out here
// from the model formulas: OR of independent events 1 − Π(1 − qᵢ) (NUREG-0492, Fault Tree
// Handbook), rate model 1 − e^(−λt), Weibull F(t) = 1 − exp(−(t/η)^β) and, with exercise τ,
// 1 − R(a + τ)/R(a) (DESIGN.md models; Weibull forms as in Abernethy, The New Weibull Handbook).
import { describe, expect, it } from 'vitest';
import { analyze } from '../../src/analysis/analyze.js';
import { studyOf } from './helpers.js';

const study = studyOf({
  events: `
events:
  a: { title: A, model: fixed, probability: { value: 0.01, source: test-data, range: [0.005, 0.03] } }
  b: { title: B, model: fixed, probability: { value: 0.02, source: test-data } }
  r: { title: R, model: rate, rate: { value: 1e-3 /h, source: test-data }, exposure: { value: 10 h, source: test-data } }
  w: { title: W, model: weibull, shape: { value: 3, source: test-data }, scale: { value: 50 years, source: test-data }, installed: 2000 }
  x: { title: X (only with the switch on), model: fixed, probability: { value: 0.1, source: test-data } }
  house: { title: House event, model: switch, on: false }
  hi: { title: High, model: fixed, probability: { value: 0.6, source: test-data } }
`,
  logic: `
tops:
  t1: { title: First top, gate: g1 }
  t2: { title: Second top, gate: g2 }
gates:
  g1: { any: [a, b, r, w, muted] }
  muted: { all: [x, house] }
  g2: { any: [hi] }
scenarios:
  house-on:
    title: House event on (invented)
    switch: { house: true }
  double-b:
    title: B doubled (invented)
    set: { b.probability: 0.04 }
`,
  settings: '  samples: 0\n  seed: 1\n  horizon: 0\n  sensitivity_factor: 2',
});
const results = analyze(study);
const or = (...q: number[]) => 1 - q.reduce((s, x) => s * (1 - x), 1);
const qw = results.events.find((e) => e.id === 'w')!.probability;
// Rate per hour × 10 h exposure (the units cancel; the study stores both per year and in years).
const qr = (perHour: number) => -Math.expm1(-perHour * 10);

describe('tornado', () => {
  const t1 = results.sensitivity!.find((s) => s.top === 't1')!;
  const row = (key: string) => t1.tornado.find((x) => x.key === key)!;

  it('uses the stated range, else value ÷/× sensitivity_factor, and gives the top at each end', () => {
    const a = row('a.probability');
    expect([a.low_value, a.high_value]).toEqual([0.005, 0.03]);
    expect(a.low).toBeCloseTo(or(0.005, 0.02, qr(1e-3), qw), 15);
    expect(a.high).toBeCloseTo(or(0.03, 0.02, qr(1e-3), qw), 15);
    const b = row('b.probability');
    expect([b.low_value, b.high_value]).toEqual([0.01, 0.04]);
    expect(b.high).toBeCloseTo(or(0.01, 0.04, qr(1e-3), qw), 15);
    const r = row('r.rate');
    expect(r.low).toBeCloseTo(or(0.01, 0.02, qr(5e-4), qw), 14);
    expect(r.base).toBeCloseTo(results.tops[0]!.probability.exact, 15);
  });

  it('a probability’s high end is capped at 1', () => {
    const hi = results.sensitivity!.find((s) => s.top === 't2')!.tornado.find((x) => x.key === 'hi.probability')!;
    expect([hi.low_value, hi.high_value]).toEqual([0.3, 1]);
    expect(hi.high).toBe(1);
  });

  it('a parameter with no effect on the top has zero swing', () => {
    // x sits under an AND with a house event that is off.
    const x = row('x.probability');
    expect(x.swing).toBe(0);
    expect(x.low).toBe(x.base);
    // And every parameter of t2's events other than hi leaves t2 unchanged.
    const t2 = results.sensitivity!.find((s) => s.top === 't2')!;
    for (const e of t2.tornado) if (e.key !== 'hi.probability') expect(e.swing).toBe(0);
  });

  it('the swing’s sign follows the model: up with a probability or rate, down with a longer Weibull life', () => {
    expect(row('a.probability').swing).toBeGreaterThan(0);
    expect(row('r.rate').swing).toBeGreaterThan(0);
    expect(row('r.exposure').swing).toBeGreaterThan(0);
    // F = 1 − exp(−(t/η)^β) falls as η grows; with t < η it also falls as β grows.
    expect(row('w.scale').swing).toBeLessThan(0);
    expect(row('w.shape').swing).toBeLessThan(0);
    for (const e of t1.tornado) expect(e.swing).toBe(e.high - e.low);
  });

  it('is sorted by the size of the swing', () => {
    for (let k = 1; k < t1.tornado.length; k++) expect(Math.abs(t1.tornado[k - 1]!.swing)).toBeGreaterThanOrEqual(Math.abs(t1.tornado[k]!.swing));
  });

  it('without exercise fields there is no exercise curve', () => {
    expect(t1.exercise_curve).toEqual([]);
  });
});

describe('scenarios', () => {
  it('a switch scenario is quantified on its own diagram; a set scenario on the base one; ratio = scenario ÷ base', () => {
    const base = results.tops[0]!.probability.exact;
    const on = results.scenarios!.find((s) => s.id === 'house-on')!.tops[0]!;
    expect(on.probability).toBeCloseTo(or(0.01, 0.02, qr(1e-3), qw, 0.1), 15);
    expect(on.ratio).toBeCloseTo(on.probability / base, 15);
    expect(on.base).toBe(base);
    const dbl = results.scenarios!.find((s) => s.id === 'double-b')!;
    expect(dbl.tops[0]!.probability).toBeCloseTo(or(0.01, 0.04, qr(1e-3), qw), 15);
    expect(dbl.set).toEqual([{ key: 'b.probability', value: 0.04, written: '0.04' }]);
    // t2 does not involve b: ratio exactly 1.
    expect(dbl.tops[1]!.ratio).toBe(1);
  });
});

describe('exercise interval curve', () => {
  const ex = studyOf({
    events: `
classes:
  motor:
    model: weibull
    shape: { value: 2.5, source: test-data }
    scale: { value: 40 years, source: test-data }
    exercise: { value: 1 month, source: test-data }
events:
  m: { title: Motor, class: motor, installed: 2006-06-30 }
`,
    logic: 'tops:\n  t: { title: Motor fails, gate: g }\ngates:\n  g: { any: [m] }\n',
    settings: '  samples: 0\n  seed: 1\n  horizon: 0',
  });
  const r = analyze(ex);
  const curve = r.sensitivity![0]!.exercise_curve;
  // Age at as_of 2026-06-30: 7305 days (five leap days, 2008–2024) = 20 years exactly.
  const a = 7305 / 365.25;
  const q = (tau: number) => -Math.expm1(-(Math.pow((a + tau) / 40, 2.5) - Math.pow(a / 40, 2.5)));

  it('base first, then weekly, monthly, quarterly, yearly: 1 − R(a + τ)/R(a) at each', () => {
    expect(curve.map((c) => c.label)).toEqual(['as studied', 'weekly', 'monthly', 'quarterly', 'yearly']);
    expect(curve[0]!.base).toBe(true);
    expect(curve[0]!.years).toBeCloseTo(1 / 12, 15);
    expect(curve[0]!.probability).toBe(r.tops[0]!.probability.exact);
    const taus = [7 / 365.25, 1 / 12, 0.25, 1];
    taus.forEach((tau, k) => expect(curve[k + 1]!.probability).toBeCloseTo(q(tau), 13));
    // Longer between exercises → more likely to be found failed (common practice, no source).
    for (let k = 2; k < curve.length; k++) expect(curve[k]!.probability).toBeGreaterThan(curve[k - 1]!.probability);
  });
});

describe('an end outside the parameter’s domain', () => {
  it('is not evaluated: the parameter is listed as skipped with the reason (checkDomain of the study reader)', () => {
    // shape × 2 overflows to Infinity, which no Weibull shape can be; the base case is valid.
    const r = analyze(
      studyOf({
        events: 'events:\n  w: { title: W, model: weibull, shape: { value: 1e308, source: test-data }, scale: { value: 60 years, source: test-data }, installed: 2000 }\n  a: { title: A, model: fixed, probability: { value: 0.01, source: test-data } }\n',
        logic: 'tops:\n  t: { title: T, gate: g }\ngates:\n  g: { any: [w, a] }\n',
        settings: '  samples: 0\n  seed: 1\n  horizon: 0',
      }),
    );
    const s = r.sensitivity![0]!;
    expect(s.skipped.map((x) => x.key)).toEqual(['w.shape']);
    expect(s.skipped[0]!.reason).toMatch(/Infinity/);
    expect(s.tornado.map((x) => x.key).sort()).toEqual(['a.probability', 'w.scale']);
  });
});

describe('a common-cause factor moves the top through the expansion (beta factor, NUREG/CR-5485)', () => {
  // Two pumps of one class, Q = 0.1 each, in a beta-factor group; both must fail. Expanded:
  // independent parts (1 − β)Q each and one shared event βQ, so
  // P(β) = βQ + (1 − βQ)·((1 − β)Q)² (NUREG/CR-5485 beta factor; OR/AND of independent events).
  const Q = 0.1;
  const P = (beta: number) => beta * Q + (1 - beta * Q) * ((1 - beta) * Q) ** 2;
  const r = analyze(
    studyOf({
      events: `classes:\n  pump: { model: fixed, probability: { value: ${Q}, source: test-data } }\nevents:\n  a: { title: Pump A, class: pump }\n  b: { title: Pump B, class: pump }\n`,
      logic: `tops:\n  t: { title: Both pumps, gate: g }\ngates:\n  g: { all: [a, b] }\ncommon_cause:\n  pumps: { members: [a, b], method: beta, beta: { value: 0.1, source: test-data, range: [0.05, 0.2], uncertainty: { uniform: { min: 0.05, max: 0.2 } } } }\n`,
      settings: '  samples: 40000\n  seed: 3\n  horizon: 0',
    }),
  );

  it('tornado ends at P(0.05) and P(0.2)', () => {
    const row = r.sensitivity![0]!.tornado.find((x) => x.key === 'pumps.beta')!;
    expect(r.tops[0]!.probability.exact).toBeCloseTo(P(0.1), 15);
    expect(row.low).toBeCloseTo(P(0.05), 15);
    expect(row.high).toBeCloseTo(P(0.2), 15);
  });

  it('sampled uniformly, the Monte Carlo mean is within 3 standard errors of the mean of P(β) over [0.05, 0.2]', () => {
    const u = r.uncertainty![0]!;
    expect(u.sampled_parameters).toEqual(['pumps.beta']);
    // E[P(β)] by Simpson's rule on the cubic P (exact for a cubic).
    const n = 100;
    const h = 0.15 / n;
    let sum = P(0.05) + P(0.2);
    for (let i = 1; i < n; i++) sum += (i % 2 ? 4 : 2) * P(0.05 + i * h);
    const mean = (sum * h) / 3 / 0.15;
    expect(Math.abs(u.mean - mean)).toBeLessThan(3 * u.standard_error);
  });
});
