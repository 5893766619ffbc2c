/**
 * The one entry for fitting a Weibull to life records: estimates, bounds, covariance for Monte
 * Carlo sampling, goodness of fit, plot positions and warnings, as plain data (JSON-ready; every
 * number finite).
 */
import { chiSquareQuantile } from '../special.js';
import { type Bound, type Matrix2, checkLevel, fisherBounds, likelihoodRatioBounds, logCovariance, weibullLife } from './bounds.js';
import { FitError } from './errors.js';
import { type GoodnessOfFit, goodnessOfFit } from './goodness-of-fit.js';
import { weibullLogLikelihood } from './likelihood.js';
import { type LocationProfile, profileLocation, shiftLives } from './location.js';
import { plottingPositions } from './median-ranks.js';
import { weibullMle } from './mle.js';
import { type LifeObservation, checkObservations, sortObservations } from './observations.js';
import { weibullPlotLine, weibullRankRegression } from './rank-regression.js';

export type FitMethod = 'mle' | 'rank';

export interface FitOptions {
  method: FitMethod;
  /** Also estimate a location γ (failure-free life) in [0, first failure). */
  threeParameter?: boolean;
  /** Level of each one-sided bound, in [0.5, 1); default 0.9. */
  confidence?: number;
}

export interface WeibullFit {
  method: FitMethod;
  n: number;
  failures: number;
  suspensions: number;
  shape: number;
  scale: number;
  /** Present when a three-parameter fit was asked for (0 when the location fell back to 0). */
  location?: number;
  /** Life by which 10% have failed (includes the location). */
  b10: number;
  bounds: {
    /** Each bound is one-sided at this level; the pair is a two-sided interval of level 2·level − 1. */
    level: number;
    fisher: { shape: Bound; scale: Bound; b10: Bound };
    /** Maximum likelihood only; a parameter whose bound was not found is left out (see warnings). */
    likelihoodRatio?: { shape?: Bound; scale?: Bound };
  };
  /** Covariance of (ln β, ln η), for sampling shape and scale jointly (lognormal, correlated). */
  covarianceLog: Matrix2;
  /** ℓ at the reported estimates (failures as densities, suspensions as survivors). */
  logLikelihood: number;
  /** Three-parameter fits: likelihood-ratio test of the location against the two-parameter fit. */
  locationTest?: { statistic: number; critical05: number };
  gof: GoodnessOfFit;
  /** Median-rank plotting positions of the failures (lives as given, not shifted). */
  plot: { points: { t: number; F: number }[] };
  warnings: string[];
}

const DEFAULT_LEVEL = 0.9;

function fmt(x: number): string {
  return Number(x.toPrecision(4)).toString();
}

function twoParameter(data: readonly LifeObservation[], method: FitMethod, location: number): { shape: number; scale: number } {
  return method === 'mle' ? weibullMle(shiftLives(data, location)) : weibullRankRegression(data, location);
}

