/** Life-data fitting: the public surface (everything else in this folder is its parts). */
export { fitWeibull, type FitMethod, type FitOptions, type WeibullFit } from './fit-weibull.js';
export { weibullCdfBounds, weibullLife, type Bound, type FittedWeibull, type Matrix2 } from './bounds.js';
export { formatFit } from './format.js';
export { FitError } from './errors.js';
export type { LifeObservation } from './observations.js';
export { benardMedianRank, plottingPositions, type PlottingPosition } from './median-ranks.js';
export type { GoodnessOfFit } from './goodness-of-fit.js';
