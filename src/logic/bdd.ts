/**
 * A reduced ordered binary decision diagram (ROBDD) manager.
 *
 * Design choices, and why:
 * - Nodes are small integers. A node's level, low (variable = 0) child, high (variable = 1) child
 *   and hash-chain link sit side by side in one Int32Array (16 bytes a node), and a computed-cache
 *   entry likewise: a lookup then touches one cache line, not one per field, which is most of the
 *   cost once the tables outgrow the processor caches. Node 0 is the constant false, node 1 the
 *   constant true. A node is always made after its children, so a child's id is smaller than its
 *   parent's: ascending ids are a bottom-up (topological) order, which the passes rely on.
 * - No complement edges. They would halve some diagrams, but every probability pass would then need
 *   1 − P on complemented edges; without them the probability recursion p·P(high) + (1−p)·P(low)
 *   only ever adds non-negative terms, so nothing cancels however small or close to 1 the numbers
 *   are. Negation costs one cached pass over its operand instead.
 * - A unique table (hash chains through the link field) keeps the diagram reduced and canonical: two nodes
 *   with equal (level, low, high) are the same node, so equal functions have equal ids.
 * - Operations run with explicit stacks instead of recursion: a path can be as long as there are
 *   variables (tens of thousands), which would overflow the JavaScript call stack. AND and OR,
 *   the bulk of any fault-tree build, have their own loop (apply2) that answers terminal cases and
 *   cache hits before pushing a frame; ITE, NOT and restrict share a general one (run). Both use
 *   one lossy, direct-mapped computed cache.
 * - Garbage collection by mark and compaction, only at safe points and only while a caller has
 *   said which ids it holds (`collecting`). A fault tree keeps the diagram of every gate, but the
 *   intermediate diagrams of a build (each step of a k-of-n gate, each partial AND/OR) are garbage
 *   the moment the next step exists; without collection they were most of the memory on large
 *   voting gates. Compaction keeps the survivors in their id order, so a child's id stays below
 *   its parent's, renumbers the caller's held ids in place, and clears the computed cache (its
 *   entries name old ids). Between collections the node budget counts the nodes made since the
 *   last one too, but a collection runs before that can exceed half of the room left.
 * - No dynamic reordering: the order is chosen up front (see order.ts).
 *
 * Variables are the caller's indices (basic events); `order[level]` says which variable sits at
 * each level, level 0 being the top of the diagram.
 */
import { NodeBudgetExceeded } from './errors.js';

/** The constant-false node. */
export const FALSE = 0;
/** The constant-true node. */
export const TRUE = 1;

const OP_AND = 1;
const OP_OR = 2;
const OP_ITE = 3;
const OP_NOT = 4;
const OP_RESTRICT = 5;

export interface BddManagerOptions {
  /** Most internal (non-constant) nodes the manager may hold; making one more throws NodeBudgetExceeded. */
  maxNodes?: number;
  /** Starting size of the node arrays (they double as needed). */
  initialCapacity?: number;
  /**
   * Garbage collection at safe points while `collecting` runs: `auto` (default) when the nodes
   * made since the last collection outnumber the live ones; `always` at every safe point (tests);
   * `never`.
   */
  collection?: 'auto' | 'always' | 'never';
}

/**
 * Nodes made before the first collection; later ones come when the table holds twice the live
 * nodes. Collecting often is what keeps a build fast, not only small: the unique table and the
 * node array are read at random, so a table that fits the processor caches makes each step
 * several times cheaper than one that has piled up dead nodes. Measured on the gate-family
 * benchmark with controllers striped across power groups (50/10, 887,000 nodes made for a final
 * 145,000): compile 620–850 ms with the first collection at 1M nodes, 150–230 ms at 64K, no
 * better at 16K or 32K.
 */
const MIN_NODES_BEFORE_COLLECTION = 1 << 16;

/**
 * Direct read access to the node table, for tight quantification loops. Invalid once the manager
 * makes new nodes (the table may be replaced when it grows).
 */
export interface BddArrays {
  /** nodes[4n] = level, nodes[4n + 1] = low child, nodes[4n + 2] = high child of node n. */
  readonly nodes: Int32Array;
  /** order[level] = variable index; the constants sit at level `order.length`. */
  readonly order: Int32Array;
}

/** Field offsets in BddArrays.nodes (stride NODE_STRIDE). */
export const NODE_STRIDE = 4;
export const LEVEL = 0;
export const LOW = 1;
export const HIGH = 2;
const NEXT = 3;

