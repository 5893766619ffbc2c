/**
 * Importance measures of every variable of one root, exact on the decision diagram (not from cut
 * sets), in two passes: bottom-up probabilities, then top-down path probabilities.
 *
 * Definitions (W. E. Vesely et al., "Measures of Risk Importance and Their Applications",
 * NUREG/CR-3385, US NRC 1983), with P = P(top), P1 = P(top | x_i true), P0 = P(top | x_i false):
 *   Birnbaum        I_B  = P1 − P0 = ∂P/∂p_i (P is multilinear in the p_i)
 *   Fussell–Vesely  FV   = 1 − P0/P   — the exact "risk decrease" form. The cut-set form
 *                                        Σ P(cut sets with i)/P is its rare-event approximation.
 *                                        Because P − P0 = p_i·I_B, this FV equals the criticality
 *                                        importance for independent events; it is computed as
 *                                        p_i·I_B/P so a tiny FV is not lost to 1 − (nearly 1).
 *   criticality     I_CR = I_B·p_i/P
 *   risk achievement worth RAW = P1/P
 *   risk reduction worth   RRW = P/P0
 * A ratio whose denominator is 0 is reported as Infinity; FV and criticality are 0 when P = 0.
 *
 * How P1 and P0 are found without cancellation: every path from the root to a constant either
 * passes a node testing x_i or jumps over x_i's level on an edge. With R(n) the probability of
 * reaching node n from the root,
 *   P1 = Σ_{n tests x_i} R(n)·P(high n) + S_i,   P0 = Σ_{n tests x_i} R(n)·P(low n) + S_i,
 * where S_i is the probability mass carried by edges that jump over level i. Each edge adds its
 * mass to a range of levels; a segment tree accumulates those range additions so every S_i is a
 * sum of non-negative terms (a difference array would subtract). All of P1, P0 are therefore sums
 * of non-negative products, accurate to rounding even when P0 ≪ P (RRW) or P1 ≈ P (RAW).
 * I_B is Σ R(n)·(P(high) − P(low)): its absolute error is of the order of 1e-16·P1.
 */
import { HIGH, LEVEL, LOW, NODE_STRIDE, type BddManager } from './bdd.js';

export interface ImportanceResult {
  /** P(top). */
  probability: number;
  /** All arrays below are indexed by variable (basic-event index). */
  birnbaum: Float64Array;
  /** P(top | x_i true). */
  conditionalTrue: Float64Array;
  /** P(top | x_i false). */
  conditionalFalse: Float64Array;
  fussellVesely: Float64Array;
  criticality: Float64Array;
  raw: Float64Array;
  rrw: Float64Array;
}

export interface ImportanceOptions {
  /**
   * The root is a coherent (monotone) function, so P0 ≤ P ≤ P1 and every measure has its coherent
   * range: Birnbaum ≥ 0, 0 ≤ FV = criticality ≤ 1, RAW ≥ 1, RRW ≥ 1. Rounding can step outside
   * (a Birnbaum of −1.7e-18, a RAW of 0.9999999999999998); with this set such values are clamped.
   */
  coherent?: boolean;
}

export function importance(m: BddManager, root: number, p: ArrayLike<number>, q?: ArrayLike<number>, options: ImportanceOptions = {}): ImportanceResult {
  const coherent = options.coherent ?? false;
  const nv = m.varCount;
  const passes = importancePasses(m, root, p, q);
  const { P, a1, a0, present, skips } = passes;
  // A copy: the passes are shared (see importancePasses) and the clamping below writes to it.
  const ib = Float64Array.from(passes.ib);
  const out: ImportanceResult = {
    probability: P,
    birnbaum: ib,
    conditionalTrue: new Float64Array(nv),
    conditionalFalse: new Float64Array(nv),
    fussellVesely: new Float64Array(nv),
    criticality: new Float64Array(nv),
    raw: new Float64Array(nv),
    rrw: new Float64Array(nv),
  };
  for (let v = 0; v < nv; v++) {
    let p1 = P;
    let p0 = P;
    if (present[v]) {
      const s = skips.at(m.levelOfVar[v]!);
      p1 = a1[v]! + s;
      p0 = a0[v]! + s;
    }
    if (coherent) {
      p1 = Math.max(p1, P);
      p0 = Math.min(p0, P);
      if (!(ib[v]! >= 0)) ib[v] = 0;
    }
    out.conditionalTrue[v] = p1;
    out.conditionalFalse[v] = p0;
    let fv = P > 0 ? (p[v]! * ib[v]!) / P : 0;
    if (coherent && fv > 1) fv = 1;
    out.fussellVesely[v] = fv;
    out.criticality[v] = fv;
    out.raw[v] = P > 0 ? p1 / P : Infinity;
    out.rrw[v] = p0 > 0 ? P / p0 : Infinity;
  }
  return out;
}

/** The two passes of one root at one probability vector: what every measure is made from. */
interface ImportancePasses {
  P: number;
  /** Σ R(n)·P(high n), Σ R(n)·P(low n), Σ R(n)·(P(high) − P(low)) over the nodes testing each variable. */
  a1: Float64Array;
  a0: Float64Array;
  ib: Float64Array;
  present: Uint8Array;
  skips: LevelRangeSums;
}

