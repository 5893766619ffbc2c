/**
 * Exact probability of a decision diagram with independent variables (Shannon decomposition):
 *   P(node) = p·P(high) + (1 − p)·P(low),   P(false) = 0, P(true) = 1,
 * one bottom-up pass over the reachable nodes, no approximation.
 *
 * Numerical care: both terms are non-negative, so the sum never cancels; a result of 1e-300 is as
 * accurate (relatively) as one of 0.5. The complement Q = 1 − P is computed by the same recursion
 * with the constants swapped rather than as 1 − P, so a probability close to 1 still has an
 * accurate complement. For a variable whose probability is itself close to 1, pass `q` (its
 * complement per variable) so 1 − p is not formed by subtraction either.
 */
import { HIGH, LOW, NODE_STRIDE, type BddManager } from './bdd.js';

/** P(node) for p[v] = probability that variable v is true. */
export function probability(m: BddManager, node: number, p: ArrayLike<number>, q?: ArrayLike<number>): number {
  return new ProbabilityEvaluator(m, [node]).evaluate(p, q)[0]!;
}

/** P(node) and its complement 1 − P(node), each computed without subtraction. */
export function probabilityPair(
  m: BddManager,
  node: number,
  p: ArrayLike<number>,
  q?: ArrayLike<number>,
): { p: number; q: number } {
  const ev = new ProbabilityEvaluator(m, [node]);
  return { p: ev.evaluate(p, q)[0]!, q: ev.complement(p, q)[0]! };
}

/**
 * A prepared bottom-up pass over fixed roots, for evaluating the same diagrams at many
 * probability vectors (sensitivity, uncertainty sampling, forecasts): the traversal is done once,
 * each evaluation is a flat loop over the nodes.
 */
export class ProbabilityEvaluator {
  /** Internal nodes in bottom-up order. */
  readonly nodes: Int32Array;
  private readonly varOfSlot: Int32Array;
  private readonly lowSlot: Int32Array;
  private readonly highSlot: Int32Array;
  private readonly rootSlot: Int32Array;
  private readonly values: Float64Array;

  constructor(m: BddManager, roots: readonly number[]) {
    this.nodes = m.topological(roots);
    const n = this.nodes.length;
    // Slot 0 = false, slot 1 = true, slot 2 + i = nodes[i].
    const slotOf = new Int32Array(m.idLimit);
    slotOf[1] = 1;
    const { nodes: nd, order } = m.arrays();
    this.varOfSlot = new Int32Array(n);
    this.lowSlot = new Int32Array(n);
    this.highSlot = new Int32Array(n);
    for (let i = 0; i < n; i++) {
      const o = this.nodes[i]! * NODE_STRIDE;
      slotOf[this.nodes[i]!] = i + 2;
      this.varOfSlot[i] = order[nd[o]!]!;
      this.lowSlot[i] = slotOf[nd[o + LOW]!]!;
      this.highSlot[i] = slotOf[nd[o + HIGH]!]!;
    }
    this.rootSlot = Int32Array.from(roots, (r) => slotOf[r]!);
    this.values = new Float64Array(n + 2);
  }

  /** P(root) for each root, in the order given to the constructor. */
  evaluate(p: ArrayLike<number>, q?: ArrayLike<number>): Float64Array {
    return this.pass(p, q, 0, 1);
  }

  /** 1 − P(root) for each root, computed by the same recursion (no subtraction from 1). */
  complement(p: ArrayLike<number>, q?: ArrayLike<number>): Float64Array {
    return this.pass(p, q, 1, 0);
  }

  /**
   * For each root, P(root) − P(root with every variable of the group held false), computed without
   * forming that difference: node by node, D = p·D(high) + q·D(low) for a variable outside the group
   * and D = p·(P(high) − P(low)) + D(low) for one inside it (P is multilinear, so holding a variable
   * false is setting its probability to 0). The only subtractions are the local P(high) − P(low),
   * as in Birnbaum importance, so a group whose share of P is 1e-20 keeps its digits. This is the
   * numerator of a group's Fussell–Vesely importance (NUREG/CR-3385).
   */
  groupReduction(p: ArrayLike<number>, inGroup: ArrayLike<number | boolean>): Float64Array {
    const n = this.nodes.length;
    const val = new Float64Array(n + 2);
    const red = new Float64Array(n + 2);
    val[1] = 1;
    const vs = this.varOfSlot;
    const ls = this.lowSlot;
    const hs = this.highSlot;
    for (let i = 0; i < n; i++) {
      const v = vs[i]!;
      const pv = p[v]!;
      const h = hs[i]!;
      const l = ls[i]!;
      val[i + 2] = pv * val[h]! + (1 - pv) * val[l]!;
      red[i + 2] = inGroup[v] ? pv * (val[h]! - val[l]!) + red[l]! : pv * red[h]! + (1 - pv) * red[l]!;
    }
    return Float64Array.from(this.rootSlot, (s) => red[s]!);
  }

  private pass(p: ArrayLike<number>, q: ArrayLike<number> | undefined, atFalse: number, atTrue: number): Float64Array {
    const val = this.values;
    val[0] = atFalse;
    val[1] = atTrue;
    const n = this.nodes.length;
    const vs = this.varOfSlot;
    const ls = this.lowSlot;
    const hs = this.highSlot;
    if (q) {
      for (let i = 0; i < n; i++) {
        const v = vs[i]!;
        val[i + 2] = p[v]! * val[hs[i]!]! + q[v]! * val[ls[i]!]!;
      }
    } else {
      for (let i = 0; i < n; i++) {
        const pv = p[vs[i]!]!;
        val[i + 2] = pv * val[hs[i]!]! + (1 - pv) * val[ls[i]!]!;
      }
    }
    return Float64Array.from(this.rootSlot, (s) => val[s]!);
  }
}