/**
 * Node slots per computed-cache entry. A cache as large as the node table spends more on
 * processor-cache misses than it saves in hits on big diagrams; a quarter measured better on the
 * synthetic benchmark trees (and is what the BuDDy comparison gives BuDDy).
 */
const CACHE_RATIO = 4;

/** Single-root topological lists kept (see BddManager.topological): the tops of a study, and a few more. */
const WALK_CACHE_ROOTS = 8;

/** Node ids stay below 2^28 so `(h << 3) | op` in a cache key is exact. */
const MAX_NODE_ID = 2 ** 28;

function nextPowerOfTwo(n: number): number {
  let c = 1;
  while (c < n) c *= 2;
  return c;
}

export class BddManager {
  /** Number of variables (levels). */
  readonly varCount: number;
  /** order[level] = variable index. */
  readonly order: Int32Array;
  /** levelOfVar[variable] = level. */
  readonly levelOfVar: Int32Array;
  /** Internal-node budget: the `maxNodes` option, capped at 2^28 − 2 (the id range of the cache). */
  readonly maxNodes: number;

  /** The node table, NODE_STRIDE ints per node: level, low, high, next in hash chain. */
  private nd: Int32Array;
  private buckets: Int32Array;
  private bucketMask: number;
  private capacity: number;
  private count = 2;

  /** The computed cache, 4 ints per entry: f, g, (h << 3) | op, result. op ≥ 1, so zeros never match. */
  private ce!: Int32Array;
  private cMask = 0;

  // Engine stacks: a frame per level at most (children are always deeper), two results per frame.
  private readonly fOp: Int32Array;
  private readonly fF: Int32Array;
  private readonly fG: Int32Array;
  private readonly fH: Int32Array;
  private readonly fL: Int32Array;
  private readonly fS: Int32Array;
  private readonly res: Int32Array;

  // Visit stamps for traversals, so a traversal need not clear an array the size of the manager.
  private stamp: Uint32Array;
  private stampGen = 0;

  private allMonotone = true;

  // Garbage collection: the id arrays the caller holds (renumbered in place), whether safe points
  // may collect, and when the next one should.
  readonly collectionMode: 'auto' | 'always' | 'never';
  private readonly held: Int32Array[] = [];
  private collectingDepth = 0;
  /** Recent single-root topological lists (see topological), emptied by every collection. */
  private readonly walkCache = new Map<number, Int32Array>();
  private collectAt = MIN_NODES_BEFORE_COLLECTION;
  private collections = 0;

  /**
   * @param order order[level] = variable index: a permutation of 0..n−1. A plain number n means
   *   the identity order on n variables.
   */
  constructor(order: readonly number[] | number, options: BddManagerOptions = {}) {
    const ord = typeof order === 'number' ? Array.from({ length: order }, (_, i) => i) : order;
    const n = ord.length;
    this.varCount = n;
    this.order = Int32Array.from(ord);
    this.levelOfVar = new Int32Array(n).fill(-1);
    for (let l = 0; l < n; l++) {
      const v = ord[l]!;
      if (!Number.isInteger(v) || v < 0 || v >= n || this.levelOfVar[v] !== -1) {
        throw new RangeError(`variable order must be a permutation of 0..${n - 1}`);
      }
      this.levelOfVar[v] = l;
    }
    const budget = options.maxNodes ?? Infinity;
    if (!(budget >= 0)) throw new RangeError('maxNodes must be a non-negative number');
    // The cache packs a node id into 29 bits with the operation code; beyond that, refuse as if
    // the budget were spent (it is also 4 GiB of node table).
    this.maxNodes = Math.min(budget, MAX_NODE_ID - 2);
    this.collectionMode = options.collection ?? 'auto';
    // The first collection comes sooner under a small budget, as later ones do (see compact).
    this.collectAt = Math.min(MIN_NODES_BEFORE_COLLECTION, Math.max(1, Math.floor(this.maxNodes / 2)));

    const cap = nextPowerOfTwo(Math.max(1024, options.initialCapacity ?? 1 << 14));
    this.capacity = cap;
    this.nd = new Int32Array(cap * NODE_STRIDE);
    this.buckets = new Int32Array(cap);
    this.bucketMask = cap - 1;
    this.stamp = new Uint32Array(cap);
    // The two constants sit below every variable; true's children are itself, false's are 0.
    this.nd[LEVEL] = n;
    this.nd[NODE_STRIDE + LEVEL] = n;
    this.nd[NODE_STRIDE + LOW] = 1;
    this.nd[NODE_STRIDE + HIGH] = 1;
    this.allocateCache(cap / CACHE_RATIO);

    const depth = n + 2;
    this.fOp = new Int32Array(depth);
    this.fF = new Int32Array(depth);
    this.fG = new Int32Array(depth);
    this.fH = new Int32Array(depth);
    this.fL = new Int32Array(depth);
    this.fS = new Int32Array(depth);
    this.res = new Int32Array(2 * depth + 2);
  }

