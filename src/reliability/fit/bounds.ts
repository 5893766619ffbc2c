/**
 * Confidence bounds of a two-parameter Weibull fit (lives already less any location, which the
 * bounds treat as known).
 *
 * Level convention: each bound is one-sided at the stated level C, so the pair brackets a two-sided
 * interval of level 2C − 1 (C = 0.95 gives the usual two-sided 90%; C = 0.5 gives the estimate
 * itself). Reliability practice quotes lower bounds on life one-sided, hence this choice.
 *
 * Fisher-information bounds: the observed information on (ln β, ln η) is J·(−H)·J with H the Hessian of
 * ℓ in (β, η) and J = diag(β, η) (at the MLE the gradient is zero, so this is exactly the observed
 * information of the log parameters). Its inverse is the covariance of (ln β, ln η); bounds are
 * normal on the log scale (so always positive), and for a life or F(t) the delta method carries the
 * covariance through: ln t_p = ln η + (1/β)·ln(−ln(1 − p)), and ln(−ln R(t)) = β(ln t − ln η)
 * (W. Q. Meeker and L. A. Escobar, Statistical Methods for Reliability Data, 1998, ch. 8; from memory).
 *
 * Likelihood-ratio bounds: the values of β (η) where the profile log-likelihood falls by
 * χ²₁(2C − 1)/2 from its maximum (Meeker & Escobar 1998, §8.3; from memory).
 */
import { chiSquareQuantile, normalQuantile } from '../special.js';
import { FitError } from './errors.js';
import { likelihoodParts, weibullLogLikelihood } from './likelihood.js';
import { shapeProfileLogLikelihood } from './mle.js';
import type { LifeObservation } from './observations.js';
import { findRoot } from './roots.js';

export interface Bound {
  lower: number;
  upper: number;
}

export type Matrix2 = [[number, number], [number, number]];

/** What the bound functions need of a fit; `WeibullFit` has all of it. */
export interface FittedWeibull {
  shape: number;
  scale: number;
  location?: number;
  covarianceLog: Matrix2;
}

export function checkLevel(level: number): void {
  if (!(level >= 0.5 && level < 1)) {
    throw new FitError(`confidence ${level} is outside [0.5, 1)`, 'a level such as 0.9 (each bound one-sided)');
  }
}

/**
 * Covariance of (ln β, ln η) from the observed information; undefined when that is not positive
 * definite. The information J·(−H)·J is formed directly in unit-free terms, z = β·ln(t/η) and
 * u = e^z, with r failures:
 *   I_aa = r + Σ u z²,   I_ab = β (r − Σ u − Σ u z),   I_bb = β ((β + 1) Σ u − r)
 * (the likelihood.ts second derivatives multiplied out by β², βη and η²; the η's cancel). Forming
 * the (β, η) Hessian and scaling by η² instead under- or overflowed for lives beyond about 1e±154;
 * in this form lives and scale enter only as t/η, so the result is the same at any scale.
 */
export function logCovariance(data: readonly LifeObservation[], shape: number, scale: number): Matrix2 | undefined {
  let r = 0;
  let sumU = 0;
  let sumUZ = 0;
  let sumUZ2 = 0;
  for (const obs of data) {
    if (obs.time <= 0) continue; // suspended before the location: no contribution
    const z = shape * Math.log(obs.time / scale);
    const u = Math.exp(z);
    if (obs.failed) r += 1;
    sumU += u;
    sumUZ += u * z;
    sumUZ2 += u * z * z;
  }
  const a = r + sumUZ2;
  const b = shape * (r - sumU - sumUZ);
  const d = shape * ((shape + 1) * sumU - r);
  const det = a * d - b * b;
  if (!(a > 0 && d > 0 && det > 0)) return undefined;
  return [
    [d / det, -b / det],
    [-b / det, a / det],
  ];
}

function logNormalBound(estimate: number, variance: number, z: number): Bound {
  const half = z * Math.sqrt(variance);
  return { lower: estimate * Math.exp(-half), upper: estimate * Math.exp(half) };
}

/** Life by which a fraction p has failed: γ + η(−ln(1 − p))^(1/β). */
export function weibullLife(fit: { shape: number; scale: number; location?: number }, p: number): number {
  return (fit.location ?? 0) + fit.scale * Math.pow(-Math.log1p(-p), 1 / fit.shape);
}

