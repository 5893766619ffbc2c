/**
 * Three-parameter Weibull: the location γ (failure-free life) by profiling. For each γ in
 * [0, first failure) the lives are shifted by γ and the two-parameter fit of the chosen method is
 * made; γ is the value that maximises that fit's criterion (log-likelihood for maximum likelihood,
 * r² of the Weibull plot for rank regression). A grid finds the best region, golden-section
 * search refines it. Common practice, no source; the grid makes it safe against the several
 * local maxima the profile can have.
 */
import { FitError } from './errors.js';
import type { LifeObservation } from './observations.js';
import { goldenMax } from './roots.js';

export interface ProfilePoint {
  location: number;
  shape: number;
  scale: number;
  /** The criterion being maximised. */
  objective: number;
}

export interface LocationProfile extends ProfilePoint {
  /** γ = 0 is best: the location adds nothing. */
  atLowerBound: boolean;
  /** The criterion only rises as γ nears the first failure: no local maximum inside [0, t₁). */
  atUpperBound: boolean;
}

/** Shifted copy: suspensions before the location keep a life of 0 (they contribute nothing). */
export function shiftLives(data: readonly LifeObservation[], location: number): LifeObservation[] {
  return data.map((d) => ({ time: Math.max(0, d.time - location), failed: d.failed }));
}

/**
 * Fractions of the first failure life tried by the grid: even steps, then ever closer to the
 * failure, where a shape below 1 sends the likelihood to infinity.
 */
const GRID: readonly number[] = [
  ...Array.from({ length: 64 }, (_, k) => k / 64),
  ...Array.from({ length: 14 }, (_, j) => 1 - 2 ** -(j + 7)),
];

export function profileLocation(
  data: readonly LifeObservation[],
  fitShifted: (shifted: LifeObservation[], location: number) => { shape: number; scale: number; objective: number },
): LocationProfile {
  const failureLives = data.filter((d) => d.failed).map((d) => d.time);
  const first = Math.min(...failureLives);
  const evaluate = (location: number): ProfilePoint => {
    try {
      return { location, ...fitShifted(shiftLives(data, location), location) };
    } catch (err) {
      if (err instanceof FitError) return { location, shape: NaN, scale: NaN, objective: -Infinity };
      throw err;
    }
  };
  const grid = GRID.map((u) => evaluate(u * first));
  if (!grid.some((p) => Number.isFinite(p.objective))) {
    throw new FitError('no location in [0, first failure) gives a fit', 'more failures at different lives');
  }
  // The three-parameter likelihood always grows without bound as γ → t₁ (a shape below 1 puts an
  // infinite density at the first failure), so the estimate is the highest LOCAL maximum below that
  // rise, γ = 0 included (R. L. Smith, Biometrika 72, 1985, on non-regular location estimates; from
  // memory). The same rule serves the r² profile of rank regression.
  const last = grid.length - 1;
  let best = -1;
  for (let k = 0; k < last; k++) {
    const v = grid[k]!.objective;
    const isPeak = (k === 0 || v >= grid[k - 1]!.objective) && v >= grid[k + 1]!.objective && Number.isFinite(v);
    if (isPeak && (best < 0 || v > grid[best]!.objective)) best = k;
  }
  if (best < 0) return { ...grid[last]!, atLowerBound: false, atUpperBound: true };
  const lo = grid[Math.max(0, best - 1)]!.location;
  const hi = grid[best + 1]!.location;
  const found = goldenMax((g) => evaluate(g).objective, lo, hi, 1e-10 * first);
  let point = found.value > grid[best]!.objective ? evaluate(found.x) : grid[best]!;
  let atLowerBound = false;
  if (point.location < 1e-8 * first) {
    point = grid[0]!; // γ = 0 exactly: the profile is best at the lower end
    atLowerBound = true;
  }
  return { ...point, atLowerBound, atUpperBound: false };
}
