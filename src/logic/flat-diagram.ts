/**
 * A decision diagram frozen into plain typed arrays, and its bottom-up probability pass for a batch
 * of probability vectors at once (Monte Carlo trials). The arrays hold no reference to the manager,
 * so they can be copied to a worker thread; the recursion per node is exactly ProbabilityEvaluator's
 *   P(node) = p·P(high) + (1 − p)·P(low)
 * with the same operations in the same order, so every trial's numbers are the same bits whether it
 * is evaluated alone, in a batch of any size, or on another thread.
 */
import { HIGH, LOW, NODE_STRIDE, type BddManager } from './bdd.js';

/** Slots: 0 = false, 1 = true, 2 + i = the i-th internal node, children before parents. */
export interface FlatDiagram {
  /** Variable index of each internal node (bottom-up order). */
  variable: Int32Array;
  /** Slot of each internal node's low and high child. */
  low: Int32Array;
  high: Int32Array;
  /** Slot of each root, in the order asked for. */
  roots: Int32Array;
  /** Number of variables the probability vectors hold. */
  variables: number;
}

/** Freezes the diagrams under `roots` (any constants among them allowed). */
export function flattenDiagram(m: BddManager, roots: readonly number[], variables: number): FlatDiagram {
  const nodes = m.topological(roots);
  const n = nodes.length;
  const slotOf = new Int32Array(m.idLimit);
  slotOf[1] = 1;
  const { nodes: nd, order } = m.arrays();
  const variable = new Int32Array(n);
  const low = new Int32Array(n);
  const high = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const o = nodes[i]! * NODE_STRIDE;
    slotOf[nodes[i]!] = i + 2;
    variable[i] = order[nd[o]!]!;
    low[i] = slotOf[nd[o + LOW]!]!;
    high[i] = slotOf[nd[o + HIGH]!]!;
  }
  return { variable, low, high, roots: Int32Array.from(roots, (r) => slotOf[r]!), variables };
}

/**
 * The pass over a FlatDiagram for up to `batch` probability vectors at a time. Layouts are
 * variable-major and root-major: p[v·batch + b] is variable v in vector b, and the result
 * out[r·batch + b] is root r in vector b. Working memory is one array per node over the batch.
 */
export class BatchEvaluator {
  private readonly values: Float64Array;

  constructor(
    private readonly d: FlatDiagram,
    readonly batch: number,
  ) {
    if (!Number.isInteger(batch) || batch < 1) throw new RangeError(`batch must be a positive integer, got ${batch}`);
    this.values = new Float64Array((d.variable.length + 2) * batch);
    this.values.fill(1, batch, 2 * batch);
  }

  /** Evaluates the first `count` vectors of `p` (count ≤ batch) into `out` (length roots × batch). */
  evaluate(p: Float64Array, count: number, out: Float64Array): void {
    const B = this.batch;
    const val = this.values;
    nodePass(this.d, p, count, B, val);
    // A plain copy: a subarray per root was an allocation and two builtin calls per root and batch.
    const roots = this.d.roots;
    for (let r = 0; r < roots.length; r++) {
      const from = roots[r]! * B;
      const to = r * B;
      for (let b = 0; b < count; b++) out[to + b] = val[from + b]!;
    }
  }
}

/**
 * The bottom-up pass itself, in a function of its own: its loop is where the engine compiles on
 * the fly (on-stack replacement) during the first batch, and code after such a loop that has not
 * run yet is compiled without type information and thrown back to the interpreter on every call.
 */
function nodePass(d: FlatDiagram, p: Float64Array, count: number, B: number, val: Float64Array): void {
  const { variable, low, high } = d;
  const n = variable.length;
  for (let i = 0; i < n; i++) {
    const pv = variable[i]! * B;
    const hv = high[i]! * B;
    const lv = low[i]! * B;
    const at = (i + 2) * B;
    // Four vectors a step (a quarter of the loop's own work; each vector's arithmetic unchanged).
    let b = 0;
    for (; b + 3 < count; b += 4) {
      const x0 = p[pv + b]!;
      const x1 = p[pv + b + 1]!;
      const x2 = p[pv + b + 2]!;
      const x3 = p[pv + b + 3]!;
      val[at + b] = x0 * val[hv + b]! + (1 - x0) * val[lv + b]!;
      val[at + b + 1] = x1 * val[hv + b + 1]! + (1 - x1) * val[lv + b + 1]!;
      val[at + b + 2] = x2 * val[hv + b + 2]! + (1 - x2) * val[lv + b + 2]!;
      val[at + b + 3] = x3 * val[hv + b + 3]! + (1 - x3) * val[lv + b + 3]!;
    }
    for (; b < count; b++) {
      const x = p[pv + b]!;
      val[at + b] = x * val[hv + b]! + (1 - x) * val[lv + b]!;
    }
  }
}