  /**
   * Internal nodes in the table (constants excluded): right after a collection the live ones;
   * between collections also those made since that no root uses any more.
   */
  get nodeCount(): number {
    return this.count - 2;
  }

  /** Garbage collections run so far. */
  get collectionCount(): number {
    return this.collections;
  }

  /**
   * Runs `body` with garbage collection allowed at safe points. `held` are every node id the caller
   * keeps across calls into the manager during `body` (other ids it holds are invalid after any
   * call that may collect); a collection keeps what they reach and renumbers them in place.
   * Ids the caller obtains inside `body` must go into a held array before the next call.
   * Negative entries (unset) are left alone. Nested calls add their arrays.
   */
  collecting<T>(held: readonly Int32Array[], body: () => T): T {
    const mark = this.held.length;
    this.held.push(...held);
    this.collectingDepth++;
    try {
      return body();
    } finally {
      this.collectingDepth--;
      this.held.length = mark;
    }
  }

  /**
   * Collects now, keeping the nodes reachable from the held arrays (see `collecting`) and from
   * `extra`, which is renumbered in place too. Only valid inside `collecting`.
   */
  collect(extra?: Int32Array): void {
    if (this.collectingDepth === 0) throw new Error('collect() outside collecting(): the caller has not said which ids it holds');
    this.compact(extra ? [...this.held, extra] : this.held);
  }

  /**
   * A safe point: inside `collecting`, collects if collection is on and due (`extra` as in
   * collect()); elsewhere does nothing.
   */
  safePoint(extra?: Int32Array): void {
    if (this.collectingDepth === 0 || this.collectionMode === 'never') return;
    if (this.collectionMode === 'always' || this.count - 2 >= this.collectAt) this.collect(extra);
  }

  /**
   * Mark from the roots, then compact: survivors keep their relative order (so children stay
   * below parents), the unique table is rebuilt, the computed cache and visit stamps cleared.
   */
  private compact(roots: readonly Int32Array[]): void {
    const count = this.count;
    const nd = this.nd;
    const live = new Uint8Array(count);
    live[0] = 1;
    live[1] = 1;
    for (const arr of roots) for (let i = 0; i < arr.length; i++) if (arr[i]! >= 2) live[arr[i]!] = 1;
    // Parents have larger ids than children: one downward sweep marks everything reachable.
    for (let n = count - 1; n >= 2; n--) {
      if (!live[n]) continue;
      const o = n * NODE_STRIDE;
      live[nd[o + LOW]!] = 1;
      live[nd[o + HIGH]!] = 1;
    }
    const newId = new Int32Array(count);
    newId[1] = 1;
    const buckets = this.buckets;
    buckets.fill(0);
    let next = 2;
    for (let n = 2; n < count; n++) {
      if (!live[n]) continue;
      const o = n * NODE_STRIDE;
      const level = nd[o + LEVEL]!;
      const low = newId[nd[o + LOW]!]!;
      const high = newId[nd[o + HIGH]!]!;
      const d = next * NODE_STRIDE;
      const h = hash3(level, low, high) & this.bucketMask;
      nd[d + LEVEL] = level;
      nd[d + LOW] = low;
      nd[d + HIGH] = high;
      nd[d + NEXT] = buckets[h]!;
      buckets[h] = next;
      newId[n] = next++;
    }
    nd.fill(0, next * NODE_STRIDE, count * NODE_STRIDE);
    this.count = next;
    for (const arr of roots) for (let i = 0; i < arr.length; i++) if (arr[i]! >= 2) arr[i] = newId[arr[i]!]!;
    this.ce.fill(0);
    this.walkCache.clear();
    this.stamp.fill(0);
    this.stampGen = 0;
    this.collections++;
    // The next one when as many nodes again have been made, or half the room left in the budget.
    const liveNodes = next - 2;
    const room = this.maxNodes - liveNodes;
    this.collectAt = Math.max(MIN_NODES_BEFORE_COLLECTION, 2 * liveNodes);
    if (Number.isFinite(room)) this.collectAt = Math.min(this.collectAt, liveNodes + Math.max(1, Math.floor(room / 2)));
  }

