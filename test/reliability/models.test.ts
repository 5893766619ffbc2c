// Failure models (DESIGN.md "Models") against hand arithmetic (written beside each check),
// @stdlib/stats-base-dists-* distribution functions, and IEC 61508-6:2010 Annex B.
import { describe, expect, it } from 'vitest';
import * as exponential from '@stdlib/stats-base-dists-exponential';
import * as weibull from '@stdlib/stats-base-dists-weibull';
import * as gammaDist from '@stdlib/stats-base-dists-gamma';
import {
  bLife,
  demandProbability,
  fixedProbability,
  hiddenFailureFraction,
  modelProbability,
  rateProbability,
  repairableUnavailability,
  switchProbability,
  testedUnavailability,
  weibullAverageConditionalFailure,
  weibullCdf,
  weibullConditionalFailure,
  weibullCumulativeHazard,
  weibullEventProbability,
  weibullHazard,
  weibullHazardIncrement,
  weibullMean,
  weibullQuantile,
} from '../../src/reliability/models/index.js';
import { integrate } from '../../src/reliability/quadrature.js';

const rel = (a: number, e: number) => (a === e ? 0 : Math.abs(a - e) / Math.abs(e));
const DAY = 1 / 365.25;
const HOUR = DAY / 24;

describe('fixed, rate, repairable, switch', () => {
  it('fixed is the probability as given; outside [0, 1] is NaN', () => {
    expect(fixedProbability(3e-3)).toBe(3e-3);
    expect(Number.isNaN(fixedProbability(1.2))).toBe(true);
    expect(Number.isNaN(fixedProbability(-0.1))).toBe(true);
  });

  it('rate: 1 − e^(−λt) matches @stdlib exponential cdf', () => {
    // Source: @stdlib/stats-base-dists-exponential cdf(t; λ) = 1 − e^(−λt). Compared absolutely: the
    // library forms 1 − e^(−λt) directly, which is exact in absolute terms but not relative for tiny λt
    // (that case is checked by hand in the next test).
    for (const lambda of [1e-6, 2e-3, 0.1, 1, 30]) {
      for (const t of [1e-3, 0.5, 1, 10, 75]) {
        expect(Math.abs(rateProbability(lambda, t) - exponential.cdf(t, lambda))).toBeLessThan(3e-16);
      }
    }
    // Hand: λ = 2e-3 /year, t = 10 years: 1 − e^(−0.02) = 0.019801326693244747.
    expect(rateProbability(2e-3, 10)).toBeCloseTo(0.019801326693244747, 16);
  });

  it('rate keeps full precision for tiny λt (where 1 − exp(−x) would not)', () => {
    // Hand: x = 1e-12, 1 − e^(−x) = x − x²/2 + … = 1e-12 − 5e-25 (Taylor, common practice, no source).
    expect(rel(rateProbability(1e-9, 1e-3), 1e-12 - 5e-25)).toBeLessThan(1e-15);
    expect(rel(1 - Math.exp(-1e-12), 1e-12)).toBeGreaterThan(1e-6); // the naive form really does fail here
  });

  it('repairable: λτ/(1 + λτ) = MTTR/(MTTF + MTTR)', () => {
    // Source: NUREG-0492 (Fault Tree Handbook) steady-state unavailability of a repaired component.
    // Hand: λ = 0.1 /year, τ = 3 days = 3/365.25 year: λτ = 8.213552361396304e-4,
    // U = 8.213552361396304e-4 / 1.0008213552361396 = 8.206811...e-4.
    const x = (0.1 * 3) / 365.25;
    expect(repairableUnavailability(0.1, 3 * DAY)).toBeCloseTo(x / (1 + x), 18);
    expect(rel(repairableUnavailability(0.1, 3 * DAY), (3 * DAY) / (1 / 0.1 + 3 * DAY))).toBeLessThan(1e-15);
    expect(repairableUnavailability(0.1, 3 * DAY)).toBeCloseTo(8.2068115e-4, 10);
  });

  it('switch is 1 or 0', () => {
    expect(switchProbability(true)).toBe(1);
    expect(switchProbability(false)).toBe(0);
  });
});

