/**
 * Minimal cut sets of a root, read off its decision diagram with the probability cutoff and the
 * maximum order applied while searching (the sets below the cutoff are never built).
 *
 * Method. Every path from the root to `true` names a set S (the variables left by their high
 * edge; every other variable false), and distinct paths name distinct sets. S is a minimal cut set
 * iff removing any x of S makes the function false. For the x tested at node n that is exactly
 * "low(n) is false on the rest of the path", because the part of the path above n is the same
 * with or without x. So the search walks paths depth first carrying, besides the current node,
 * a short list of *constraints*: the low children of the nodes where it took the high edge. Each
 * constraint is moved along with the same assignment (a skipped level means "false"); one that
 * becomes `true`, or equal to the current node, proves no completion is minimal and ends the
 * branch; one that becomes `false` is satisfied and dropped. A path reaching `true` with all its
 * constraints `false` is a minimal cut set, found once. (This is the BDD reading of minimal
 * solutions, minsol(f) = x·(minsol(f1) \ f0) ∪ minsol(f0), done as a bounded search rather than by
 * building a second diagram.)
 *
 * Pruning (sound): for each node and each k ≤ maxOrder the best probability of any path to `true`
 * using at most k high edges is computed bottom-up; a branch whose prefix probability times that
 * bound is below the cutoff, or that needs more high edges than maxOrder allows, cannot contain a
 * kept set and is not entered. Minimality is not used for the bound, so it only over-estimates.
 *
 * What was dropped. Pruned branches are searched again without cutoff or order limit, under a
 * step budget (`truncationBudget`), to count the minimal cut sets they hold and add up their
 * probabilities. If the budget suffices, `truncated` and `truncatedProbability` are exact
 * (`truncatedExact: true`); otherwise `truncated` is a lower bound and `truncatedProbability` is
 * left out.
 *
 * Non-coherent functions (with negation). Prime implicants are out of scope. Cut sets are those
 * of the monotone relaxation f⁺(x) = max over y ≤ x of f(y) — the function with its negative
 * literals dropped (replaced by true). Its minimal cut sets are the minimal sets S such that
 * "S true, everything else false" makes f true; each is the positive part of a prime implicant.
 * On the diagram f⁺ is ite(x, f⁺(high) ∨ f⁺(low), f⁺(low)) node by node
 * (BddManager.monotoneRelaxation). A set's probability is the product of its events'
 * probabilities, and `coherent` is false. Since the diagram is canonical, f is monotone exactly
 * when f⁺ is the same node, which is how `coherent` is decided; when the manager knows every node
 * it made is monotone (no negation was ever used), the relaxation is skipped altogether.
 * The exact top probability is not affected: it comes from the diagram of f itself.
 */
import { HIGH, LOW, NODE_STRIDE, type BddManager } from './bdd.js';

export interface CutSet {
  /** Variable indices, ascending. */
  vars: number[];
  /** Product of the variables' probabilities. */
  probability: number;
}

export interface CutSetOptions {
  /** Keep sets with probability ≥ cutoff (default 0: keep all). */
  cutoff?: number;
  /** Keep sets of at most this many events (default: no limit). */
  maxOrder?: number;
  /** Search steps allowed for counting what was dropped (default 100000). */
  truncationBudget?: number;
  /**
   * Keep at most this many sets, the most probable (default: no cap). Memory stays bounded by the
   * cap: the kept sets live in a heap, and once it is full its least probable set becomes the
   * search's cutoff, so branches that cannot beat it are never entered.
   */
  maxSets?: number;
  /**
   * The caller knows the function is monotone, so the relaxation need not be built. Wrong use
   * gives wrong sets; leave unset when unsure (the manager already skips it when it never used
   * negation, see BddManager.everyNodeMonotone).
   */
  monotone?: boolean;
}