/**
 * The last few results of the passes, per manager: the point estimate, the sensitivity and the
 * importance table all ask for the same root at the same probabilities, and on a diagram of a few
 * hundred thousand nodes each pass is tens of milliseconds. An entry is used only for the same
 * root, the same numbers (compared value by value) and no garbage collection since (node ids
 * change with one). Callers read the shared arrays and never write to them.
 */
const passCache = new WeakMap<BddManager, { root: number; collections: number; p: Float64Array; q?: Float64Array; passes: ImportancePasses }[]>();
const PASS_CACHE_ENTRIES = 4;

function sameNumbers(a: ArrayLike<number>, b: ArrayLike<number>): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) return false;
  return true;
}

function importancePasses(m: BddManager, root: number, p: ArrayLike<number>, q?: ArrayLike<number>): ImportancePasses {
  const cached = passCache.get(m) ?? [];
  const hit = cached.find(
    (c) => c.root === root && c.collections === m.collectionCount && sameNumbers(c.p, p) && (q ? c.q !== undefined && sameNumbers(c.q, q) : c.q === undefined),
  );
  if (hit) return hit.passes;
  const passes = computePasses(m, root, p, q);
  cached.push({ root, collections: m.collectionCount, p: Float64Array.from(p), ...(q ? { q: Float64Array.from(q) } : {}), passes });
  if (cached.length > PASS_CACHE_ENTRIES) cached.shift();
  passCache.set(m, cached);
  return passes;
}

function computePasses(m: BddManager, root: number, p: ArrayLike<number>, q?: ArrayLike<number>): ImportancePasses {
  const nv = m.varCount;
  const nodes = m.topological([root]);
  const n = nodes.length;
  const { nodes: nd, order } = m.arrays();
  const level = (n: number): number => nd[n * NODE_STRIDE + LEVEL]!;
  const slotOf = new Int32Array(m.idLimit);
  slotOf[1] = 1;
  for (let i = 0; i < n; i++) slotOf[nodes[i]!] = i + 2;
  const qOf = (v: number): number => (q ? q[v]! : 1 - p[v]!);

  // Bottom-up: P of every node.
  const val = new Float64Array(n + 2);
  val[1] = 1;
  for (let i = 0; i < n; i++) {
    const o = nodes[i]! * NODE_STRIDE;
    const v = order[nd[o + LEVEL]!]!;
    val[i + 2] = p[v]! * val[slotOf[nd[o + HIGH]!]!]! + qOf(v) * val[slotOf[nd[o + LOW]!]!]!;
  }
  const rootSlot = slotOf[root]!;
  const P = val[rootSlot]!;

  const a1 = new Float64Array(nv);
  const a0 = new Float64Array(nv);
  const ib = new Float64Array(nv);
  const present = new Uint8Array(nv);
  const skips = new LevelRangeSums(nv);
  if (P > 0) skips.add(0, level(root), P);

  // Top-down: R(n), the probability of reaching n (reverse post-order visits parents first).
  const reach = new Float64Array(n + 2);
  reach[rootSlot] = 1;
  for (let i = n - 1; i >= 0; i--) {
    const o = nodes[i]! * NODE_STRIDE;
    const r = reach[i + 2]!;
    const a = nd[o + LEVEL]!;
    const v = order[a]!;
    const pv = p[v]!;
    const qv = qOf(v);
    const hiNode = nd[o + HIGH]!;
    const loNode = nd[o + LOW]!;
    const hs = slotOf[hiNode]!;
    const ls = slotOf[loNode]!;
    const ph = val[hs]!;
    const pl = val[ls]!;
    reach[hs] += r * pv;
    reach[ls] += r * qv;
    a1[v] += r * ph;
    a0[v] += r * pl;
    ib[v] += r * (ph - pl);
    present[v] = 1;
    const bh = level(hiNode);
    if (bh > a + 1 && ph > 0) skips.add(a + 1, bh, r * pv * ph);
    const bl = level(loNode);
    if (bl > a + 1 && pl > 0) skips.add(a + 1, bl, r * qv * pl);
  }
  return { P, a1, a0, ib, present, skips };
}

/** Range additions over levels [from, to) with point sums: a segment tree of non-negative addends. */
class LevelRangeSums {
  private readonly size: number;
  private readonly tree: Float64Array;

  constructor(levels: number) {
    let s = 1;
    while (s < Math.max(1, levels)) s *= 2;
    this.size = s;
    this.tree = new Float64Array(2 * s);
  }

  add(from: number, to: number, value: number): void {
    let l = from + this.size;
    let r = to + this.size;
    const t = this.tree;
    while (l < r) {
      if (l & 1) t[l++] += value;
      if (r & 1) t[--r] += value;
      l >>= 1;
      r >>= 1;
    }
  }

  at(levelIndex: number): number {
    let s = 0;
    for (let i = levelIndex + this.size; i >= 1; i >>= 1) s += this.tree[i]!;
    return s;
  }
}
