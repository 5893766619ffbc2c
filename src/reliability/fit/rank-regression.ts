/**
 * Median-rank regression on the Weibull plot: x = ln t, y = ln(−ln(1 − F̂)), for which the Weibull
 * law is the line y = β (x − ln η).
 *
 * We regress X on Y (life on rank): the ranks are fixed by the order of the data while the lives
 * carry the scatter, so life is the dependent variable. This is the form R. B. Abernethy, The New
 * Weibull Handbook, recommends for Weibull plots (from memory); Y-on-X is the other habit and gives
 * a somewhat different β when the points scatter. Then x = ln η + (1/β) y, so
 *   1/β = Sxy / Syy,  ln η = x̄ − ȳ/β,  r² = Sxy² / (Sxx Syy)   (r² is the same for either direction).
 */
import { FitError } from './errors.js';
import type { ShapeScale } from './mle.js';
import { type LifeObservation, checkObservations } from './observations.js';
import { type PlottingPosition, plottingPositions } from './median-ranks.js';

export interface RankRegression extends ShapeScale {
  /** Coefficient of determination of the Weibull plot. */
  rSquared: number;
  points: PlottingPosition[];
}

/** Straight-line summary of the Weibull plot of `points` after subtracting `location` from each life. */
export function weibullPlotLine(points: readonly PlottingPosition[], location = 0): RankRegression {
  const xs = points.map((p) => Math.log(p.t - location));
  const ys = points.map((p) => Math.log(-Math.log(1 - p.F)));
  const m = xs.length;
  const xBar = xs.reduce((s, v) => s + v, 0) / m;
  const yBar = ys.reduce((s, v) => s + v, 0) / m;
  let sxx = 0;
  let syy = 0;
  let sxy = 0;
  for (let i = 0; i < m; i++) {
    const dx = xs[i]! - xBar;
    const dy = ys[i]! - yBar;
    sxx += dx * dx;
    syy += dy * dy;
    sxy += dx * dy;
  }
  if (!(sxx > 0) || !(sxy > 0)) {
    throw new FitError('rank regression needs failures at two or more different lives', 'failures at different lives');
  }
  const shape = syy / sxy;
  const scale = Math.exp(xBar - yBar / shape);
  return { shape, scale, rSquared: (sxy * sxy) / (sxx * syy), points: [...points] };
}

/** Rank-regression (X on Y) estimates of a two-parameter Weibull, lives shifted by `location`. */
export function weibullRankRegression(data: readonly LifeObservation[], location = 0): RankRegression {
  checkObservations(data, 2, 'Rank regression');
  return weibullPlotLine(plottingPositions(data), location);
}