describe('tested: periodically tested standby component', () => {
  it('→ λT/2 as λT → 0 (IEC 61508-6:2010 Annex B, PFDavg = λ_DU·T/2 for one channel)', () => {
    for (const x of [1e-10, 1e-7, 1e-5, 1e-4]) {
      // Relative gap to λT/2 is (λT)/3 to first order (from the series below).
      const u = testedUnavailability({ rate: x, interval: 1 });
      expect(rel(u, x / 2)).toBeLessThan(x / 3 + 1e-15);
      expect(u).toBeLessThan(x / 2); // approaches from below
    }
  });

  it('equals the series λT/2 − (λT)²/6 + (λT)³/24 at moderate λT', () => {
    // Source: IEC 61508-6 Annex B note on the exact average, 1 − (1 − e^(−x))/x = x/2 − x²/6 + x³/24 − x⁴/120 + …
    for (const x of [0.01, 0.05, 0.09, 0.11, 0.2]) {
      const series = x / 2 - x ** 2 / 6 + x ** 3 / 24;
      // Omitted x⁴/120 − … bounds the gap.
      expect(Math.abs(hiddenFailureFraction(x) - series)).toBeLessThan(x ** 4 / 120 + 1e-17);
    }
    // Hand: λ = 0.01 /year, T = 1 year: e^(−0.01) = 0.990049833749168, 1 − (1 − 0.990049833749168)/0.01 = 0.0049833749168.
    expect(testedUnavailability({ rate: 0.01, interval: 1 })).toBeCloseTo(0.0049833749168, 13);
  });

  it('matches a brute-force time average of 1 − e^(−λt) over the cycle, both sides of the series switch', () => {
    // Independent check: midpoint rule with 200 000 steps (error ~ (λT)³/(24·n²), far below the tolerance).
    for (const x of [0.03, 0.0999, 0.1, 0.1001, 2, 15]) {
      const n = 200000;
      let sum = 0;
      for (let i = 0; i < n; i++) sum += -Math.expm1(-x * ((i + 0.5) / n));
      expect(rel(hiddenFailureFraction(x), sum / n)).toBeLessThan(1e-9);
    }
  });

  it('adds the test outage and the repair outage, capped at 1', () => {
    // Hand: λ = 0.02 /year, T = 1 month, test 8 h, repair 3 days.
    // x = 0.02/12 = 1.6667e-3; hidden = x/2 − x²/6 + x³/24 − x⁴/120 = 8.3287e-4 (to 5 figures);
    // test = (8/8766)/(1/12) = 0.0109514; repair = (1 − e^(−x))·(3/365.25)/(1/12) = 1.66528e-3·0.0985626 = 1.64134e-4.
    const T = 1 / 12;
    const x = 0.02 * T;
    const hidden = x / 2 - x ** 2 / 6 + x ** 3 / 24 - x ** 4 / 120;
    const test = (8 * HOUR) / T;
    const repair = (-Math.expm1(-x) * 3 * DAY) / T;
    const u = testedUnavailability({ rate: 0.02, interval: T, testDuration: 8 * HOUR, repair: 3 * DAY });
    expect(u).toBeCloseTo(hidden + test + repair, 14);
    expect(u).toBeCloseTo(8.3287e-4 + 0.0109514 + 1.64134e-4, 6);
    expect(testedUnavailability({ rate: 5, interval: 1, testDuration: 0.9 })).toBe(1);
    expect(Number.isNaN(testedUnavailability({ rate: 0.1, interval: 0 }))).toBe(true);
  });
});

describe('demand', () => {
  it('per-demand only is the probability; with standby: 1 − (1 − q_d)(1 − Ū)', () => {
    expect(demandProbability({ probability: 1e-3 })).toBe(1e-3);
    // Hand: q_d = 1e-3, λ = 0.01 /year, T = 1 year: Ū = 0.0049833749168; 1 − 0.999 × 0.9950166250832 = 0.0059783915...
    expect(demandProbability({ probability: 1e-3, rate: 0.01, interval: 1 })).toBeCloseTo(1 - 0.999 * (1 - 0.0049833749168), 13);
    expect(Number.isNaN(demandProbability({ probability: 1e-3, rate: 0.01 }))).toBe(true);
  });
});

