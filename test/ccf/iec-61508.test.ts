/**
 * IEC 61508-6:2010, Annex B, simplified low-demand formulas (valid for λT ≪ 1, negligible repair
 * and test time), as listed in ../shared/reference/README.md:
 *   one channel        PFDavg ≈ λ_DU·T/2
 *   1oo2 with β        PFDavg ≈ ((1 − β)·λ_DU·T)²/3 + β·λ_DU·T/2.
 * Model here: each channel is a `tested` basic event (rate λ, interval T), the two channels form a
 * beta-factor common-cause group (NUREG/CR-5485), the top is AND(channel A, channel B), quantified
 * exactly on the decision diagram. All numbers are INVENTED for the test.
 *
 * Why the /3 needs care. Both channels are tested together, so at a time t after a test each is
 * failed with the same instantaneous Q(t) = 1 − e^(−λt), and the two independent failures are
 * present together with Q(t)². The standard's /3 is the time average of that product,
 * (1/T)∫(λt)²dt = (λT)²/3. The study's `tested` model instead gives each channel its own
 * time-average Ū ≈ λT/2, and the point estimate multiplies averages: Ū² ≈ (λT)²/4. So
 *   1. the point estimate must approach ((1 − β)λT)²/4 + βλT/2 — the documented relationship,
 *      three quarters of the standard's independent term; and
 *   2. the time average of the exact two-channel unavailability — the same logic and the same
 *      common-cause expansion evaluated at Q(t) and integrated over the test interval — must
 *      approach the standard's formula itself.
 */
import { describe, expect, it } from 'vitest';
import { analyze } from '../../src/analysis/analyze.js';
import { commonCauseOf } from '../../src/analysis/common-cause.js';
import { buildLogicModel } from '../../src/analysis/logic-model.js';
import { compileCase } from '../../src/analysis/quantify.js';
import { probability } from '../../src/logic/index.js';
import { integrate } from '../../src/reliability/quadrature.js';
import { testedUnavailability } from '../../src/reliability/models/index.js';
import { QUICK, rel, studyOf } from './helpers.js';

const T = 1; // year

function channels(lambda: number, beta: number) {
  return studyOf({
    settings: QUICK,
    events: `events:
  channel-a: { title: Channel A fails dangerously undetected (invented), model: tested, rate: { value: ${lambda} /year, source: test-data }, interval: { value: ${T} year, source: test-data } }
  channel-b: { title: Channel B fails dangerously undetected (invented), model: tested, rate: { value: ${lambda} /year, source: test-data }, interval: { value: ${T} year, source: test-data } }
`,
    logic: `tops:
  both-fail: { title: Both channels fail (1oo2 lost), gate: both }
gates:
  both: { all: [channel-a, channel-b] }
common_cause:
  channels:
    members: [channel-a, channel-b]
    method: beta
    beta: { value: ${beta}, source: test-data }
`,
  });
}

const iec1oo2 = (x: number, beta: number) => ((1 - beta) * x) ** 2 / 3 + (beta * x) / 2;

describe('IEC 61508-6 Annex B, 1oo2 with a beta factor, as λT → 0', () => {
  // β small so the independent term (where /3 and /4 differ) is a large part of the total.
  const beta = 0.001;
  const lambdas = [1e-2, 1e-3, 1e-4];

  it('one channel: the tested model approaches λT/2', () => {
    for (const lambda of lambdas) {
      expect(rel(testedUnavailability({ rate: lambda, interval: T }), (lambda * T) / 2)).toBeLessThanOrEqual(lambda * T);
    }
  });

  it('the point estimate (product of time averages) approaches ((1 − β)λT)²/4 + βλT/2, not the /3 form', () => {
    const errors: number[] = [];
    for (const lambda of lambdas) {
      const results = analyze(channels(lambda, beta));
      const p = results.tops[0]!.probability.exact;
      const x = lambda * T;
      // Exactly, by hand: Ū from the README; independent parts (1 − β)Ū, shared βŪ.
      // (expm1 and a + b − ab rather than 1 − (1 − a)(1 − b), so the hand value has no cancellation.)
      const u = 1 + Math.expm1(-x) / x;
      const a = ((1 - beta) * u) ** 2;
      const b = beta * u;
      expect(rel(p, a + b - a * b)).toBeLessThanOrEqual(1e-10);
      const quarter = ((1 - beta) * x) ** 2 / 4 + (beta * x) / 2;
      errors.push(rel(p, quarter));
      // And it is visibly below the standard's formula: the ratio tends to (1/4 + r)/(1/3 + r), r = β/(2(1−β)²x).
      const r = beta / (2 * (1 - beta) ** 2 * x);
      expect(Math.abs(p / iec1oo2(x, beta) - (0.25 + r) / (1 / 3 + r))).toBeLessThanOrEqual(2 * x);
    }
    errors.forEach((e, i) => expect(e).toBeLessThanOrEqual(lambdas[i]! * T));
  });

  it('the time average of the exact two-channel unavailability approaches the /3 formula', () => {
    const errors: number[] = [];
    for (const lambda of lambdas) {
      const study = channels(lambda, beta);
      const model = buildLogicModel(study);
      const compiled = compileCase(study, model, new Map());
      const root = compiled.gateRoots[model.topGates[0]!]!;
      const expansion = commonCauseOf(study);
      const value = (key: string) => study.parameters.find((p) => p.key === key)!.value;
      // U(t): both channels at the instantaneous Q(t) = 1 − e^(−λt) since the common test, expanded
      // by the same beta-factor group, on the same decision diagram.
      const u = (t: number) => {
        const q = -Math.expm1(-lambda * t);
        return probability(compiled.manager, root, expansion.apply([q, q], value));
      };
      const average = integrate(u, 0, T) / T;
      // Sanity: the same integral of one channel's Q(t) is the tested model's own average.
      expect(rel(integrate((t) => -Math.expm1(-lambda * t), 0, T) / T, testedUnavailability({ rate: lambda, interval: T }))).toBeLessThanOrEqual(1e-12);
      errors.push(rel(average, iec1oo2(lambda * T, beta)));
    }
    // The relative error is of order λT and falls with it.
    errors.forEach((e, i) => expect(e).toBeLessThanOrEqual(lambdas[i]! * T));
    expect(errors[2]!).toBeLessThan(errors[0]! / 10);
  });
});