export interface CutSetResult {
  /** Sorted by probability, largest first; ties by variable indices (lexicographic). */
  sets: CutSet[];
  /** Minimal cut sets dropped by the cutoff or the order limit (exact, or a lower bound). */
  truncated: number;
  /** Sum of the probabilities of the dropped sets, present only when known exactly. */
  truncatedProbability?: number;
  /** Whether `truncated` (and `truncatedProbability`) are exact. */
  truncatedExact: boolean;
  /** False when the function is not monotone and the sets are those of its monotone relaxation. */
  coherent: boolean;
  /**
   * Sets that met the cutoff and the order limit but were left out by `maxSets`: how many and
   * their summed probability, exact when `cappedExact`, otherwise upper bounds (each pruned branch
   * counted as all its paths to true, see SearchTables.pathSum). Zero when nothing was capped.
   */
  capped: number;
  cappedProbability: number;
  cappedExact: boolean;
}

/**
 * Rare-event sum Σ P(C) and min-cut upper bound 1 − Π(1 − P(C)) of a list of cut sets
 * (NUREG-0492, Fault Tree Handbook). The product is formed as −expm1(Σ log1p(−P(C))), so small
 * probabilities do not vanish against 1; both sums are compensated (Neumaier).
 */
export function cutSetBounds(sets: readonly { probability: number }[]): { rareEvent: number; mcub: number } {
  const sum = new CompensatedSum();
  const logs = new CompensatedSum();
  let certain = false;
  for (const s of sets) {
    sum.add(s.probability);
    // A set of probability 1 makes the product 0 (log −∞, which a compensated sum cannot hold).
    if (s.probability >= 1) certain = true;
    else logs.add(Math.log1p(-s.probability));
  }
  // `+ 0` turns the −0 of an empty list into 0.
  return { rareEvent: sum.value(), mcub: certain ? 1 : -Math.expm1(logs.value()) + 0 };
}

class CompensatedSum {
  private s = 0;
  private c = 0;
  add(x: number): void {
    const t = this.s + x;
    if (Math.abs(this.s) >= Math.abs(x)) this.c += this.s - t + x;
    else this.c += x - t + this.s;
    this.s = t;
  }
  value(): number {
    return this.s + this.c;
  }
}

/** Most bound rows kept per node: k = 0..MAX_ROWS−1 exactly; beyond that the unlimited bound. */
const MAX_ROWS = 13;

/**
 * Minimal cut sets of `root` with probability ≥ cutoff and at most maxOrder events, each event
 * true with probability p[v] (method and the non-coherent case: see the top of this file).
 */
export function minimalCutSets(
  m: BddManager,
  root: number,
  p: ArrayLike<number>,
  options: CutSetOptions = {},
): CutSetResult {
  const cutoff = options.cutoff ?? 0;
  const maxOrder = options.maxOrder ?? Infinity;
  if (!(cutoff >= 0)) throw new RangeError('cutoff must be ≥ 0');
  if (!(maxOrder >= 0)) throw new RangeError('maxOrder must be ≥ 0');
  const g = options.monotone ? root : m.monotoneRelaxation(root);
  const tables = new SearchTables(m, g, p, Math.min(MAX_ROWS, Math.min(maxOrder, m.varCount) + 1));
  const search = new CutSetSearch(m, tables, p, Math.min(maxOrder, m.varCount), cutoff);
  const counter = new CutSetSearch(m, tables, p, Infinity, 0);
  const maxSets = options.maxSets ?? Infinity;
  if (!(maxSets >= 1)) throw new RangeError('maxSets must be ≥ 1');
  const kept = new WorstFirstHeap();
  let truncated = 0;
  const dropped = new CompensatedSum();
  let exact = true;
  let budget = options.truncationBudget ?? 100_000;
  // Capped sets: counted one by one where they were seen, bounded by path sums where they were not.
  let cappedCount = 0;
  const cappedProb = new CompensatedSum();
  let cappedExact = true;
  const meetsLimits = (vars: readonly number[], prob: number) => prob >= cutoff && vars.length <= maxOrder;

  search.run(
    { node: g, vars: [], constraints: [], prob: 1 },
    (vars) => {
      const prob = setProbability(vars, p);
      // The bound used a different product order; the kept/dropped decision uses this one.
      if (prob < cutoff) {
        truncated++;
        dropped.add(prob);
        return;
      }
      const set = { vars, probability: prob };
      if (kept.size < maxSets) kept.push(set);
      else if (compareCutSets(set, kept.worst()!) < 0) {
        const out = kept.replaceWorst(set);
        cappedCount++;
        cappedProb.add(out.probability);
      } else {
        cappedCount++;
        cappedProb.add(prob);
      }
      // A full heap: nothing at or below its least probable set can get in any more.
      if (kept.size >= maxSets) search.raiseFloor(kept.worst()!.probability * (1 + CAP_TIE_TOLERANCE));
    },
    (branch) => {
      if (budget > 0) {
        let count = 0;
        const prob = new CompensatedSum();
        const left = counter.run(
          branch.materialise(),
          (vars) => {
            const pr = setProbability(vars, p);
            if (branch.byCap && meetsLimits(vars, pr)) {
              count++;
              prob.add(pr);
            } else {
              truncated++;
              dropped.add(pr);
            }
          },
          null,
          budget,
        );
        if (left >= 0) {
          cappedCount += count;
          cappedProb.add(prob.value());
          budget = left;
          return;
        }
        exact = false;
        budget = 0;
      }
      // Budget spent: count one set where one is certain to exist, so the count stays a lower bound.
      exact = false;
      if (branch.byCap) {
        cappedExact = false;
        const bound = branch.pathBound();
        cappedCount += bound.count;
        cappedProb.add(bound.probability);
      } else if (branch.certainlyHoldsMinimalSet()) truncated++;
    },
  );

  const sets = kept.drain().sort(compareCutSets);
  const result: CutSetResult = {
    sets,
    truncated,
    truncatedExact: exact,
    coherent: g === root,
    capped: cappedCount,
    cappedProbability: cappedProb.value(),
    cappedExact,
  };
  if (exact) result.truncatedProbability = dropped.value();
  return result;
}

