/**
 * Plotting positions for Weibull probability plots and rank regression.
 *
 * Median rank by Benard's approximation, F̂ = (i − 0.3)/(n + 0.4), i the (possibly adjusted) order
 * number among n units (R. B. Abernethy, The New Weibull Handbook). With suspensions the order
 * number of each failure is Johnson's adjusted rank (L. G. Johnson, The Statistical Treatment of
 * Fatigue Experiments, 1964): going up the lives, at each failure
 *   new rank = previous rank + (n + 1 − previous rank) / (1 + number of units from this one on)
 * which is the handbook's "reverse rank" form (reverse rank × previous + (n + 1)) / (reverse rank + 1).
 * Suspensions get no position; they only push later failures' ranks up by less than 1.
 */
import { type LifeObservation, sortObservations } from './observations.js';

export function benardMedianRank(order: number, n: number): number {
  return (order - 0.3) / (n + 0.4);
}

export interface PlottingPosition {
  /** Life of the failure, as given (not shifted by a location). */
  t: number;
  /** Johnson's adjusted rank (equals the order number when nothing is suspended before it). */
  rank: number;
  /** Benard median rank of that adjusted rank: the plotted unreliability. */
  F: number;
}

/** One position per failure, in order of life. Ties: failures before suspensions (see sortObservations). */
export function plottingPositions(data: readonly LifeObservation[]): PlottingPosition[] {
  const sorted = sortObservations(data);
  const n = sorted.length;
  const out: PlottingPosition[] = [];
  let previous = 0;
  sorted.forEach((d, index) => {
    if (!d.failed) return;
    const reverseRank = n - index; // units from this one on, itself included
    const rank = previous + (n + 1 - previous) / (1 + reverseRank);
    previous = rank;
    out.push({ t: d.time, rank, F: benardMedianRank(rank, n) });
  });
  return out;
}