export function fitWeibull(input: readonly LifeObservation[], options: FitOptions): WeibullFit {
  // One canonical order, so the result (to the last bit) does not depend on the order of the rows.
  const data = sortObservations(input);
  const { method } = options;
  const level = options.confidence ?? DEFAULT_LEVEL;
  checkLevel(level);
  const threeParameter = options.threeParameter ?? false;
  const minFailures = threeParameter ? 3 : method === 'rank' ? 2 : 1;
  const counts = checkObservations(
    data,
    minFailures,
    threeParameter ? 'A three-parameter fit' : method === 'rank' ? 'Rank regression' : 'A maximum-likelihood fit',
  );
  const warnings: string[] = [];
  const positions = plottingPositions(data);

  let location = 0;
  let locationTest: WeibullFit['locationTest'];
  if (threeParameter) {
    const mleProfile = profileLocation(data, (shifted) => {
      const f = weibullMle(shifted);
      return { ...f, objective: f.logLikelihood };
    });
    const profile: LocationProfile =
      method === 'mle'
        ? mleProfile
        : profileLocation(data, (_shifted, g) => {
            const f = weibullPlotLine(positions, g);
            return { ...f, objective: f.rSquared };
          });
    if (profile.atUpperBound) {
      warnings.push(
        'the location runs up to the first failure life: the fit has no best location below it (usual when the shape is below 1); the two-parameter fit is shown instead',
      );
    } else {
      location = profile.location;
      if (profile.atLowerBound) warnings.push('the best location is 0: the three-parameter fit reduces to the two-parameter one');
    }
    // Whether a location is supported is a property of the data, so it is tested with the likelihood
    // whatever the estimation method: 2[ℓ(γ̂) − ℓ(γ = 0)] against χ²₁ at 5% (common practice, no source).
    const twoParamLogL = weibullMle(data).logLikelihood;
    const threeParamLogL = mleProfile.atUpperBound ? twoParamLogL : Math.max(mleProfile.objective, twoParamLogL);
    const statistic = 2 * (threeParamLogL - twoParamLogL);
    const critical05 = chiSquareQuantile(0.95, 1);
    locationTest = { statistic, critical05 };
    if (!profile.atUpperBound && !profile.atLowerBound && statistic < critical05) {
      warnings.push(
        `the location does not improve the fit materially: likelihood-ratio statistic ${fmt(statistic)} < ${fmt(critical05)} (χ²₁, 5%); prefer the two-parameter fit`,
      );
    }
    if (location > 0) warnings.push('bounds treat the location as known (they do not include its uncertainty)');
  }

  const shifted = shiftLives(data, location);
  const estimate = twoParameter(data, method, location);
  const { shape, scale } = estimate;
  const logLikelihood = weibullLogLikelihood(shifted, shape, scale);

  let covarianceLog = logCovariance(shifted, shape, scale);
  if (!covarianceLog && method === 'rank') {
    // At rank estimates far from the likelihood's peak the curvature can lose definiteness; the
    // curvature at the MLE is then the honest stand-in.
    const mle = weibullMle(shifted);
    covarianceLog = logCovariance(shifted, mle.shape, mle.scale);
    warnings.push('Fisher-information bounds use the information at the maximum-likelihood estimates (not positive definite at the rank estimates)');
  }
  if (!covarianceLog) {
    throw new FitError('the information matrix is not positive definite: the data do not determine both shape and scale', 'more failures at different lives');
  }

  const fisher = fisherBounds({ shape, scale, location, covarianceLog }, level);
  const bounds: WeibullFit['bounds'] = {
    level,
    fisher: { shape: fisher.shape, scale: fisher.scale, b10: fisher.life },
  };
  if (method === 'mle') {
    const lr = likelihoodRatioBounds(shifted, { shape, scale }, level);
    bounds.likelihoodRatio = {
      ...(lr.shape ? { shape: lr.shape } : {}),
      ...(lr.scale ? { scale: lr.scale } : {}),
    };
    if (lr.open.length > 0) warnings.push(`no likelihood-ratio bound found (the profile likelihood is too flat): ${lr.open.join(', ')}`);
  }

  const distinctFailureLives = new Set(positions.map((q) => q.t)).size;
  const rSquared = distinctFailureLives >= 2 ? weibullPlotLine(positions, location).rSquared : undefined;
  const gof = goodnessOfFit(
    data,
    { shape, scale, location },
    rSquared,
    method === 'mle' && counts.suspensions === 0 && location === 0 && !threeParameter,
  );
  if (gof.rejected05) warnings.push(`Anderson–Darling rejects the Weibull law at 5% (A*² = ${fmt(gof.adjusted ?? NaN)} > ${gof.critical05})`);
  if (counts.failures < 5) warnings.push(`only ${counts.failures} failure${counts.failures === 1 ? '' : 's'}: the bounds are wide and rest on large-sample approximations`);

  return {
    method,
    n: counts.n,
    failures: counts.failures,
    suspensions: counts.suspensions,
    shape,
    scale,
    ...(threeParameter ? { location } : {}),
    b10: weibullLife({ shape, scale, location }, 0.1),
    bounds,
    covarianceLog,
    logLikelihood,
    ...(locationTest ? { locationTest } : {}),
    gof,
    plot: { points: positions.map((p) => ({ t: p.t, F: p.F })) },
    warnings,
  };
}
