/**
 * The Weibull life model (W. Weibull, J. Appl. Mech. 18, 1951): shape β, scale η, location γ
 * (failure-free time), all durations in years.
 *   cumulative hazard H(t) = ((t − γ)/η)^β for t > γ, else 0
 *   CDF F(t) = 1 − e^(−H(t)), reliability R(t) = e^(−H(t)), hazard h(t) = (β/η)((t − γ)/η)^(β−1)
 * (standard forms, e.g. R. B. Abernethy, The New Weibull Handbook). Probabilities are formed as
 * −expm1(−H) so that small ones keep their digits.
 */
import { gamma } from '../special.js';
import { integrate } from '../quadrature.js';

function validShape(shape: number, scale: number, location: number): boolean {
  return shape > 0 && scale > 0 && Number.isFinite(shape) && Number.isFinite(scale) && Number.isFinite(location);
}

/** H(t) = ((t − γ)/η)^β for t > γ, else 0. */
export function weibullCumulativeHazard(t: number, shape: number, scale: number, location = 0): number {
  if (!validShape(shape, scale, location) || Number.isNaN(t)) return NaN;
  if (t <= location) return 0;
  return Math.pow((t - location) / scale, shape);
}

/** F(t) = 1 − exp(−((t − γ)/η)^β) for t > γ, else 0; computed as −expm1(−H(t)). */
export function weibullCdf(t: number, shape: number, scale: number, location = 0): number {
  return -Math.expm1(-weibullCumulativeHazard(t, shape, scale, location));
}

/**
 * h(t) = (β/η)·((t − γ)/η)^(β−1) for t > γ, 0 before γ. At t = γ itself: ∞ for β < 1, 1/η for
 * β = 1, 0 for β > 1 (the limits from the right).
 */
export function weibullHazard(t: number, shape: number, scale: number, location = 0): number {
  if (!validShape(shape, scale, location) || Number.isNaN(t)) return NaN;
  if (t < location) return 0;
  if (t === location) return shape < 1 ? Infinity : shape === 1 ? 1 / scale : 0;
  return (shape / scale) * Math.pow((t - location) / scale, shape - 1);
}

/** t with F(t) = p: γ + η·(−ln(1 − p))^(1/β), with ln(1 − p) as log1p(−p). */
export function weibullQuantile(p: number, shape: number, scale: number, location = 0): number {
  if (!validShape(shape, scale, location) || !(p >= 0 && p <= 1)) return NaN;
  return location + scale * Math.pow(-Math.log1p(-p), 1 / shape);
}

/** Mean life γ + η·Γ(1 + 1/β). */
export function weibullMean(shape: number, scale: number, location = 0): number {
  if (!validShape(shape, scale, location)) return NaN;
  return location + scale * gamma(1 + 1 / shape);
}

/** B-life: the age by which a fraction p has failed (p = 0.1 gives B10); the Weibull quantile. */
export function bLife(p: number, shape: number, scale: number, location = 0): number {
  return weibullQuantile(p, shape, scale, location);
}

/**
 * H(a + s) − H(a) without cancellation when s ≪ a: with u = (a − γ)/η,
 * ((a + s − γ)/η)^β − u^β = u^β·expm1(β·log1p(s/(a − γ))).
 */
export function weibullHazardIncrement(age: number, s: number, shape: number, scale: number, location = 0): number {
  if (!validShape(shape, scale, location) || !(s >= 0) || Number.isNaN(age)) return NaN;
  if (s === 0) return 0;
  if (age <= location) return weibullCumulativeHazard(age + s, shape, scale, location);
  const since = age - location;
  const level = Math.pow(since / scale, shape);
  const x = shape * Math.log1p(s / since);
  const growth = Math.expm1(x);
  const dH = level * growth;
  if (!Number.isNaN(dH)) return dH;
  // An extreme shape makes one factor 0 and the other ∞; their product is finite, so add logarithms:
  // ln ΔH = β·ln u + ln(expm1(x)), with ln(expm1(x)) = x + log1p(−e^(−x)) for large x.
  if (growth === 0) return level === Infinity ? Infinity : 0;
  return Math.exp(shape * Math.log(since / scale) + x + Math.log1p(-Math.exp(-x)));
}

/** 1 − R(a + s)/R(a): probability of failing within s, having survived to age a. */
export function weibullConditionalFailure(age: number, s: number, shape: number, scale: number, location = 0): number {
  return -Math.expm1(-weibullHazardIncrement(age, s, shape, scale, location));
}