/**
 * Once the cap is reached, a branch must promise a set more probable than the least probable kept
 * one by this relative margin to be searched. Without a margin a study of many equally probable
 * sets (identical trains) would walk every tie only to reject it; with it, a set within one part in
 * 10^9 of the last kept one may be counted as capped in its favour.
 */
const CAP_TIE_TOLERANCE = 1e-9;

/**
 * The kept sets, least probable (then last in variable order) on top, so the one to give up when
 * a better set arrives is at hand: a binary heap on compareCutSets, reversed.
 */
class WorstFirstHeap {
  private readonly items: CutSet[] = [];
  get size(): number {
    return this.items.length;
  }
  worst(): CutSet | undefined {
    return this.items[0];
  }
  push(set: CutSet): void {
    const a = this.items;
    a.push(set);
    let i = a.length - 1;
    while (i > 0) {
      const up = (i - 1) >> 1;
      if (compareCutSets(a[i]!, a[up]!) <= 0) break;
      [a[i], a[up]] = [a[up]!, a[i]!];
      i = up;
    }
  }
  /** Puts `set` in place of the worst and returns the worst. */
  replaceWorst(set: CutSet): CutSet {
    const a = this.items;
    const out = a[0]!;
    a[0] = set;
    let i = 0;
    for (;;) {
      const l = 2 * i + 1;
      const r = l + 1;
      let w = i;
      if (l < a.length && compareCutSets(a[l]!, a[w]!) > 0) w = l;
      if (r < a.length && compareCutSets(a[r]!, a[w]!) > 0) w = r;
      if (w === i) break;
      [a[i], a[w]] = [a[w]!, a[i]!];
      i = w;
    }
    return out;
  }
  drain(): CutSet[] {
    return this.items.splice(0);
  }
}

function setProbability(vars: readonly number[], p: ArrayLike<number>): number {
  let prob = 1;
  for (const v of vars) prob *= p[v]!;
  return prob;
}

function compareCutSets(a: CutSet, b: CutSet): number {
  if (a.probability !== b.probability) return b.probability - a.probability;
  const n = Math.min(a.vars.length, b.vars.length);
  for (let i = 0; i < n; i++) if (a.vars[i] !== b.vars[i]) return a.vars[i]! - b.vars[i]!;
  return a.vars.length - b.vars.length;
}

// Local copies: imported bindings can cost a property read each in hot loops under some loaders.
const F = 0;
const T = 1;

/** A branch of the search: where it is, what it has taken, and what must stay false. */
interface Branch {
  node: number;
  vars: number[];
  constraints: number[];
  prob: number;
}

