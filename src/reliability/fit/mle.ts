/**
 * Two-parameter Weibull maximum likelihood with right-censoring. Setting ∂ℓ/∂η = 0 gives η in
 * closed form for any β, η(β)^β = Σ t^β / r; putting it back into ∂ℓ/∂β = 0 leaves one equation in β:
 *   g(β) = Σ t^β ln t / Σ t^β − 1/β − (1/r) Σ_failures ln t = 0
 * (Lawless 2003, §5.2.2; from memory). g rises monotonically from −∞ (β → 0) to
 * ln t_max − mean(ln t_failures) (β → ∞), so a root exists exactly when that limit is positive, and it
 * is unique. We bracket it by expansion in ln β and solve with Brent: no starting guess, no Newton
 * steps that can run away. Complete data are the same equation with no suspensions.
 */
import { FitError } from './errors.js';
import { type LifeObservation, checkObservations } from './observations.js';
import { findRoot } from './roots.js';
import { weibullLogLikelihood } from './likelihood.js';

export interface ShapeScale {
  shape: number;
  scale: number;
}

/** ln β is searched in this window: shapes from about 1e-4 to 1e4, far beyond any real life data. */
const LN_SHAPE_MIN = Math.log(1e-4);
const LN_SHAPE_MAX = Math.log(1e4);

/**
 * Centred log lives and the sums the profile needs. Logs are centred on the mean failure log so
 * g(β) is a difference of numbers near zero, and exponents are shifted by the largest log so
 * t^β never overflows.
 */
interface Prepared {
  x: Float64Array;
  failures: number;
  centre: number;
  xMax: number;
}

function prepare(data: readonly LifeObservation[]): Prepared {
  const live = data.filter((d) => d.time > 0);
  const failLogs = live.filter((d) => d.failed).map((d) => Math.log(d.time));
  const centre = failLogs.reduce((s, v) => s + v, 0) / failLogs.length;
  const x = Float64Array.from(live, (d) => Math.log(d.time) - centre);
  let xMax = -Infinity;
  for (const v of x) xMax = Math.max(xMax, v);
  return { x, failures: failLogs.length, centre, xMax };
}

/** g(β) of the header comment (the mean of centred failure logs is 0 by construction). */
function profileScore(p: Prepared, shape: number): number {
  let s0 = 0;
  let s1 = 0;
  for (const v of p.x) {
    const w = Math.exp(shape * (v - p.xMax));
    s0 += w;
    s1 += w * v;
  }
  return s1 / s0 - 1 / shape;
}

/** η(β) = (Σ t^β / r)^(1/β), computed in logs. */
function scaleFor(p: Prepared, shape: number): number {
  return Math.exp(lnScaleFor(p, shape));
}

/** ln η(β), without forming η (which overflows for very small β). */
function lnScaleFor(p: Prepared, shape: number): number {
  let s0 = 0;
  for (const v of p.x) s0 += Math.exp(shape * (v - p.xMax));
  return p.centre + p.xMax + (Math.log(s0) - Math.log(p.failures)) / shape;
}

/** The profile likelihood's closed-form scale for a given shape (used by the likelihood-ratio bounds). */
export function mleScaleForShape(data: readonly LifeObservation[], shape: number): number {
  return scaleFor(prepare(data), shape);
}

/**
 * Profile log-likelihood of the shape, max over η of ℓ(β, η). At η(β), Σ (t/η)^β = r exactly, so
 *   ℓ_p(β) = r ln β − r β ln η(β) + (β − 1) Σ_failures ln t − r,
 * which stays finite for shapes so small that η(β) itself would overflow.
 */
export function shapeProfileLogLikelihood(data: readonly LifeObservation[], shape: number): number {
  const p = prepare(data);
  const sumFailLog = p.failures * p.centre; // centred failure logs sum to 0
  return p.failures * Math.log(shape) - p.failures * shape * lnScaleFor(p, shape) + (shape - 1) * sumFailLog - p.failures;
}

/**
 * MLE of (β, η). Lives must be positive except that suspensions may be 0 (before a location);
 * at least one failure is needed, and not all failures may sit at the longest life (then the
 * likelihood keeps rising as β → ∞ and there is no estimate).
 */
export function weibullMle(data: readonly LifeObservation[]): ShapeScale & { logLikelihood: number } {
  checkObservations(
    data.filter((d) => d.failed || d.time > 0),
    1,
    'A maximum-likelihood fit',
  );
  const p = prepare(data);
  // Limit of g as β → ∞, less a relative margin: if it is not clearly positive there is no root.
  if (!(p.xMax > 1e-12 * Math.max(1, Math.abs(p.centre)))) {
    throw new FitError(
      'the shape has no finite estimate: every failure is at the longest life in the data',
      'failures at different lives, or suspensions running beyond the failures',
    );
  }
  const lnShape = findRoot((s) => profileScore(p, Math.exp(s)), -0.5, 0.5, LN_SHAPE_MIN, LN_SHAPE_MAX, 1e-14);
  if (lnShape === undefined) {
    throw new FitError(
      'the shape estimate lies outside 1e-4 … 1e4: the failure lives are (nearly) all equal',
      'failure lives that differ',
    );
  }
  const shape = Math.exp(lnShape);
  const scale = scaleFor(p, shape);
  return { shape, scale, logLikelihood: weibullLogLikelihood(data, shape, scale) };
}