  /** One past the largest node id; arrays indexed by node id need this length. */
  get idLimit(): number {
    return this.count;
  }

  arrays(): BddArrays {
    return { nodes: this.nd, order: this.order };
  }

  isConstant(node: number): boolean {
    return node < 2;
  }

  /** Level of a node; the constants report `varCount`. */
  levelOf(node: number): number {
    return this.nd[node * NODE_STRIDE + LEVEL]!;
  }

  /** Variable a node tests (−1 for the constants). */
  varOf(node: number): number {
    return node < 2 ? -1 : this.order[this.nd[node * NODE_STRIDE + LEVEL]!]!;
  }

  low(node: number): number {
    return this.nd[node * NODE_STRIDE + LOW]!;
  }

  high(node: number): number {
    return this.nd[node * NODE_STRIDE + HIGH]!;
  }

  /** The function "variable v is true". */
  variable(v: number): number {
    const l = this.levelOfVar[v];
    if (l === undefined || l < 0) throw new RangeError(`no variable ${v}`);
    return this.make(l, FALSE, TRUE);
  }

  and(a: number, b: number): number {
    return this.apply2(OP_AND, a, b);
  }

  or(a: number, b: number): number {
    return this.apply2(OP_OR, a, b);
  }

  not(a: number): number {
    this.allMonotone = false;
    return this.run(OP_NOT, a, 0, 0);
  }

  /** if f then g else h. */
  ite(f: number, g: number, h: number): number {
    this.allMonotone = false;
    return this.run(OP_ITE, f, g, h);
  }

  /** The cofactor of `node` with variable `v` fixed to `value`. */
  restrict(node: number, v: number, value: boolean): number {
    const l = this.levelOfVar[v];
    if (l === undefined || l < 0) throw new RangeError(`no variable ${v}`);
    return this.run(OP_RESTRICT, node, l, value ? 1 : 0);
  }

  /** AND of many: folded from the deepest operand upward, so each step only rebuilds the upper part. */
  andAll(nodes: readonly number[]): number {
    return this.fold(OP_AND, nodes, TRUE);
  }

  /** OR of many, folded like andAll. */
  orAll(nodes: readonly number[]): number {
    return this.fold(OP_OR, nodes, FALSE);
  }

  /**
   * "At least k of these are true" (k-out-of-n voting), by the threshold recursion over the
   * operands from the deepest up: t[j] = "at least j of xs[i..] are true" = ite(xs[i], t[j−1], t[j]).
   * Each step leaves the previous t[j] as garbage, so while `collecting` it is a safe point.
   */
  atleast(k: number, nodes: readonly number[]): number {
    const n = nodes.length;
    if (k <= 0) return TRUE;
    if (k > n) return FALSE;
    if (k === 1) return this.orAll(nodes);
    if (k === n) return this.andAll(nodes);
    // Operands and the table, both renumbered in place if a collection runs: t[k+1..] = xs.
    const t = new Int32Array(k + 1 + n).fill(FALSE);
    t[0] = TRUE;
    t.set(this.topmostFirst(nodes), k + 1);
    for (let i = n - 1; i >= 0; i--) {
      // ite(x, a, b) with b ≤ a is (x ∧ a) ∨ b: monotone when x, a and b are, so this does not
      // clear everyNodeMonotone. Rows j > n − i stay false ("at least j of fewer than j
      // operands"); rows j < k − i are never needed for t[k] (only i operands remain above), so
      // each is dropped once the last row that reads it is made.
      const lowest = Math.max(1, k - i);
      for (let j = Math.min(k, n - i); j >= lowest; j--) t[j] = this.run(OP_ITE, t[k + 1 + i]!, t[j - 1]!, t[j]!);
      if (lowest > 1) t[lowest - 1] = FALSE;
      this.safePoint(t);
    }
    return t[k]!;
  }