describe('weibull functions', () => {
  const grid = [0.5, 1, 1.7, 3.1, 6];
  it('cdf matches @stdlib weibull cdf (2-parameter)', () => {
    for (const beta of grid) {
      for (const eta of [0.3, 10, 75]) {
        for (const t of [0.01, 1, 5, 20, 75, 150]) {
          const ref = weibull.cdf(t, beta, eta);
          if (ref > 1e-300) expect(rel(weibullCdf(t, beta, eta), ref), `β ${beta}, η ${eta}, t ${t}`).toBeLessThan(1e-13);
        }
      }
    }
  });

  it('F(η) = 1 − e⁻¹ = 0.6321 for any shape', () => {
    // Common practice, no source (also /work/shared/reference/README.md).
    for (const beta of [0.3, 0.5, 1, 2, 3.1, 10, 40]) {
      expect(weibullCdf(75, beta, 75)).toBeCloseTo(1 - Math.exp(-1), 15);
      expect(weibullCdf(75, beta, 75)).toBeCloseTo(0.6321, 4);
      expect(weibullCdf(80, beta, 75, 5)).toBeCloseTo(1 - Math.exp(-1), 15); // η past the location
    }
  });

  it('β = 1 is the constant-rate model with λ = 1/η', () => {
    // Common practice, no source: the exponential is the Weibull of shape 1.
    for (const eta of [2, 40, 500]) {
      for (const t of [0.1, 3, 30]) {
        expect(rel(weibullCdf(t, 1, eta), rateProbability(1 / eta, t))).toBeLessThan(1e-15);
        expect(rel(weibullHazard(t, 1, eta), 1 / eta)).toBeLessThan(1e-15);
      }
    }
  });

  it('3-parameter: zero before the location, a shifted 2-parameter after it', () => {
    expect(weibullCdf(4.99, 2, 50, 5)).toBe(0);
    expect(weibullCdf(5, 2, 50, 5)).toBe(0);
    expect(weibullHazard(3, 2, 50, 5)).toBe(0);
    expect(weibullCumulativeHazard(3, 2, 50, 5)).toBe(0);
    // Source: @stdlib weibull cdf at t − γ.
    for (const t of [6, 20, 60]) expect(rel(weibullCdf(t, 2.5, 50, 5), weibull.cdf(t - 5, 2.5, 50))).toBeLessThan(1e-14);
    // Limits at t = γ from the right (common practice, no source).
    expect(weibullHazard(5, 0.7, 50, 5)).toBe(Infinity);
    expect(weibullHazard(5, 1, 50, 5)).toBe(1 / 50);
    expect(weibullHazard(5, 2, 50, 5)).toBe(0);
  });

  it('hazard = pdf/(1 − cdf) and H = −ln(1 − F) from @stdlib', () => {
    for (const beta of grid) {
      for (const t of [0.5, 10, 40]) {
        // (At t = 60 with β = 6 the library's cdf rounds to 1, so the grid stops at 40.)
        const h = weibull.pdf(t, beta, 30) / (1 - weibull.cdf(t, beta, 30));
        expect(rel(weibullHazard(t, beta, 30), h)).toBeLessThan(1e-12);
        expect(rel(weibullCumulativeHazard(t, beta, 30), -Math.log1p(-weibull.cdf(t, beta, 30)))).toBeLessThan(1e-12);
      }
    }
  });

  it('quantile, mean and B-life match @stdlib and hand arithmetic', () => {
    for (const beta of grid) {
      for (const p of [0.01, 0.1, 0.5, 0.9, 0.999]) {
        expect(rel(weibullQuantile(p, beta, 75), weibull.quantile(p, beta, 75))).toBeLessThan(1e-13);
      }
      // Small p: the library forms ln(1 − p) (relative error ~1e-16/p), so check the round trip instead.
      for (const p of [1e-12, 1e-6]) expect(rel(weibullCdf(weibullQuantile(p, beta, 75), beta, 75), p)).toBeLessThan(1e-14);
      expect(rel(weibullMean(beta, 75), weibull.mean(beta, 75))).toBeLessThan(1e-13);
      expect(rel(weibullMean(beta, 75, 4), weibull.mean(beta, 75) + 4)).toBeLessThan(1e-13);
    }
    // Hand: B10 for β = 2, η = 100: 100·(−ln 0.9)^(1/2) = 100·√0.105360516 = 32.4592845.
    expect(bLife(0.1, 2, 100)).toBeCloseTo(32.4592845, 6);
    expect(bLife(0.1, 2, 100, 5)).toBeCloseTo(37.4592845, 6);
    // Hand: mean for β = 2, η = 100: 100·Γ(1.5) = 100·√π/2 = 88.6226925.
    expect(weibullMean(2, 100)).toBeCloseTo(88.6226925, 6);
  });
});

