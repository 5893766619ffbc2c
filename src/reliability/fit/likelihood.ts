/**
 * The two-parameter Weibull log-likelihood with right-censoring and its derivatives, for lives
 * already shifted by any location. Failures contribute the density, suspensions the survivor:
 *   ℓ(β, η) = Σ_failures [ln β − ln η + (β − 1) ln(t/η)] − Σ_all (t/η)^β
 * (J. F. Lawless, Statistical Models and Methods for Lifetime Data, 2nd ed. 2003, §5.2; from memory.)
 * A suspension at life 0 (before the location) contributes nothing: its survivor is 1.
 */
import type { LifeObservation } from './observations.js';

export interface LikelihoodParts {
  value: number;
  /** ∂ℓ/∂β, ∂ℓ/∂η */
  score: [number, number];
  /** ∂²ℓ/∂β², ∂²ℓ/∂β∂η, ∂²ℓ/∂η² */
  hessian: [[number, number], [number, number]];
}

/** ℓ(β, η) alone, for profiles and plots. */
export function weibullLogLikelihood(data: readonly LifeObservation[], shape: number, scale: number): number {
  return likelihoodParts(data, shape, scale).value;
}

/**
 * ℓ and its first and second derivatives. With z = t/η, u = z^β, L = ln z and r failures:
 *   ∂ℓ/∂β = r/β + Σ_f L − Σ u L            ∂ℓ/∂η = (β/η)(Σ u − r)
 *   ∂²ℓ/∂β² = −r/β² − Σ u L²               ∂²ℓ/∂η² = (β/η²)(r − (β + 1) Σ u)
 *   ∂²ℓ/∂β∂η = (Σ u + β Σ u L − r)/η
 * (differentiated by hand from the expression above; the tests check them by finite differences).
 */
export function likelihoodParts(data: readonly LifeObservation[], shape: number, scale: number): LikelihoodParts {
  const b = shape;
  const lnEta = Math.log(scale);
  let r = 0;
  let sumFailL = 0;
  let sumU = 0;
  let sumUL = 0;
  let sumUL2 = 0;
  for (const d of data) {
    if (d.time <= 0) continue; // suspended before the location: R = 1, no contribution
    const L = Math.log(d.time) - lnEta;
    const u = Math.exp(b * L);
    if (d.failed) {
      r += 1;
      sumFailL += L;
    }
    sumU += u;
    sumUL += u * L;
    sumUL2 += u * L * L;
  }
  const value = r * (Math.log(b) - lnEta) + (b - 1) * sumFailL - sumU;
  const dB = r / b + sumFailL - sumUL;
  const dEta = (b / scale) * (sumU - r);
  const dBB = -r / (b * b) - sumUL2;
  const dEE = (b / (scale * scale)) * (r - (b + 1) * sumU);
  const dBE = (sumU + b * sumUL - r) / scale;
  return { value, score: [dB, dEta], hessian: [[dBB, dBE], [dBE, dEE]] };
}
