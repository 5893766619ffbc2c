/**
 * State-of-knowledge distributions of the study's parameters (`Uncertainty` in study/types.ts),
 * in the parameter's canonical unit. Every distribution is sampled by its inverse CDF,
 * `sampleQuantile(u, unitUniform)`, so plain Monte Carlo (uniforms from the generator) and Latin
 * hypercube sampling (stratified uniforms) share one path and one seed gives one answer.
 * `kind: 'fit'` is not handled here: the analysis samples it jointly from the fit's covariance.
 */
import type { Uncertainty } from '../study/types.js';
import { BetaInverse, GammaInverse, normalCdf, normalPdf, normalQuantile } from './special.js';

/**
 * The z of the 95th percentile behind the error factor, EF = P95/P50 = e^(1.645σ) (NUREG/CR-6823,
 * Handbook of Parameter Estimation for Probabilistic Risk Assessment, US NRC 2003). The handbook's
 * rounded 1.645 is kept, not Φ⁻¹(0.95) = 1.64485…, so σ matches the published convention.
 */
export const ERROR_FACTOR_Z = 1.645;

export type SampledUncertainty = Exclude<Uncertainty, { kind: 'fit' }>;

/** σ of ln X for a lognormal with error factor EF: ln(EF)/1.645 (NUREG/CR-6823). */
export function lognormalSigma(ef: number): number {
  return ef >= 1 ? Math.log(ef) / ERROR_FACTOR_Z : NaN;
}

/** Mean, variance and standard deviation of a lognormal given by median m and EF:
 *  mean = m·e^(σ²/2), variance = m²·e^(σ²)·(e^(σ²) − 1) (NUREG/CR-6823; standard lognormal moments). */
export function lognormalMoments(median: number, ef: number): { mean: number; variance: number; sd: number } {
  const s2 = lognormalSigma(ef) ** 2;
  const mean = median * Math.exp(s2 / 2);
  const variance = median * median * Math.exp(s2) * Math.expm1(s2);
  return { mean, variance, sd: Math.sqrt(variance) };
}

/** The lognormal with a given mean and EF (handbooks often tabulate the mean): median = mean/e^(σ²/2). */
export function lognormalFromMean(mean: number, ef: number): { kind: 'lognormal'; median: number; ef: number } {
  const sigma = lognormalSigma(ef);
  return { kind: 'lognormal', median: mean / Math.exp((sigma * sigma) / 2), ef };
}

/** Standardized bounds of a normal truncated to [min, max] (either side may be open). */
function truncation(mean: number, sd: number, min?: number, max?: number): [number, number] {
  const a = min === undefined ? -Infinity : (min - mean) / sd;
  const b = max === undefined ? Infinity : (max - mean) / sd;
  return [a, b];
}

function assertSampled(u: Uncertainty): asserts u is SampledUncertainty {
  if (u.kind === 'fit') {
    throw new Error(`a '${u.fit}' fit parameter is sampled by the analysis from the fit's covariance, not by sampleQuantile`);
  }
}

/**
 * The value at cumulative probability `unitUniform` ∈ (0, 1) (0 and 1 give the support's ends).
 * Invalid distribution parameters give NaN; the study reader checks them first.
 * - lognormal: m·exp(σ·Φ⁻¹(u)), σ = ln(EF)/1.645
 * - normal: mean + sd·z, truncated to [min, max] when given (inverse CDF of the truncated law,
 *   Φ⁻¹(Φ(a) + u(Φ(b) − Φ(a))) on the standardized bounds a, b; a window wholly above the mean is
 *   mirrored to the lower tail, where Φ keeps its digits)
 * - uniform: min + u(max − min)
 * - triangular: a + √(u(b − a)(c − a)) below the mode's probability (c − a)/(b − a),
 *   b − √((1 − u)(b − a)(b − c)) above (standard inverse CDF)
 * - beta, gamma (shape, scale): the incomplete-function inverses of special.ts
 * One-off values; a sampler that draws many from one distribution prepares it with `quantileFunction`.
 */
export function sampleQuantile(u: Uncertainty, unitUniform: number): number {
  return quantileFunction(u)(unitUniform);
}

/**
 * `sampleQuantile` for one distribution, prepared once for many draws (the Monte Carlo): whatever
 * does not depend on the uniform (σ, the truncation's Φ at both bounds, the gamma's and beta's
 * constants) is computed here, once. sampleQuantile itself goes through it, so the two are one
 * computation.
 */