describe('weibull event probability', () => {
  it('no exercise: F(age)', () => {
    // Hand: β = 3.1, η = 75, age 32: H = (32/75)^3.1 = 0.0712..., F = 1 − e^(−H). Checked against @stdlib cdf.
    expect(rel(weibullEventProbability({ shape: 3.1, scale: 75, age: 32 }), weibull.cdf(32, 3.1, 75))).toBeLessThan(1e-14);
  });

  it('exercise, end basis: 1 − R(a+τ)/R(a) from @stdlib cdf', () => {
    for (const beta of [0.6, 1, 3.1]) {
      for (const [a, tau] of [[10, 1], [32, 1 / 12], [0, 0.5], [60, 5]] as const) {
        const Ra = 1 - weibull.cdf(a, beta, 75);
        const Rb = 1 - weibull.cdf(a + tau, beta, 75);
        // The oracle divides a difference of two library CDFs (relative error ~1e-16/q), hence 1e-9.
        expect(rel(weibullEventProbability({ shape: beta, scale: 75, age: a, exercise: tau }), 1 - Rb / Ra)).toBeLessThan(1e-9);
      }
    }
  });

  it('the hazard increment stays accurate for τ ≪ age (where H(a+τ) − H(a) would cancel)', () => {
    // Taylor: ΔH = u^β·(βε + β(β−1)ε²/2 + β(β−1)(β−2)ε³/6), ε = τ/(a−γ), u = (a−γ)/η (common practice, no source).
    const beta = 3.1;
    const a = 32;
    const tau = 1e-9;
    const eps = tau / a;
    const expected = (a / 75) ** beta * (beta * eps + (beta * (beta - 1) * eps ** 2) / 2);
    expect(rel(weibullHazardIncrement(a, tau, beta, 75), expected)).toBeLessThan(1e-12);
    expect(rel(weibullConditionalFailure(a, tau, beta, 75), -Math.expm1(-expected))).toBeLessThan(1e-12);
    // β = 1: memoryless, the increment is τ/η whatever the age.
    expect(rel(weibullHazardIncrement(1e6, 1e-3, 1, 50), 1e-3 / 50)).toBeLessThan(1e-12);
  });

  it('exercise, average basis: matches the closed form through the incomplete gamma (@stdlib gamma cdf)', () => {
    // Derivation: with u = ((t−γ)/η)^β, ∫_γ^x R(t) dt = (η/β)∫₀^H(x) u^(1/β−1) e^(−u) du = η·Γ(1+1/β)·P(1/β, H(x)),
    // and R = 1 before γ, so ∫_a^(a+τ) R dt = (time before γ) + η·Γ(1+1/β)·[P(1/β, H(a+τ)) − P(1/β, H(max(a, γ)))]
    // and the average is 1 − ∫_a^(a+τ) R dt / (τ·R(a)).
    // P is taken from @stdlib gamma cdf, Γ(1+1/β) from @stdlib weibull mean (η·Γ(1+1/β)).
    for (const beta of [0.5, 0.8, 1, 2, 3.1]) {
      for (const [a, tau, loc] of [[10, 1, 0], [32, 3, 0], [0, 2, 0], [2, 6, 4], [20, 10, 4], [4, 5, 4]] as const) {
        const H = (t: number) => (t > loc ? ((t - loc) / 75) ** beta : 0);
        const meanPart = weibull.mean(beta, 75); // 75·Γ(1+1/β)
        const failureFree = Math.max(0, Math.min(a + tau, loc) - a);
        const integralR =
          failureFree + meanPart * (gammaDist.cdf(H(a + tau), 1 / beta, 1) - gammaDist.cdf(H(Math.max(a, loc)), 1 / beta, 1));
        const expected = 1 - integralR / (tau * Math.exp(-H(a)));
        const got = weibullAverageConditionalFailure(a, tau, beta, 75, loc);
        expect(rel(got, expected), `β ${beta}, a ${a}, τ ${tau}, γ ${loc}`).toBeLessThan(1e-9);
      }
    }
  });

  it('average basis, β = 1: equals the tested hidden fraction with λ = 1/η (→ τ/(2η), IEC 61508-6 Annex B)', () => {
    for (const tau of [1e-4, 0.01, 1, 20]) {
      expect(rel(weibullAverageConditionalFailure(12, tau, 1, 50), hiddenFailureFraction(tau / 50))).toBeLessThan(1e-12);
    }
    expect(rel(weibullAverageConditionalFailure(12, 1e-4, 1, 50), 1e-4 / 100)).toBeLessThan(1e-5);
  });

  it('average lies below end and basis defaults to end', () => {
    const args = { shape: 3.1, scale: 75, age: 32, exercise: 1 / 12 };
    const end = weibullEventProbability(args);
    const avg = weibullEventProbability({ ...args, basis: 'average' });
    expect(weibullEventProbability({ ...args, basis: 'end' })).toBe(end);
    expect(avg).toBeLessThan(end);
    // Hazard rising slowly over a short interval: the average is close to half the end value.
    expect(avg / end).toBeGreaterThan(0.49);
    expect(avg / end).toBeLessThan(0.51);
  });

  it('exercise with repair adds q_end·MTTR/τ, combined as 1 − (1 − q)(1 − q_rep)', () => {
    // Hand: β = 3.1, η = 75, a = 32, τ = 1 month, MTTR = 3 days.
    const qEnd = weibullConditionalFailure(32, 1 / 12, 3.1, 75);
    const qRep = (qEnd * (3 / 365.25)) / (1 / 12);
    const got = weibullEventProbability({ shape: 3.1, scale: 75, age: 32, exercise: 1 / 12, repair: 3 * DAY });
    expect(got).toBeCloseTo(1 - (1 - qEnd) * (1 - qRep), 16);
    const avg = weibullAverageConditionalFailure(32, 1 / 12, 3.1, 75);
    const gotAvg = weibullEventProbability({ shape: 3.1, scale: 75, age: 32, exercise: 1 / 12, repair: 3 * DAY, basis: 'average' });
    // The reference form subtracts from 1, so it is itself only good to about 1e-16 absolute.
    expect(gotAvg).toBeCloseTo(1 - (1 - avg) * (1 - qRep), 15);
  });

  it('repair without exercise: the repairable form at the hazard of the age', () => {
    // Hand: β = 2, η = 50, a = 20: h = (2/50)(20/50) = 0.016 /year; MTTR 3 days: x = 0.016·3/365.25 = 1.31417e-4;
    // U = x/(1 + x) = 1.31400e-4.
    const x = (0.016 * 3) / 365.25;
    const got = weibullEventProbability({ shape: 2, scale: 50, age: 20, repair: 3 * DAY });
    expect(rel(got, x / (1 + x))).toBeLessThan(1e-14);
    expect(got).toBeCloseTo(1.314e-4, 7);
  });

  it('before the failure-free time nothing fails', () => {
    expect(weibullEventProbability({ shape: 2, scale: 50, location: 10, age: 3 })).toBe(0);
    expect(weibullEventProbability({ shape: 2, scale: 50, location: 10, age: 3, exercise: 5 })).toBe(0);
    expect(weibullEventProbability({ shape: 2, scale: 50, location: 10, age: 3, exercise: 5, basis: 'average' })).toBe(0);
  });
});

