/**
 * Summaries of a sample of top-event probabilities: moments, percentiles, a log-spaced histogram,
 * the empirical cumulative curve and a convergence check. Pure arithmetic on the numbers given.
 */
import type { UncertaintyResult } from './results.js';

/** Cumulative probabilities at which the empirical cumulative curve is reported. */
export const CDF_POINTS: readonly number[] = [0.01, 0.02, 0.05, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 0.95, 0.98, 0.99];

/** Bins of the histogram (log-spaced between the smallest and largest positive value). */
export const HISTOGRAM_BINS = 30;

/**
 * The p-quantile of sorted values by linear interpolation between order statistics,
 * x[h] with h = (n − 1)p (R. J. Hyndman & Y. Fan, "Sample quantiles in statistical packages",
 * Am. Stat. 50, 1996: their definition 7, the default of R and of most spreadsheets).
 */
export function quantileSorted(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n === 0) return NaN;
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(n - 1, lo + 1);
  const x = sorted[lo]!;
  return x + (h - lo) * (sorted[hi]! - x);
}

/** A sorted copy (numeric order). */
export function sortedCopy(values: ArrayLike<number>, count = values.length): Float64Array {
  const out = new Float64Array(count);
  for (let i = 0; i < count; i++) out[i] = values[i]!;
  return out.sort();
}

/** Mean and sample standard deviation (n − 1), by Welford's update (B. P. Welford, Technometrics 4, 1962), which does not cancel. */
export function meanAndSd(values: ArrayLike<number>): { mean: number; sd: number } {
  let mean = 0;
  let m2 = 0;
  const n = values.length;
  for (let i = 0; i < n; i++) {
    const x = values[i]!;
    const d = x - mean;
    mean += d / (i + 1);
    m2 += d * (x - mean);
  }
  return { mean: n > 0 ? mean : NaN, sd: n > 1 ? Math.sqrt(m2 / (n - 1)) : 0 };
}

/**
 * Counts in log-spaced bins from the smallest to the largest positive value: edges
 * lo·(hi/lo)^(i/bins), i = 0 … bins, the last bin closed on the right. Zeros (a probability of
 * exactly 0 cannot sit on a log axis) are counted apart. All values equal: one bin [x, x].
 */
export function logHistogram(sorted: ArrayLike<number>, bins = HISTOGRAM_BINS): { edges: number[]; counts: number[]; zeros: number } {
  let zeros = 0;
  while (zeros < sorted.length && !(sorted[zeros]! > 0)) zeros++;
  const n = sorted.length;
  if (zeros === n) return { edges: [], counts: [], zeros };
  const lo = sorted[zeros]!;
  const hi = sorted[n - 1]!;
  if (hi === lo) return { edges: [lo, hi], counts: [n - zeros], zeros };
  const span = Math.log(hi / lo);
  const edges: number[] = [];
  for (let i = 0; i <= bins; i++) edges.push(i === 0 ? lo : i === bins ? hi : lo * Math.exp((span * i) / bins));
  const counts = new Array<number>(bins).fill(0);
  for (let i = zeros; i < n; i++) {
    const x = sorted[i]!;
    let b = Math.floor((bins * Math.log(x / lo)) / span);
    // Rounding at an edge: move to the bin whose edges actually hold x.
    if (b >= bins) b = bins - 1;
    if (b < 0) b = 0;
    while (b > 0 && x < edges[b]!) b--;
    while (b < bins - 1 && x >= edges[b + 1]!) b++;
    counts[b]! += 1;
  }
  return { edges, counts, zeros };
}

/** The summary statistics of a sample, as the uncertainty results carry them. */
export type SampleSummary = Pick<UncertaintyResult, 'mean' | 'median' | 'p05' | 'p95' | 'sd' | 'standard_error' | 'convergence' | 'histogram' | 'cdf'>;

/**
 * Everything the report shows of one sample. The convergence check compares the 95th percentile of
 * the first half of the trials with that of all of them: if doubling the sample still moves it by
 * more than a few per cent, more samples are needed (common practice, no source).
 */
export function summarize(values: Float64Array): SampleSummary {
  const n = values.length;
  const sorted = sortedCopy(values);
  const { mean, sd } = meanAndSd(values);
  const p95Full = quantileSorted(sorted, 0.95);
  const half = Math.floor(n / 2);
  const p95Half = half > 0 ? quantileSorted(sortedCopy(values, half), 0.95) : NaN;
  const relative = p95Full > 0 ? Math.abs(p95Full - p95Half) / p95Full : 0;
  return {
    mean,
    median: quantileSorted(sorted, 0.5),
    p05: quantileSorted(sorted, 0.05),
    p95: p95Full,
    sd,
    standard_error: n > 0 ? sd / Math.sqrt(n) : NaN,
    convergence: { p95_half: p95Half, p95_full: p95Full, relative_change: relative },
    histogram: logHistogram(sorted),
    cdf: CDF_POINTS.map((p) => ({ p, value: quantileSorted(sorted, p) })),
  };
}