/** A branch the bounds cut off, handed to the caller without copying unless asked (valid during the callback only). */
interface PrunedBranch {
  /** A standalone copy, to search it again. */
  materialise(): Branch;
  /** True when it certainly holds a minimal cut set (no open constraint left). */
  certainlyHoldsMinimalSet(): boolean;
  /** True when only the cap's raised floor cut it off: it met the caller's cutoff and order limit. */
  byCap: boolean;
  /** Upper bounds on the number and summed probability of the sets within the order limit it holds. */
  pathBound(): { count: number; probability: number };
}

/** The reusable PrunedBranch handed out by a search; valid only inside the callback. */
class PrunedView implements PrunedBranch {
  node = 0;
  head = -1;
  extraVar = -1;
  count = 0;
  prob = 0;
  order = 0;
  byCap = false;
  constructor(private readonly search: CutSetSearch) {}
  pathBound(): { count: number; probability: number } {
    return this.search.branchPathBound(this);
  }
  materialise(): Branch {
    return this.search.materialiseBranch(this);
  }
  certainlyHoldsMinimalSet(): boolean {
    return this.search.branchCertainlyHoldsMinimalSet(this);
  }
}

/** Per-node tables of one monotone diagram, shared by the searches over it. */
class SearchTables {
  /** Node id → slot (0 false, 1 true, 2 + i the i-th reachable node). */
  readonly slotOf: Int32Array;
  /** Value with all remaining variables false. */
  readonly zeroValue: Int32Array;
  /** Fewest high edges on a path to true. */
  readonly minOnes: Int32Array;
  /** Rows of `bound`, K. */
  readonly rows: number;
  /** bound[slot·K + k]: best probability of a path to true with at most k high edges (k < K). */
  readonly bound: Float64Array;
  /** Best probability of any path to true. */
  readonly boundAny: Float64Array;
  /** The reachable nodes, children first, and the probabilities: kept for the path sums. */
  private readonly nodes: Int32Array;
  private readonly nd: Int32Array;
  private readonly order: Int32Array;
  private readonly p: ArrayLike<number>;
  private sums: PathSums | undefined;

  constructor(m: BddManager, root: number, p: ArrayLike<number>, rows: number) {
    const { nodes: nd, order } = m.arrays();
    const nodes = m.topological([root]);
    this.nodes = nodes;
    this.nd = nd;
    this.order = order;
    this.p = p;
    const n = nodes.length;
    const K = rows;
    this.rows = K;
    this.slotOf = new Int32Array(m.idLimit);
    this.slotOf[T] = 1;
    this.zeroValue = new Int32Array(n + 2);
    this.minOnes = new Int32Array(n + 2);
    this.bound = new Float64Array((n + 2) * K);
    this.boundAny = new Float64Array(n + 2);
    this.zeroValue[1] = T;
    this.minOnes[0] = 0x3fffffff;
    for (let k = 0; k < K; k++) this.bound[K + k] = 1;
    this.boundAny[1] = 1;
    const b = this.bound;
    for (let i = 0; i < n; i++) {
      const node = nodes[i]!;
      const s = i + 2;
      this.slotOf[node] = s;
      const o = node * NODE_STRIDE;
      const ls = this.slotOf[nd[o + LOW]!]!;
      const hs = this.slotOf[nd[o + HIGH]!]!;
      const pv = p[order[nd[o]!]!]!;
      this.zeroValue[s] = this.zeroValue[ls]!;
      this.minOnes[s] = Math.min(this.minOnes[ls]!, this.minOnes[hs]! + 1);
      this.boundAny[s] = Math.max(this.boundAny[ls]!, pv * this.boundAny[hs]!);
      b[s * K] = b[ls * K]!;
      for (let k = 1; k < K; k++) b[s * K + k] = Math.max(b[ls * K + k]!, pv * b[hs * K + k - 1]!);
    }
  }