  /**
   * "Exactly j of these are true" for every j = 0..n at once (result[j]). The n+1 functions are
   * disjoint and cover every state, so their probabilities sum to one.
   */
  exactlyAll(nodes: readonly number[]): number[] {
    const n = nodes.length;
    const xs = this.topmostFirst(nodes);
    const e = new Array<number>(n + 1).fill(FALSE);
    e[0] = TRUE;
    for (let i = n - 1; i >= 0; i--) {
      const x = xs[i]!;
      for (let j = n - i; j >= 0; j--) e[j] = this.ite(x, j > 0 ? e[j - 1]! : FALSE, e[j]!);
    }
    return e;
  }

  /**
   * The internal nodes reachable from `roots`, children before parents (a post-order), each once.
   * Every bottom-up or top-down pass over a diagram walks this list. The list is shared: read it,
   * never write to it.
   */
  topological(roots: ArrayLike<number>): Int32Array {
    // One root's list is asked for again and again (probability, cut sets, importance, each
    // further analysis of the same top): the last few are kept until a collection renumbers ids.
    // Nodes never change once made, so what a root reaches cannot change before then.
    if (roots.length === 1) {
      const root = roots[0]!;
      const known = this.walkCache.get(root);
      if (known) return known;
      const list = this.walk(roots);
      if (this.walkCache.size >= WALK_CACHE_ROOTS) this.walkCache.delete(this.walkCache.keys().next().value!);
      this.walkCache.set(root, list);
      return list;
    }
    return this.walk(roots);
  }

  private walk(roots: ArrayLike<number>): Int32Array {
    const gen = this.nextStamp();
    const stamp = this.stamp;
    const nd = this.nd;
    let out: Int32Array<ArrayBuffer> = new Int32Array(1024);
    let outLen = 0;
    let stack: Int32Array<ArrayBuffer> = new Int32Array(1024);
    let sp = 0;
    for (let r = 0; r < roots.length; r++) {
      const root = roots[r]!;
      if (root < 2 || stamp[root] === gen) continue;
      stack[sp++] = root;
      while (sp > 0) {
        const n = stack[--sp]!;
        if (n < 0) {
          if (outLen === out.length) out = grow(out);
          out[outLen++] = ~n;
          continue;
        }
        if (n < 2 || stamp[n] === gen) continue;
        stamp[n] = gen;
        if (sp + 3 > stack.length) stack = grow(stack);
        stack[sp++] = ~n;
        stack[sp++] = nd[n * NODE_STRIDE + HIGH]!;
        stack[sp++] = nd[n * NODE_STRIDE + LOW]!;
      }
    }
    return out.slice(0, outLen);
  }

  /** Internal nodes reachable from the roots. */
  size(roots: number | ArrayLike<number>): number {
    return this.topological(typeof roots === 'number' ? [roots] : roots).length;
  }

  /** Evaluates a node at a full assignment (values[v] for variable v). */
  evaluate(node: number, values: ArrayLike<boolean | number>): boolean {
    let n = node;
    const nd = this.nd;
    while (n >= 2) {
      const o = n * NODE_STRIDE;
      n = values[this.order[nd[o + LEVEL]!]!] ? nd[o + HIGH]! : nd[o + LOW]!;
    }
    return n === TRUE;
  }

  /**
   * Finds or makes the node (level, low, high); the reduction rule low = high returns low. The
   * caller vouches for the ordering (both children below `level`). Any function can be built this
   * way, so the manager stops assuming its nodes are monotone.
   */
  mk(level: number, low: number, high: number): number {
    this.allMonotone = false;
    return this.make(level, low, high);
  }

  /**
   * True while every node made so far is a monotone (coherent) function: only variables, AND, OR,
   * voting, restrict and constants were used. not(), ite(), exactlyAll() and mk() end it, since
   * they can make non-monotone functions. Lets the cut-set search skip the monotone relaxation.
   */
  get everyNodeMonotone(): boolean {
    return this.allMonotone;
  }

  /**
   * The monotone relaxation f⁺(x) = max over y ≤ x of f(y): f with its negative literals dropped.
   * Node by node, f⁺ = ite(x, f⁺(high) ∨ f⁺(low), f⁺(low)), bottom-up over the reachable nodes.
   * It is `root` itself exactly when f is monotone (the diagram is canonical).
   */
  monotoneRelaxation(root: number): number {
    if (this.allMonotone) return root;
    const nodes = this.topological([root]);
    // Indexed by the ids that exist now; the new nodes made below are never looked up.
    const map = new Int32Array(this.count);
    map[TRUE] = TRUE;
    for (let i = 0; i < nodes.length; i++) {
      const n = nodes[i]!;
      const o = n * NODE_STRIDE;
      const lo = map[this.nd[o + LOW]!]!;
      const hi = map[this.nd[o + HIGH]!]!;
      const level = this.nd[o + LEVEL]!;
      map[n] = this.make(level, lo, this.or(hi, lo));
    }
    return map[root]!;
  }