export function quantileFunction(u: Uncertainty): (unitUniform: number) => number {
  assertSampled(u);
  const nan = () => NaN;
  switch (u.kind) {
    case 'lognormal': {
      if (!(u.median > 0)) return nan;
      const sigma = lognormalSigma(u.ef);
      const median = u.median;
      if (Number.isNaN(sigma)) return nan;
      if (sigma === 0) return (p) => (p >= 0 && p <= 1 ? median : NaN);
      return (p) => (p >= 0 && p <= 1 ? median * Math.exp(sigma * normalQuantile(p)) : NaN);
    }
    case 'normal': {
      const { mean, sd, min, max } = u;
      if (!(sd >= 0) || (min !== undefined && max !== undefined && !(min <= max))) return nan;
      if (sd === 0) {
        const v = Math.min(max ?? Infinity, Math.max(min ?? -Infinity, mean));
        return (p) => (p >= 0 && p <= 1 ? v : NaN);
      }
      const [a, b] = truncation(mean, sd, min, max);
      if (a === -Infinity && b === Infinity) return (p) => (p >= 0 && p <= 1 ? mean + sd * normalQuantile(p) : NaN);
      // Φ at the bounds once; a window wholly above the mean is taken mirrored (z → −z, u → 1 − u).
      const mirrored = a > 0;
      const lo = mirrored ? -b : a;
      const hi = mirrored ? -a : b;
      const cdfLo = normalCdf(lo);
      const cdfHi = normalCdf(hi);
      return (p) => {
        if (!(p >= 0 && p <= 1)) return NaN;
        const w = mirrored ? 1 - p : p;
        const z = Math.min(hi, Math.max(lo, normalQuantile(cdfLo + w * (cdfHi - cdfLo))));
        return mean + sd * (mirrored ? -z : z);
      };
    }
    case 'uniform': {
      const { min, max } = u;
      if (!(min <= max)) return nan;
      return (p) => (p >= 0 && p <= 1 ? min + p * (max - min) : NaN);
    }
    case 'triangular': {
      const { min: a, mode: c, max: b } = u;
      if (!(a <= c && c <= b)) return nan;
      if (a === b) return (p) => (p >= 0 && p <= 1 ? a : NaN);
      const fc = (c - a) / (b - a);
      return (p) => {
        if (!(p >= 0 && p <= 1)) return NaN;
        return p < fc ? a + Math.sqrt(p * (b - a) * (c - a)) : b - Math.sqrt((1 - p) * (b - a) * (b - c));
      };
    }
    case 'beta': {
      const inverse = new BetaInverse(u.a, u.b);
      return (p) => inverse.quantile(p);
    }
    case 'gamma': {
      const { shape, scale } = u;
      if (!(shape > 0) || !(scale > 0)) return nan;
      const inverse = new GammaInverse(shape);
      return (p) => inverse.quantile(p) * scale;
    }
  }
}

export interface UncertaintySummary {
  mean: number;
  median: number;
  p05: number;
  p95: number;
}

/** Mean of a distribution, in closed form (standard results; truncated normal: μ + σ(φ(α) − φ(β))/(Φ(β) − Φ(α))). */
export function uncertaintyMean(u: Uncertainty): number {
  assertSampled(u);
  switch (u.kind) {
    case 'lognormal':
      return lognormalMoments(u.median, u.ef).mean;
    case 'normal': {
      if (u.sd === 0) return sampleQuantile(u, 0.5);
      const [a, b] = truncation(u.mean, u.sd, u.min, u.max);
      if (a === -Infinity && b === Infinity) return u.mean;
      // Mirror a window above the mean so the denominator is formed where Φ is accurate.
      if (a > 0) return 2 * u.mean - uncertaintyMean({ ...u, min: 2 * u.mean - (u.max ?? Infinity), max: 2 * u.mean - u.min! });
      const mass = normalCdf(b) - normalCdf(a);
      const pa = a === -Infinity ? 0 : normalPdf(a);
      const pb = b === Infinity ? 0 : normalPdf(b);
      return u.mean + (u.sd * (pa - pb)) / mass;
    }
    case 'uniform':
      return (u.min + u.max) / 2;
    case 'triangular':
      return (u.min + u.mode + u.max) / 3;
    case 'beta':
      return u.a / (u.a + u.b);
    case 'gamma':
      return u.shape * u.scale;
  }
}

/** Mean, median and the 5th and 95th percentiles, for the parameter register of the report. */
export function describe(u: Uncertainty): UncertaintySummary {
  return {
    mean: uncertaintyMean(u),
    median: sampleQuantile(u, 0.5),
    p05: sampleQuantile(u, 0.05),
    p95: sampleQuantile(u, 0.95),
  };
}

/**
 * Draws of a Dirichlet distribution with parameters a_1…a_M from M unit uniforms: independent
 * gamma variates X_k ~ Gamma(a_k, 1), each by its inverse CDF (so Latin hypercube strata carry
 * over), normalised, α_k = X_k / ΣX (the standard construction; e.g. L. Devroye, Non-Uniform
 * Random Variate Generation, 1986, ch. XI, from memory). Each marginal is Beta(a_k, Σa − a_k) and the
 * α_k add up to 1 (to rounding). Prepared once per distribution (the gamma inverses), for many draws.
 */
export class DirichletSampler {
  private readonly inverses: GammaInverse[];

  constructor(readonly a: readonly number[]) {
    this.inverses = a.map((ak) => new GammaInverse(ak));
  }

  /**
   * One draw into `out` from the uniforms at `uniforms[dims[k]]` (or `uniforms[k]` without dims);
   * false when every X_k underflowed to 0.
   */
  draw(uniforms: ArrayLike<number>, out: Float64Array, dims?: ArrayLike<number>): boolean {
    const M = this.inverses.length;
    let total = 0;
    for (let k = 0; k < M; k++) {
      const x = this.inverses[k]!.quantile(uniforms[dims ? dims[k]! : k]!);
      out[k] = x;
      total += x;
    }
    if (!(total > 0) || !Number.isFinite(total)) return false;
    for (let k = 0; k < M; k++) out[k] = out[k]! / total;
    return true;
  }
}

/** One Dirichlet draw (DirichletSampler, prepared for this draw alone). */
export function dirichletFromUniforms(a: readonly number[], uniforms: readonly number[], out: Float64Array): boolean {
  return new DirichletSampler(a).draw(uniforms, out);
}