  /**
   * The path sums, made on first use: only a search whose exact-count budget runs out asks for
   * them, and at three K-row tables of doubles they would be most of the memory of a search over
   * a diagram of millions of nodes.
   */
  pathSums(): PathSums {
    if (this.sums) return this.sums;
    const { nodes, nd, order, p, rows: K, slotOf } = this;
    const n = nodes.length;
    const sum = new Float64Array((n + 2) * K);
    const sumAny = new Float64Array(n + 2);
    const count = new Float64Array((n + 2) * K);
    const countAny = new Float64Array(n + 2);
    for (let k = 0; k < K; k++) sum[K + k] = count[K + k] = 1;
    sumAny[1] = countAny[1] = 1;
    for (let i = 0; i < n; i++) {
      const o = nodes[i]! * NODE_STRIDE;
      const s = i + 2;
      const ls = slotOf[nd[o + LOW]!]!;
      const hs = slotOf[nd[o + HIGH]!]!;
      const pv = p[order[nd[o]!]!]!;
      sumAny[s] = sumAny[ls]! + pv * sumAny[hs]!;
      countAny[s] = countAny[ls]! + countAny[hs]!;
      sum[s * K] = sum[ls * K]!;
      count[s * K] = count[ls * K]!;
      for (let k = 1; k < K; k++) {
        sum[s * K + k] = sum[ls * K + k]! + pv * sum[hs * K + k - 1]!;
        count[s * K + k] = count[ls * K + k]! + count[hs * K + k - 1]!;
      }
    }
    this.sums = { sum, sumAny, count, countAny };
    return this.sums;
  }
}

/**
 * sum[slot·K + k]: Σ over paths to true with at most k high edges of the product of their high
 * variables' probabilities (k < K); sumAny without the limit; count/countAny the number of such
 * paths. Distinct paths name distinct sets, so these bound the count and the summed probability
 * of the minimal cut sets below a node.
 */
interface PathSums {
  readonly sum: Float64Array;
  readonly sumAny: Float64Array;
  readonly count: Float64Array;
  readonly countAny: Float64Array;
}

/**
 * The depth-first search over one monotone diagram. Paths can be as long as there are variables,
 * so the search keeps its own stack: fixed-width records, constraint lists in a LIFO arena and
 * the taken variables as a linked list whose cells are reclaimed when their branch is done. The
 * loop allocates nothing but the arrays of the sets it reports.
 */
class CutSetSearch {
  /** The node table (see BddArrays): level, low, high at offsets 0, LOW, HIGH of node·NODE_STRIDE. */
  private readonly nd: Int32Array;
  private readonly order: Int32Array;
  private readonly terminalLevel: number;
  /** The caller's cutoff, less a rounding margin. */
  private readonly cutoffSlack: number;
  /** The cutoff in force: the caller's, or higher once a cap is full (raiseFloor). */
  private slack: number;

  private rec = new Int32Array(6 * 256); // node, order, varsHead, consStart, consCount, cellMark
  private recProb = new Float64Array(256);
  private sp = 0;
  private arena = new Int32Array(1024);
  private arenaTop = 0;
  private cellVar = new Int32Array(1024);
  private cellNext = new Int32Array(1024);
  private cellTop = 0;
  /** Normalised constraints of the branch being expanded, and the cofactored ones for a child. */
  private cons = new Int32Array(16);
  private kid = new Int32Array(16);
  /** Scratch for checks made from a pruned-branch callback, which must not touch `cons`. */
  private spare = new Int32Array(16);
  /** One view object for every pruned branch, valid only during the callback (no allocation). */
  private readonly view = new PrunedView(this);

  constructor(
    m: BddManager,
    private readonly t: SearchTables,
    private readonly p: ArrayLike<number>,
    private readonly maxOrder: number,
    cutoff: number,
  ) {
    const a = m.arrays();
    this.nd = a.nodes;
    this.order = a.order;
    this.terminalLevel = m.varCount;
    this.cutoffSlack = cutoff * (1 - 1e-12);
    this.slack = this.cutoffSlack;
  }

  /** From now on, branches whose best set is below `floor` are cut off too (reported with byCap). */
  raiseFloor(floor: number): void {
    if (floor > this.slack) this.slack = floor;
  }

