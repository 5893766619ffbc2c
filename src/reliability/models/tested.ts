/**
 * Periodically tested standby components: the `tested` and `demand` models.
 *
 * Derivation (time-average unavailability over one test cycle of length T):
 *   A standby component fails at constant rate λ; a failure stays hidden until the next test,
 *   which finds it (perfect test) and restores the component as good as new. At time t after a
 *   test it is failed with probability 1 − e^(−λt), so the average over the cycle is
 *     Ū_hidden = (1/T)∫₀ᵀ (1 − e^(−λt)) dt = 1 − (1 − e^(−λT))/(λT) = λT/2 − (λT)²/6 + (λT)³/24 − …
 *   It approaches λT/2, the simplified PFDavg of one channel in IEC 61508-6:2010 Annex B (valid for
 *   λT ≪ 1), from below.
 *   Test outage: the component is unavailable while tested, a fraction test_duration/T of the cycle.
 *   Repair outage: a failure is found at the end of a cycle with probability 1 − e^(−λT) and then
 *   takes a mean time MTTR to repair, a fraction (1 − e^(−λT))·MTTR/T of the cycle.
 * Assumptions: the three outages are short against T and simply add (no overlap is subtracted, so
 * the sum is slightly conservative); failures are found only by the test; the sum is capped at 1.
 */

/**
 * 1 − (1 − e^(−x))/x, the hidden (undetected-failure) part for x = λT. For small x the difference
 * cancels, so the alternating series Σₖ₌₁ (−1)^(k+1) x^k/(k+1)! is summed instead (x < 0.1: the
 * terms fall by at least 20 each and 14 of them reach full precision).
 */
export function hiddenFailureFraction(x: number): number {
  if (!(x >= 0)) return NaN;
  if (x === Infinity) return 1;
  if (x < 0.1) {
    let term = x / 2; // x/2!
    let sum = 0;
    for (let k = 1; k < 30; k++) {
      sum += term;
      if (Math.abs(term) <= 1e-17 * sum) break;
      term *= -x / (k + 2); // next: (−1)^(k+2) x^(k+1)/(k+2)!
    }
    return sum;
  }
  return 1 + Math.expm1(-x) / x;
}

export interface TestedInputs {
  /** Standby failure rate λ, per year. */
  rate: number;
  /** Test interval T, years. */
  interval: number;
  /** Time out of service per test, years. */
  testDuration?: number;
  /** Mean time to repair a failure found by the test, years. */
  repair?: number;
}

/** `tested`: time-average unavailability of a periodically tested standby component (derivation above). */
export function testedUnavailability(inputs: TestedInputs): number {
  return testedUnavailabilityOf(inputs.rate, inputs.interval, inputs.testDuration, inputs.repair);
}

/** `testedUnavailability` with its inputs as arguments (the Monte Carlo's path: no object per call). */
export function testedUnavailabilityOf(rate: number, interval: number, testDuration: number | undefined, repair: number | undefined): number {
  if (!(rate >= 0) || !(interval > 0)) return NaN;
  if (testDuration !== undefined && !(testDuration >= 0)) return NaN;
  if (repair !== undefined && !(repair >= 0)) return NaN;
  const x = rate * interval;
  let u = hiddenFailureFraction(x);
  if (testDuration !== undefined) u += testDuration / interval;
  if (repair !== undefined) u += (-Math.expm1(-x) * repair) / interval;
  return Math.min(1, u);
}

export interface DemandInputs {
  /** Probability of failure per demand q_d. */
  probability: number;
  /** Optional standby failure rate, per year (with `interval`). */
  rate?: number;
  /** Optional test interval, years (with `rate`). */
  interval?: number;
}

/**
 * `demand`: fails on demand either from the demand itself (q_d) or from a failure hidden in
 * standby, independent of each other: 1 − (1 − q_d)(1 − Ū_hidden(λT)), the standby part being the
 * hidden fraction above (combining two independent causes of one failure this way is common
 * practice, no source). Rate and interval come together or not at all.
 */
export function demandProbability(inputs: DemandInputs): number {
  return demandProbabilityOf(inputs.probability, inputs.rate, inputs.interval);
}

/** `demandProbability` with its inputs as arguments (no object per call). */
export function demandProbabilityOf(probability: number, rate: number | undefined, interval: number | undefined): number {
  if (!(probability >= 0 && probability <= 1)) return NaN;
  if (rate === undefined && interval === undefined) return probability;
  if (rate === undefined || interval === undefined || !(rate >= 0) || !(interval > 0)) return NaN;
  const standby = hiddenFailureFraction(rate * interval);
  // 1 − (1 − q_d)(1 − Ū) written without subtracting from 1, so tiny probabilities keep their digits.
  return probability + standby * (1 - probability);
}