  private make(level: number, low: number, high: number): number {
    if (low === high) return low;
    let h = hash3(level, low, high) & this.bucketMask;
    const nd = this.nd;
    for (let n = this.buckets[h]!; n !== 0; ) {
      const o = n * NODE_STRIDE;
      if (nd[o + LEVEL] === level && nd[o + LOW] === low && nd[o + HIGH] === high) return n;
      n = nd[o + NEXT]!;
    }
    if (this.count - 2 >= this.maxNodes) throw new NodeBudgetExceeded(this.count - 2, this.maxNodes);
    if (this.count === this.capacity) {
      this.grow();
      h = hash3(level, low, high) & this.bucketMask;
    }
    const n = this.count++;
    const o = n * NODE_STRIDE;
    const t = this.nd;
    t[o + LEVEL] = level;
    t[o + LOW] = low;
    t[o + HIGH] = high;
    t[o + NEXT] = this.buckets[h]!;
    this.buckets[h] = n;
    return n;
  }

  private nextStamp(): number {
    if (this.stampGen === 0xffffffff) {
      this.stamp.fill(0);
      this.stampGen = 0;
    }
    return ++this.stampGen;
  }

  private topmostFirst(nodes: readonly number[]): number[] {
    // Stable sort by root level, so ties keep the caller's order (deterministic).
    const idx = nodes.map((_, i) => i);
    const nd = this.nd;
    idx.sort((a, b) => nd[nodes[a]! * NODE_STRIDE]! - nd[nodes[b]! * NODE_STRIDE]! || a - b);
    return idx.map((i) => nodes[i]!);
  }

  private fold(op: number, nodes: readonly number[], unit: number): number {
    // acc in slot 0, the operands after it; both renumbered in place if a collection runs.
    const xs = Int32Array.from([unit, ...this.topmostFirst(nodes)]);
    for (let i = xs.length - 1; i >= 1; i--) {
      xs[0] = this.apply2(op, xs[i]!, xs[0]!);
      if (this.collectingDepth > 0) this.safePoint(xs);
    }
    return xs[0]!;
  }

  private allocateCache(size: number): void {
    const s = nextPowerOfTwo(Math.max(1024, size));
    this.ce = new Int32Array(s * 4);
    this.cMask = s - 1;
  }

  private grow(): void {
    const cap = this.capacity * 2;
    const nd = new Int32Array(cap * NODE_STRIDE);
    nd.set(this.nd);
    this.nd = nd;
    this.buckets = new Int32Array(cap);
    this.bucketMask = cap - 1;
    const stamp = new Uint32Array(cap);
    stamp.set(this.stamp);
    this.stamp = stamp;
    this.capacity = cap;
    for (let n = 2; n < this.count; n++) {
      const o = n * NODE_STRIDE;
      const h = hash3(nd[o + LEVEL]!, nd[o + LOW]!, nd[o + HIGH]!) & this.bucketMask;
      nd[o + NEXT] = this.buckets[h]!;
      this.buckets[h] = n;
    }
    // Cached results stay valid (node ids do not move), but a bigger cache pays off now.
    this.allocateCache(cap / CACHE_RATIO);
  }

  /** Cached result of (op, f, g, h), or −1. */
  private cacheGet(op: number, f: number, g: number, h: number): number {
    const key = (h << 3) | op;
    const o = (hash4(op, f, g, h) & this.cMask) * 4;
    const ce = this.ce;
    return ce[o] === f && ce[o + 1] === g && ce[o + 2] === key ? ce[o + 3]! : -1;
  }

  private cachePut(op: number, f: number, g: number, h: number, r: number): void {
    const o = (hash4(op, f, g, h) & this.cMask) * 4;
    const ce = this.ce;
    ce[o] = f;
    ce[o + 1] = g;
    ce[o + 2] = (h << 3) | op;
    ce[o + 3] = r;
  }