/**
 * (1/τ)∫₀^τ [1 − R(a + s)/R(a)] ds: the conditional failure probability averaged over an exercise
 * interval, by adaptive Gauss–Legendre quadrature (quadrature.ts) to 1e-13 relative.
 * The integrand is 0 until the failure-free time is passed (s₀ = max(0, γ − a)). When the interval
 * starts at the location itself and β < 1, the integrand rises like (s − s₀)^β; the substitution
 * s = s₀ + (τ − s₀)·v^(1/β) turns that into a smooth function of v.
 */
export function weibullAverageConditionalFailure(
  age: number,
  tau: number,
  shape: number,
  scale: number,
  location = 0,
): number {
  if (!validShape(shape, scale, location) || !(tau >= 0) || Number.isNaN(age)) return NaN;
  if (tau === 0) return 0;
  const s0 = Math.max(0, location - age);
  if (s0 >= tau) return 0;
  const q = (s: number) => weibullConditionalFailure(age, s, shape, scale, location);
  const width = tau - s0;
  let integral: number;
  if (age <= location && shape < 1) {
    const k = 1 / shape;
    integral = integrate((v) => q(s0 + width * Math.pow(v, k)) * width * k * Math.pow(v, k - 1), 0, 1);
  } else {
    integral = integrate(q, s0, tau);
  }
  return integral / tau;
}

export interface WeibullEventInputs {
  shape: number;
  scale: number;
  /** Failure-free time γ, years (default 0). */
  location?: number;
  /** Age at the snapshot date, years since installation or last renewal. */
  age: number;
  /** Time since the component last ran properly (standby between exercises), years. */
  exercise?: number;
  /** Mean time to restore a failure that is found, years. */
  repair?: number;
  /** With `exercise`: probability at the end of the interval (default) or averaged over it. */
  basis?: 'end' | 'average';
}

/**
 * The `weibull` model's probability for a basic event:
 * - no exercise, no repair: F(age), the chance it has failed at some time since renewal;
 * - exercise τ: known to work when last exercised, at age a, and asked to work on a demand before
 *   the next exercise: q = 1 − R(a + τ)/R(a) for a demand at the end of the interval ('end', the
 *   bounding case), or that averaged over the interval ('average');
 * - exercise and repair: failures found at an exercise are repaired, adding an outage
 *   q_rep = q_end·MTTR/τ (the chance one is found per cycle times the outage fraction), combined as
 *   1 − (1 − q)(1 − q_rep);
 * - repair without exercise: a running component repaired on failure, at the hazard of its age,
 *   λ = h(a): λ·MTTR/(1 + λ·MTTR) (the repairable form).
 */
export function weibullEventProbability(inputs: WeibullEventInputs): number {
  return weibullEventProbabilityOf(inputs.shape, inputs.scale, inputs.location ?? 0, inputs.age, inputs.exercise, inputs.repair, inputs.basis ?? 'end');
}

/** `weibullEventProbability` with its inputs as arguments (the Monte Carlo's path: no object per call). */
export function weibullEventProbabilityOf(
  shape: number,
  scale: number,
  location: number,
  age: number,
  exercise: number | undefined,
  repair: number | undefined,
  basis: 'end' | 'average',
): number {
  if (!validShape(shape, scale, location) || !(age >= 0)) return NaN;
  if (exercise !== undefined && !(exercise >= 0)) return NaN;
  if (repair !== undefined && !(repair >= 0)) return NaN;
  if (exercise === undefined) {
    if (repair === undefined) return weibullCdf(age, shape, scale, location);
    const lambda = weibullHazard(age, shape, scale, location);
    if (lambda === Infinity) return repair > 0 ? 1 : 0;
    const x = lambda * repair;
    return x / (1 + x);
  }
  const qEnd = weibullConditionalFailure(age, exercise, shape, scale, location);
  const q = basis === 'average' ? weibullAverageConditionalFailure(age, exercise, shape, scale, location) : qEnd;
  if (repair === undefined) return q;
  // Found-failure rate per unit time, qEnd/τ; its limit as τ → 0 is the hazard at the current age.
  const foundPerTime = exercise > 0 ? qEnd / exercise : weibullHazard(age, shape, scale, location);
  const qRep = Math.min(1, foundPerTime * repair);
  // 1 − (1 − q)(1 − q_rep) written without subtracting from 1, so tiny probabilities keep their digits.
  return q + qRep * (1 - q);
}