/** Fisher-information bounds on β, η and the life t_p (B10 for p = 0.1). */
export function fisherBounds(fit: FittedWeibull, level: number, p = 0.1): { shape: Bound; scale: Bound; life: Bound } {
  checkLevel(level);
  const z = normalQuantile(level);
  const [[vaa, vab], [, vbb]] = fit.covarianceLog;
  const k = Math.log(-Math.log1p(-p));
  // ∂ ln t_p / ∂(ln β, ln η) = (−k/β, 1)
  const g = -k / fit.shape;
  const varLife = g * g * vaa + 2 * g * vab + vbb;
  const core = logNormalBound(fit.scale * Math.pow(-Math.log1p(-p), 1 / fit.shape), varLife, z);
  const location = fit.location ?? 0;
  return {
    shape: logNormalBound(fit.shape, vaa, z),
    scale: logNormalBound(fit.scale, vbb, z),
    life: { lower: location + core.lower, upper: location + core.upper },
  };
}

/**
 * Unreliability F(t) of a fit with its Fisher-information bounds at life t (for charts). Bounds are
 * normal on w = ln(−ln R) = β(ln(t − γ) − ln η), whose gradient on (ln β, ln η) is (w, −β).
 */
export function weibullCdfBounds(fit: FittedWeibull, t: number, level: number): { F: number; lower: number; upper: number } {
  checkLevel(level);
  const x = t - (fit.location ?? 0);
  if (!(x > 0)) return { F: 0, lower: 0, upper: 0 };
  const w = fit.shape * (Math.log(x) - Math.log(fit.scale));
  const [[vaa, vab], [, vbb]] = fit.covarianceLog;
  const gb = -fit.shape;
  const sd = Math.sqrt(w * w * vaa + 2 * w * gb * vab + gb * gb * vbb);
  const z = normalQuantile(level);
  const cdf = (v: number): number => -Math.expm1(-Math.exp(v));
  return { F: cdf(w), lower: cdf(w - z * sd), upper: cdf(w + z * sd) };
}

/** How far either side of an estimate (in ln units) a likelihood-ratio bound is looked for. */
const LN_SEARCH = 30;

/**
 * Where a profile log-likelihood p(s) of a log parameter s falls to `target`, below and above its
 * maximum at s0. A side with no crossing inside the search window has no finite bound: undefined.
 */
function profileCrossings(p: (s: number) => number, s0: number, target: number): [number | undefined, number | undefined] {
  const f = (s: number): number => p(s) - target;
  const lower = findRoot(f, s0 - 0.05, s0, s0 - LN_SEARCH, s0, 1e-12);
  const upper = findRoot(f, s0, s0 + 0.05, s0, s0 + LN_SEARCH, 1e-12);
  return [lower, upper];
}

/**
 * Shape that maximises ℓ(β; η) for a fixed scale: ∂ℓ/∂β falls monotonically, so one root. Undefined
 * when it lies outside 1e-6 … 1e4 (the profile there is not trusted, so no bound is claimed).
 */
function shapeForScale(data: readonly LifeObservation[], scale: number, near: number): number | undefined {
  const score = (s: number): number => likelihoodParts(data, Math.exp(s), scale).score[0];
  const s = findRoot(score, Math.log(near) - 0.1, Math.log(near) + 0.1, Math.log(1e-6), Math.log(1e4), 1e-12);
  return s === undefined ? undefined : Math.exp(s);
}

/**
 * Likelihood-ratio bounds at the MLE (shape, scale). A side whose bound is not found within e^±30
 * of the estimate (the profile falls too slowly, as with one or two failures) is left out and named
 * in `open`.
 */
export function likelihoodRatioBounds(
  data: readonly LifeObservation[],
  mle: { shape: number; scale: number },
  level: number,
): { shape?: Bound; scale?: Bound; open: string[] } {
  checkLevel(level);
  const drop = chiSquareQuantile(2 * level - 1, 1) / 2;
  if (!(drop > 0)) {
    const at = (v: number): Bound => ({ lower: v, upper: v });
    return { shape: at(mle.shape), scale: at(mle.scale), open: [] };
  }
  const top = weibullLogLikelihood(data, mle.shape, mle.scale);
  const target = top - drop;
  const shapeProfile = (s: number): number => shapeProfileLogLikelihood(data, Math.exp(s));
  const scaleProfile = (s: number): number => {
    const eta = Math.exp(s);
    const shape = shapeForScale(data, eta, mle.shape);
    return shape === undefined ? NaN : weibullLogLikelihood(data, shape, eta);
  };
  const open: string[] = [];
  const pack = (name: string, [lo, hi]: [number | undefined, number | undefined]): Bound | undefined => {
    if (lo === undefined) open.push(`lower ${name}`);
    if (hi === undefined) open.push(`upper ${name}`);
    return lo === undefined || hi === undefined ? undefined : { lower: Math.exp(lo), upper: Math.exp(hi) };
  };
  const shape = pack('shape', profileCrossings(shapeProfile, Math.log(mle.shape), target));
  const scale = pack('scale', profileCrossings(scaleProfile, Math.log(mle.scale), target));
  return { ...(shape ? { shape } : {}), ...(scale ? { scale } : {}), open };
}
