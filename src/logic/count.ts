/**
 * Distribution of how many of several roots are true (e.g. how many of n gates fail to open),
 * exactly, on one manager so an event shared by several roots is counted once.
 *
 * Method: the diagrams E_j = "exactly j of the roots are true" are built by the recursion
 * E(i, j) = ite(r_i, E(i+1, j−1), E(i+1, j)); they are disjoint and cover every state. Each
 * P(E_j) is then an exact probability (probability.ts), so no entry is formed as a difference
 * P(≥ j) − P(≥ j+1) that could cancel, and the entries sum to 1 up to rounding.
 */
import type { BddManager } from './bdd.js';
import { ProbabilityEvaluator } from './probability.js';

/** result[j] = P(exactly j of `roots` are true), j = 0..roots.length. */
export function countDistribution(
  m: BddManager,
  roots: readonly number[],
  p: ArrayLike<number>,
  q?: ArrayLike<number>,
): Float64Array {
  const exactly = m.exactlyAll(roots);
  return new ProbabilityEvaluator(m, exactly).evaluate(p, q);
}