  /** For PrunedView: path-sum bounds of the branch within the order limit. */
  branchPathBound(v: PrunedView): { count: number; probability: number } {
    const t = this.t;
    const s = t.slotOf[v.node]!;
    const k = this.maxOrder - v.order;
    if (v.node === F || k < 0) return { count: 0, probability: 0 };
    const sums = t.pathSums();
    if (k < t.rows) return { count: sums.count[s * t.rows + k]!, probability: v.prob * sums.sum[s * t.rows + k]! };
    return { count: sums.countAny[s]!, probability: v.prob * sums.sumAny[s]! };
  }

  /** Best probability of a path to true from `node` with at most k high edges (an upper bound). */
  private best(node: number, k: number): number {
    const t = this.t;
    const s = t.slotOf[node]!;
    return k < t.rows ? t.bound[s * t.rows + k]! : t.boundAny[s]!;
  }

  /**
   * Moves constraints down to the level of `node` (skipped levels are false), drops satisfied
   * ones and duplicates, into `out`. Returns the count, or −1 when a constraint proves the branch
   * holds no minimal set (it became true, or equals the node: whatever makes the node true makes
   * it true).
   */
  private normalise(node: number, src: Int32Array, from: number, count: number, out: Int32Array): number {
    const nd = this.nd;
    const L = nd[node * NODE_STRIDE]!;
    let n = 0;
    for (let i = 0; i < count; i++) {
      let c = src[from + i]!;
      if (L === this.terminalLevel) c = this.t.zeroValue[this.t.slotOf[c]!]!;
      else while (nd[c * NODE_STRIDE]! < L) c = nd[c * NODE_STRIDE + LOW]!;
      if (c === F) continue;
      if (c === T || c === node) return -1;
      let dup = false;
      for (let j = 0; j < n && !dup; j++) dup = out[j] === c;
      if (!dup) out[n++] = c;
    }
    return n;
  }

  private ensureConstraintRoom(n: number): void {
    if (this.cons.length < n) {
      this.cons = new Int32Array(2 * n);
      this.kid = new Int32Array(2 * n);
      this.spare = new Int32Array(2 * n);
    }
  }

  private push(node: number, order: number, head: number, cons: Int32Array, count: number, prob: number): void {
    if (this.sp === this.recProb.length) {
      const r = new Int32Array(this.rec.length * 2);
      r.set(this.rec);
      this.rec = r;
      const q = new Float64Array(this.recProb.length * 2);
      q.set(this.recProb);
      this.recProb = q;
    }
    if (this.arenaTop + count > this.arena.length) {
      const a = new Int32Array(2 * (this.arenaTop + count));
      a.set(this.arena);
      this.arena = a;
    }
    const o = this.sp * 6;
    this.rec[o] = node;
    this.rec[o + 1] = order;
    this.rec[o + 2] = head;
    this.rec[o + 3] = this.arenaTop;
    this.rec[o + 4] = count;
    this.rec[o + 5] = this.cellTop;
    const arena = this.arena;
    let top = this.arenaTop;
    for (let i = 0; i < count; i++) arena[top++] = cons[i]!;
    this.arenaTop = top;
    this.recProb[this.sp] = prob;
    this.sp++;
  }

  private newCell(v: number, next: number): number {
    if (this.cellTop === this.cellVar.length) {
      const a = new Int32Array(this.cellVar.length * 2);
      a.set(this.cellVar);
      this.cellVar = a;
      const b = new Int32Array(this.cellNext.length * 2);
      b.set(this.cellNext);
      this.cellNext = b;
    }
    this.cellVar[this.cellTop] = v;
    this.cellNext[this.cellTop] = next;
    return this.cellTop++;
  }

  private varsOf(head: number, extra = -1): number[] {
    const out: number[] = extra >= 0 ? [extra] : [];
    for (let c = head; c >= 0; c = this.cellNext[c]!) out.push(this.cellVar[c]!);
    return out.sort((x, y) => x - y);
  }

  /** Fills the reusable view of a pruned branch (its constraints are in `kid`) and reports it. */
  private pruned(onPruned: (b: PrunedBranch) => void, node: number, head: number, extraVar: number, count: number, prob: number, order: number): void {
    const view = this.view;
    // Within the caller's limits, so only a raised floor can have cut it off.
    view.byCap =
      this.slack > this.cutoffSlack && order + this.t.minOnes[this.t.slotOf[node]!]! <= this.maxOrder && prob * this.best(node, this.maxOrder - order) >= this.cutoffSlack;
    view.order = order;
    view.node = node;
    view.head = head;
    view.extraVar = extraVar;
    view.count = count;
    view.prob = prob;
    onPruned(view);
  }