  /**
   * AND / OR, the bulk of every fault-tree build: the same explicit-stack recursion as run(), but
   * a sub-problem that is a terminal case or a cache hit is answered before a frame is pushed, so
   * frames exist only for real work. Frame states: 1 = do low, 2 = do high, 3 = make the node.
   */
  private apply2(op: number, f0: number, g0: number): number {
    // AND: false absorbs, true is neutral. OR: the other way round.
    const absorb = op === OP_AND ? FALSE : TRUE;
    const neutral = 1 - absorb;
    if (f0 === absorb || g0 === absorb) return absorb;
    if (f0 === neutral) return g0;
    if (g0 === neutral || f0 === g0) return f0;
    const fF = this.fF;
    const fG = this.fG;
    const fL = this.fL;
    const fS = this.fS;
    const res = this.res;
    let sp = 0;
    let rp = 0;
    {
      const f = f0 < g0 ? f0 : g0;
      const g = f0 < g0 ? g0 : f0;
      const hit = this.cacheGet(op, f, g, 0);
      if (hit >= 0) return hit;
      const la = this.nd[f * NODE_STRIDE]!;
      const lb = this.nd[g * NODE_STRIDE]!;
      fF[0] = f;
      fG[0] = g;
      fL[0] = la < lb ? la : lb;
      fS[0] = LOW;
      sp = 1;
    }
    while (sp > 0) {
      const t = sp - 1;
      const state = fS[t]!;
      if (state === 3) {
        const r1 = res[--rp]!;
        const r0 = res[--rp]!;
        const r = this.make(fL[t]!, r0, r1);
        this.cachePut(op, fF[t]!, fG[t]!, 0, r);
        res[rp++] = r;
        sp--;
        continue;
      }
      // state is the field to follow: LOW (1) first, then HIGH (2).
      fS[t] = state + 1;
      const nd = this.nd;
      const l = fL[t]!;
      const pf = fF[t]!;
      const pg = fG[t]!;
      const of = pf * NODE_STRIDE;
      const og = pg * NODE_STRIDE;
      let a = nd[of] === l ? nd[of + state]! : pf;
      let b = nd[og] === l ? nd[og + state]! : pg;
      if (a === absorb || b === absorb) {
        res[rp++] = absorb;
        continue;
      }
      if (a === neutral) {
        res[rp++] = b;
        continue;
      }
      if (b === neutral || a === b) {
        res[rp++] = a;
        continue;
      }
      if (a > b) {
        const x = a;
        a = b;
        b = x;
      }
      const hit = this.cacheGet(op, a, b, 0);
      if (hit >= 0) {
        res[rp++] = hit;
        continue;
      }
      const la = nd[a * NODE_STRIDE]!;
      const lb = nd[b * NODE_STRIDE]!;
      fF[sp] = a;
      fG[sp] = b;
      fL[sp] = la < lb ? la : lb;
      fS[sp] = LOW;
      sp++;
    }
    return res[0]!;
  }

  /**
   * The operation engine for ITE, NOT and restrict (AND and OR have apply2): one explicit-stack
   * recursion with the classic terminal cases, a computed cache, and the node made on the way back
   * up. As in apply2, a sub-problem is simplified and looked up in the cache before it gets a
   * frame (`open`), so frames exist only for real work: on voting gates, whose ITE steps are most
   * of a build, that halved the loop's steps. Frame states: 1 = do low, 2 = do high, 3 = make.
   */
  private run(op0: number, f0: number, g0: number, h0: number): number {
    const first = this.open(op0, f0, g0, h0, 0);
    if (first >= 0) return first;
    const fOp = this.fOp;
    const fF = this.fF;
    const fG = this.fG;
    const fH = this.fH;
    const fL = this.fL;
    const fS = this.fS;
    const res = this.res;
    let sp = 1;
    let rp = 0;
    while (sp > 0) {
      const t = sp - 1;
      const state = fS[t]!;
      if (state === 3) {
        const r1 = res[--rp]!;
        const r0 = res[--rp]!;
        const r = this.make(fL[t]!, r0, r1);
        this.cachePut(fOp[t]!, fF[t]!, fG[t]!, fH[t]!, r);
        res[rp++] = r;
        sp--;
        continue;
      }
      // state is the field to follow: LOW (1) first, then HIGH (2).
      fS[t] = state + 1;
      // The node table may be replaced when make() grows it, so read it afresh each step.
      const nd = this.nd;
      const op = fOp[t]!;
      const l = fL[t]!;
      const pf = fF[t]!;
      const of = pf * NODE_STRIDE;
      const f = nd[of] === l ? nd[of + state]! : pf;
      let g = fG[t]!;
      let h = fH[t]!;
      if (op === OP_ITE) {
        const og = g * NODE_STRIDE;
        const oh = h * NODE_STRIDE;
        g = nd[og] === l ? nd[og + state]! : g;
        h = nd[oh] === l ? nd[oh + state]! : h;
      } else if (op === OP_AND || op === OP_OR) {
        const og = g * NODE_STRIDE;
        g = nd[og] === l ? nd[og + state]! : g;
      }
      // NOT and RESTRICT carry g and h through unchanged.
      const r = this.open(op, f, g, h, sp);
      if (r >= 0) res[rp++] = r;
      else sp++;
    }
    return res[0]!;
  }

