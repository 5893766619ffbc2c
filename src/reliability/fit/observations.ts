/**
 * The one input every fit takes: a life and whether it ended in the failure being studied.
 * Lives are plain positive numbers in whatever unit the caller chose; the fits are unit-free.
 */
import { FitError } from './errors.js';

export interface LifeObservation {
  /** Life (age at failure, or age at suspension). Positive and finite. */
  time: number;
  /** True for a failure of the studied mode; false for a suspension (right-censored life). */
  failed: boolean;
}

/** Counts that every result repeats. */
export interface ObservationCounts {
  n: number;
  failures: number;
  suspensions: number;
}

export function countObservations(data: readonly LifeObservation[]): ObservationCounts {
  const failures = data.filter((d) => d.failed).length;
  return { n: data.length, failures, suspensions: data.length - failures };
}

/**
 * A sorted copy: by life, and at equal lives failures first. The tie rule is the usual one for
 * median ranks (a unit suspended at the moment another fails was still at risk of that failure);
 * common practice, no source.
 */
export function sortObservations(data: readonly LifeObservation[]): LifeObservation[] {
  return data
    .map((d, i) => ({ d, i }))
    .sort((a, b) => a.d.time - b.d.time || Number(b.d.failed) - Number(a.d.failed) || a.i - b.i)
    .map(({ d }) => ({ time: d.time, failed: d.failed }));
}

/** Rejects what no fit can use, so each fit can assume clean input. */
export function checkObservations(data: readonly LifeObservation[], minFailures: number, what: string): ObservationCounts {
  for (const d of data) {
    if (!(Number.isFinite(d.time) && d.time > 0)) {
      throw new FitError(`life ${d.time} is not a positive finite number`, 'every life > 0');
    }
  }
  const counts = countObservations(data);
  if (counts.failures < minFailures) {
    throw new FitError(
      `${what} needs at least ${minFailures} failure${minFailures === 1 ? '' : 's'}; the data have ${counts.failures}`,
      `at least ${minFailures} rows with status failed`,
    );
  }
  return counts;
}