describe('modelProbability dispatches to each model', () => {
  it('gives the same numbers as the direct functions', () => {
    expect(modelProbability('fixed', { probability: 0.01 })).toBe(0.01);
    expect(modelProbability('rate', { rate: 2e-3, exposure: 10 })).toBe(rateProbability(2e-3, 10));
    expect(modelProbability('repairable', { rate: 0.1, repair: 3 * DAY })).toBe(repairableUnavailability(0.1, 3 * DAY));
    expect(modelProbability('tested', { rate: 0.02, interval: 1 / 12, test_duration: 8 * HOUR, repair: 3 * DAY })).toBe(
      testedUnavailability({ rate: 0.02, interval: 1 / 12, testDuration: 8 * HOUR, repair: 3 * DAY }),
    );
    expect(modelProbability('demand', { probability: 1e-3, rate: 0.01, interval: 1 })).toBe(
      demandProbability({ probability: 1e-3, rate: 0.01, interval: 1 }),
    );
    expect(modelProbability('weibull', { shape: 3.1, scale: 75, exercise: 1 / 12 }, { ageYears: 32, exerciseBasis: 'average' })).toBe(
      weibullEventProbability({ shape: 3.1, scale: 75, age: 32, exercise: 1 / 12, basis: 'average' }),
    );
    expect(modelProbability('switch', {}, { on: true })).toBe(1);
  });

  it('throws on a missing required field or context', () => {
    expect(() => modelProbability('rate', { rate: 1 })).toThrow(/exposure/);
    expect(() => modelProbability('weibull', { shape: 2, scale: 3 })).toThrow(/age/);
    expect(() => modelProbability('switch', {})).toThrow(/state/);
  });
});

describe('quadrature', () => {
  it('integrates polynomials exactly and e^x, √x to 1e-13', () => {
    // Gauss–Legendre with 10 points is exact for degree ≤ 19 (common practice, no source).
    expect(rel(integrate((x) => x ** 19, 0, 1), 1 / 20)).toBeLessThan(1e-14);
    expect(rel(integrate(Math.exp, 0, 3), Math.expm1(3))).toBeLessThan(1e-13);
    // √x has an infinite derivative at 0: ∫₀¹ √x dx = 2/3, reached by refinement.
    expect(rel(integrate(Math.sqrt, 0, 1), 2 / 3)).toBeLessThan(1e-12);
  });
});