  /**
   * Simplifies the sub-problem (op, f, g, h) and answers it if it is a terminal case or in the
   * computed cache (returns the node); otherwise writes it as frame `at`, ready for its low
   * cofactor, and returns −1.
   */
  private open(op: number, f: number, g: number, h: number, at: number): number {
    const nd = this.nd;
    // Terminal cases and normalisation; ITE may turn into AND, OR or NOT, hence the loop.
    for (;;) {
      if (op === OP_ITE) {
        if (f === TRUE) return g;
        if (f === FALSE) return h;
        if (g === h) return g;
        if (g === TRUE && h === FALSE) return f;
        if (g === FALSE && h === TRUE) {
          op = OP_NOT;
          g = 0;
          h = 0;
          continue;
        }
        if (g === TRUE || f === g) {
          op = OP_OR;
          g = h;
          h = 0;
          continue;
        }
        if (h === FALSE || f === h) {
          op = OP_AND;
          h = 0;
          continue;
        }
      } else if (op === OP_AND) {
        if (f === FALSE || g === FALSE) return FALSE;
        if (f === TRUE) return g;
        if (g === TRUE || f === g) return f;
        if (f > g) {
          const x = f;
          f = g;
          g = x;
        }
      } else if (op === OP_OR) {
        if (f === TRUE || g === TRUE) return TRUE;
        if (f === FALSE) return g;
        if (g === FALSE || f === g) return f;
        if (f > g) {
          const x = f;
          f = g;
          g = x;
        }
      } else if (op === OP_NOT) {
        if (f < 2) return 1 - f;
      } else {
        // OP_RESTRICT: g = the level fixed, h = its value.
        const lf = nd[f * NODE_STRIDE + LEVEL]!;
        if (lf > g) return f;
        if (lf === g) return nd[f * NODE_STRIDE + (h ? HIGH : LOW)]!;
      }
      break;
    }
    const hit = this.cacheGet(op, f, g, h);
    if (hit >= 0) return hit;
    let l = nd[f * NODE_STRIDE]!;
    if (op === OP_AND || op === OP_OR) {
      const lg = nd[g * NODE_STRIDE]!;
      if (lg < l) l = lg;
    } else if (op === OP_ITE) {
      const lg = nd[g * NODE_STRIDE]!;
      const lh = nd[h * NODE_STRIDE]!;
      if (lg < l) l = lg;
      if (lh < l) l = lh;
    }
    this.fOp[at] = op;
    this.fF[at] = f;
    this.fG[at] = g;
    this.fH[at] = h;
    this.fL[at] = l;
    this.fS[at] = LOW;
    return -1;
  }
}

function hash3(a: number, b: number, c: number): number {
  let h = Math.imul(a, 0x9e3779b1) ^ Math.imul(b, 0x85ebca77) ^ Math.imul(c, 0xc2b2ae3d);
  h ^= h >>> 15;
  h = Math.imul(h, 0x27d4eb2f);
  return (h ^ (h >>> 13)) >>> 0;
}

function hash4(op: number, a: number, b: number, c: number): number {
  let h = Math.imul(a, 0x9e3779b1) ^ Math.imul(b, 0x85ebca77) ^ Math.imul(c, 0xc2b2ae3d) ^ Math.imul(op, 0x165667b1);
  h ^= h >>> 15;
  h = Math.imul(h, 0x27d4eb2f);
  return (h ^ (h >>> 13)) >>> 0;
}

function grow(a: Int32Array): Int32Array<ArrayBuffer> {
  const b = new Int32Array(a.length * 2);
  b.set(a);
  return b;
}