  /** For PrunedView: the branch as standalone data. */
  materialiseBranch(v: PrunedView): Branch {
    return { node: v.node, vars: this.varsOf(v.head, v.extraVar), constraints: Array.from(this.kid.subarray(0, v.count)), prob: v.prob };
  }

  /** For PrunedView: no open constraint after normalising, and a way to true. */
  branchCertainlyHoldsMinimalSet(v: PrunedView): boolean {
    return v.node !== F && this.normalise(v.node, this.kid, 0, v.count, this.spare) === 0;
  }

  /**
   * Searches from `start`. Calls `found` with each minimal cut set (variable indices, ascending)
   * and `onPruned` with each branch the bounds cut off (null: nothing is cut off). With a budget,
   * returns the steps left, or −1 if the budget ran out first.
   */
  run(
    start: Branch,
    found: (vars: number[]) => void,
    onPruned: ((b: PrunedBranch) => void) | null,
    budget = Infinity,
  ): number {
    this.sp = 0;
    this.arenaTop = 0;
    this.cellTop = 0;
    let head0 = -1;
    for (const v of start.vars) head0 = this.newCell(v, head0);
    this.ensureConstraintRoom(start.constraints.length + 1);
    this.kid.set(start.constraints);
    this.push(start.node, start.vars.length, head0, this.kid, start.constraints.length, start.prob);
    const nd = this.nd;
    const minOnes = this.t.minOnes;
    const slotOf = this.t.slotOf;
    const maxOrder = this.maxOrder;

    while (this.sp > 0) {
      if (budget !== Infinity && budget-- <= 0) return -1;
      this.sp--;
      const o = this.sp * 6;
      const rec = this.rec;
      const node = rec[o]!;
      const order = rec[o + 1]!;
      const head = rec[o + 2]!;
      const consStart = rec[o + 3]!;
      const consCount = rec[o + 4]!;
      const prob = this.recProb[this.sp]!;
      // This record was the newest: its arena slice and its descendants' cells are free again.
      this.arenaTop = consStart;
      this.cellTop = rec[o + 5]!;
      if (node === F) continue;
      this.ensureConstraintRoom(consCount + 1);
      const cons = this.cons;
      const kid = this.kid;
      const nc = this.normalise(node, this.arena, consStart, consCount, cons);
      if (nc < 0) continue;
      if (node === T) {
        found(this.varsOf(head));
        continue;
      }
      const on = node * NODE_STRIDE;
      const L = nd[on]!;
      const v = this.order[L]!;
      const pv = this.p[v]!;
      const hi = nd[on + HIGH]!;
      const lo = nd[on + LOW]!;

      // High edge: v joins the set; the low child becomes a constraint.
      let k = 0;
      for (let i = 0; i < nc; i++) {
        const c = cons[i]!;
        kid[k++] = nd[c * NODE_STRIDE] === L ? nd[c * NODE_STRIDE + HIGH]! : c;
      }
      if (lo !== F) kid[k++] = lo;
      const hiProb = prob * pv;
      if (order + 1 + minOnes[slotOf[hi]!]! <= maxOrder && hiProb * this.best(hi, maxOrder - order - 1) >= this.slack) {
        this.push(hi, order + 1, this.newCell(v, head), kid, k, hiProb);
      } else if (onPruned) {
        this.pruned(onPruned, hi, head, v, k, hiProb, order + 1);
      }

      // Low edge: v stays false.
      if (lo === F) continue;
      k = 0;
      for (let i = 0; i < nc; i++) {
        const c = cons[i]!;
        kid[k++] = nd[c * NODE_STRIDE] === L ? nd[c * NODE_STRIDE + LOW]! : c;
      }
      if (order + minOnes[slotOf[lo]!]! <= maxOrder && prob * this.best(lo, maxOrder - order) >= this.slack) {
        this.push(lo, order, head, kid, k, prob);
      } else if (onPruned) {
        this.pruned(onPruned, lo, head, -1, k, prob, order);
      }
    }
    return budget;
  }
}
