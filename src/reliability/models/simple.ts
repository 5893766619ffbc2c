/**
 * The models whose probability is a closed form in one or two numbers: fixed, rate, repairable,
 * switch. All durations in years, rates per year (see units.ts). Arguments outside their domain
 * (a negative rate, a probability above 1) give NaN rather than a plausible-looking number.
 */

/** `fixed`: the probability as given (a per-demand or assessed value). */
export function fixedProbability(probability: number): number {
  return probability >= 0 && probability <= 1 ? probability : NaN;
}

/**
 * `rate`: probability of at least one failure in an exposure time t at constant rate λ,
 * 1 − e^(−λt) (exponential life; NUREG-0492 Fault Tree Handbook, ch. XI). Computed as
 * −expm1(−λt) so a small λt keeps its digits (1 − e^(−1e-12) would round to 1e-12 ± 1e-16·…).
 */
export function rateProbability(rate: number, exposure: number): number {
  if (!(rate >= 0) || !(exposure >= 0)) return NaN;
  if (rate === Infinity) return exposure > 0 ? 1 : NaN;
  return -Math.expm1(-rate * exposure);
}

/**
 * `repairable`: steady-state unavailability of a component that fails at rate λ and is restored
 * in a mean time τ (alternating renewal process): λτ/(1 + λτ) (NUREG-0492 ch. XI; equivalently
 * MTTR/(MTTF + MTTR) with MTTF = 1/λ).
 */
export function repairableUnavailability(rate: number, repair: number): number {
  if (!(rate >= 0) || !(repair >= 0)) return NaN;
  const x = rate * repair;
  if (x === Infinity) return 1;
  return x / (1 + x);
}

/** `switch` (house event): certainly true or certainly false, set per scenario. */
export function switchProbability(on: boolean): number {
  return on ? 1 : 0;
}
