/**
 * A reduced ordered binary decision diagram (ROBDD) manager.
 *
 * Design choices, and why:
 * - Nodes are small integers; a node's level, low (variable = 0) and high (variable = 1) children
 *   live in parallel Int32Arrays. Node 0 is the constant false, node 1 the constant true. A node is
 *   always made after its children, so a child's id is smaller than its parent's: ascending ids are
 *   a bottom-up (topological) order, which the quantification passes rely on.
 * - No complement edges. They would halve some diagrams, but every probability pass would then need
 *   1 − P on complemented edges; without them the probability recursion p·P(high) + (1−p)·P(low)
 *   only ever adds non-negative terms, so nothing cancels however small or close to 1 the numbers
 *   are. Negation costs one cached pass over its operand instead.
 * - A unique table (hash chains through `next`) keeps the diagram reduced and canonical: two nodes
 *   with equal (level, low, high) are the same node, so equal functions have equal ids.
 * - One operation engine (AND, OR, ITE, NOT, restrict) with a lossy, direct-mapped computed cache,
 *   run with explicit stacks instead of recursion: a path can be as long as there are variables
 *   (tens of thousands), which would overflow the JavaScript call stack.
 * - No garbage collection and no dynamic reordering: a fault tree keeps the diagram of every gate
 *   anyway, and the order is chosen up front (see order.ts). `maxNodes` bounds the memory instead.
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
}

/** Direct read access to the node arrays, for tight quantification loops. Invalid after the manager grows. */
export interface BddArrays {
  readonly level: Int32Array;
  readonly low: Int32Array;
  readonly high: Int32Array;
  /** order[level] = variable index; the constants sit at level `order.length`. */
  readonly order: Int32Array;
}

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
  /** Internal-node budget (Infinity when unbounded). */
  readonly maxNodes: number;

  private lvl: Int32Array;
  private lo: Int32Array;
  private hi: Int32Array;
  private next: Int32Array;
  private buckets: Int32Array;
  private bucketMask: number;
  private capacity: number;
  private count = 2;

  private cOp!: Int32Array;
  private cF!: Int32Array;
  private cG!: Int32Array;
  private cH!: Int32Array;
  private cR!: Int32Array;
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
    this.maxNodes = budget;

    const cap = nextPowerOfTwo(Math.max(1024, options.initialCapacity ?? 1 << 14));
    this.capacity = cap;
    this.lvl = new Int32Array(cap);
    this.lo = new Int32Array(cap);
    this.hi = new Int32Array(cap);
    this.next = new Int32Array(cap);
    this.buckets = new Int32Array(cap);
    this.bucketMask = cap - 1;
    this.stamp = new Uint32Array(cap);
    // The two constants sit below every variable.
    this.lvl[0] = n;
    this.lvl[1] = n;
    this.lo[1] = 1;
    this.hi[1] = 1;
    this.allocateCache(cap);

    const depth = n + 2;
    this.fOp = new Int32Array(depth);
    this.fF = new Int32Array(depth);
    this.fG = new Int32Array(depth);
    this.fH = new Int32Array(depth);
    this.fL = new Int32Array(depth);
    this.fS = new Int32Array(depth);
    this.res = new Int32Array(2 * depth + 2);
  }

  /** Internal nodes made so far (constants excluded), including any no root uses any more. */
  get nodeCount(): number {
    return this.count - 2;
  }

  /** One past the largest node id; arrays indexed by node id need this length. */
  get idLimit(): number {
    return this.count;
  }

  arrays(): BddArrays {
    return { level: this.lvl, low: this.lo, high: this.hi, order: this.order };
  }

  isConstant(node: number): boolean {
    return node < 2;
  }

  /** Level of a node; the constants report `varCount`. */
  levelOf(node: number): number {
    return this.lvl[node]!;
  }

  /** Variable a node tests (−1 for the constants). */
  varOf(node: number): number {
    return node < 2 ? -1 : this.order[this.lvl[node]!]!;
  }

  low(node: number): number {
    return this.lo[node]!;
  }

  high(node: number): number {
    return this.hi[node]!;
  }

  /** The function "variable v is true". */
  variable(v: number): number {
    const l = this.levelOfVar[v];
    if (l === undefined || l < 0) throw new RangeError(`no variable ${v}`);
    return this.mk(l, FALSE, TRUE);
  }

  and(a: number, b: number): number {
    return this.apply2(OP_AND, a, b);
  }

  or(a: number, b: number): number {
    return this.apply2(OP_OR, a, b);
  }

  not(a: number): number {
    return this.run(OP_NOT, a, 0, 0);
  }

  /** if f then g else h. */
  ite(f: number, g: number, h: number): number {
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

  /** "At least k of these are true" (k-out-of-n voting), by the usual threshold recursion. */
  atleast(k: number, nodes: readonly number[]): number {
    const n = nodes.length;
    if (k <= 0) return TRUE;
    if (k > n) return FALSE;
    if (k === 1) return this.orAll(nodes);
    if (k === n) return this.andAll(nodes);
    const xs = this.topmostFirst(nodes);
    // t[j] = "at least j of xs[i..] are true", built from the deepest operand up.
    const t = new Array<number>(k + 1).fill(FALSE);
    t[0] = TRUE;
    for (let i = n - 1; i >= 0; i--) {
      const x = xs[i]!;
      for (let j = k; j >= 1; j--) t[j] = this.ite(x, t[j - 1]!, t[j]!);
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
   * Every bottom-up or top-down pass over a diagram walks this list.
   */
  topological(roots: ArrayLike<number>): Int32Array {
    const gen = this.nextStamp();
    const stamp = this.stamp;
    const lo = this.lo;
    const hi = this.hi;
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
        stack[sp++] = hi[n]!;
        stack[sp++] = lo[n]!;
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
    while (n >= 2) n = values[this.order[this.lvl[n]!]!] ? this.hi[n]! : this.lo[n]!;
    return n === TRUE;
  }

  /** Finds or makes the node (level, low, high); the reduction rule low = high returns low. */
  mk(level: number, low: number, high: number): number {
    if (low === high) return low;
    let h = hash3(level, low, high) & this.bucketMask;
    const lv = this.lvl;
    const lo = this.lo;
    const hi = this.hi;
    const nx = this.next;
    for (let n = this.buckets[h]!; n !== 0; n = nx[n]!) {
      if (lv[n] === level && lo[n] === low && hi[n] === high) return n;
    }
    if (this.count - 2 >= this.maxNodes) throw new NodeBudgetExceeded(this.count - 2, this.maxNodes);
    if (this.count === this.capacity) {
      this.grow();
      h = hash3(level, low, high) & this.bucketMask;
    }
    const n = this.count++;
    this.lvl[n] = level;
    this.lo[n] = low;
    this.hi[n] = high;
    this.next[n] = this.buckets[h]!;
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
    idx.sort((a, b) => this.lvl[nodes[a]!]! - this.lvl[nodes[b]!]! || a - b);
    return idx.map((i) => nodes[i]!);
  }

  private fold(op: number, nodes: readonly number[], unit: number): number {
    const xs = this.topmostFirst(nodes);
    let acc = unit;
    for (let i = xs.length - 1; i >= 0; i--) acc = this.apply2(op, xs[i]!, acc);
    return acc;
  }

  private allocateCache(size: number): void {
    const s = nextPowerOfTwo(size);
    this.cOp = new Int32Array(s);
    this.cF = new Int32Array(s);
    this.cG = new Int32Array(s);
    this.cH = new Int32Array(s);
    this.cR = new Int32Array(s);
    this.cMask = s - 1;
  }

  private grow(): void {
    const cap = this.capacity * 2;
    const copy = (a: Int32Array): Int32Array => {
      const b = new Int32Array(cap);
      b.set(a);
      return b;
    };
    this.lvl = copy(this.lvl);
    this.lo = copy(this.lo);
    this.hi = copy(this.hi);
    this.next = new Int32Array(cap);
    this.buckets = new Int32Array(cap);
    this.bucketMask = cap - 1;
    const stamp = new Uint32Array(cap);
    stamp.set(this.stamp);
    this.stamp = stamp;
    this.capacity = cap;
    for (let n = 2; n < this.count; n++) {
      const h = hash3(this.lvl[n]!, this.lo[n]!, this.hi[n]!) & this.bucketMask;
      this.next[n] = this.buckets[h]!;
      this.buckets[h] = n;
    }
    // The cache keeps its entries' meaning (node ids do not move), but a bigger one pays off now.
    this.allocateCache(cap);
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
      const slot = hash4(op, f, g, 0) & this.cMask;
      if (this.cOp[slot] === op && this.cF[slot] === f && this.cG[slot] === g && this.cH[slot] === 0) return this.cR[slot]!;
      const la = this.lvl[f]!;
      const lb = this.lvl[g]!;
      fF[0] = f;
      fG[0] = g;
      fL[0] = la < lb ? la : lb;
      fS[0] = 1;
      sp = 1;
    }
    while (sp > 0) {
      const t = sp - 1;
      const state = fS[t]!;
      if (state === 3) {
        const r1 = res[--rp]!;
        const r0 = res[--rp]!;
        const r = this.mk(fL[t]!, r0, r1);
        const f = fF[t]!;
        const g = fG[t]!;
        const slot = hash4(op, f, g, 0) & this.cMask;
        this.cOp[slot] = op;
        this.cF[slot] = f;
        this.cG[slot] = g;
        this.cH[slot] = 0;
        this.cR[slot] = r;
        res[rp++] = r;
        sp--;
        continue;
      }
      fS[t] = state + 1;
      const lvl = this.lvl;
      const child = state === 1 ? this.lo : this.hi;
      const l = fL[t]!;
      const pf = fF[t]!;
      const pg = fG[t]!;
      let a = lvl[pf] === l ? child[pf]! : pf;
      let b = lvl[pg] === l ? child[pg]! : pg;
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
      const slot = hash4(op, a, b, 0) & this.cMask;
      if (this.cOp[slot] === op && this.cF[slot] === a && this.cG[slot] === b && this.cH[slot] === 0) {
        res[rp++] = this.cR[slot]!;
        continue;
      }
      const la = lvl[a]!;
      const lb = lvl[b]!;
      fF[sp] = a;
      fG[sp] = b;
      fL[sp] = la < lb ? la : lb;
      fS[sp] = 1;
      sp++;
    }
    return res[0]!;
  }

  /**
   * The operation engine: one explicit-stack recursion for every operation, with the classic
   * terminal cases, a computed cache, and the node made on the way back up.
   * Frame states: 0 = fresh, 1 = low cofactor done, 2 = both cofactors done.
   */
  private run(op0: number, f0: number, g0: number, h0: number): number {
    const fOp = this.fOp;
    const fF = this.fF;
    const fG = this.fG;
    const fH = this.fH;
    const fL = this.fL;
    const fS = this.fS;
    const res = this.res;
    let sp = 0;
    let rp = 0;
    fOp[0] = op0;
    fF[0] = f0;
    fG[0] = g0;
    fH[0] = h0;
    fS[0] = 0;
    sp = 1;
    while (sp > 0) {
      const t = sp - 1;
      const state = fS[t]!;
      // The node arrays may be replaced by mk() growing them, so read them afresh each step.
      const lvl = this.lvl;
      const lo = this.lo;
      const hi = this.hi;
      if (state === 0) {
        let op = fOp[t]!;
        let f = fF[t]!;
        let g = fG[t]!;
        let h = fH[t]!;
        let r = -1;
        // Terminal cases and normalisation; ITE may turn into AND, OR or NOT, hence the loop.
        for (;;) {
          if (op === OP_AND) {
            if (f === FALSE || g === FALSE) r = FALSE;
            else if (f === TRUE) r = g;
            else if (g === TRUE || f === g) r = f;
            else if (f > g) {
              const s = f;
              f = g;
              g = s;
            }
            h = 0;
          } else if (op === OP_OR) {
            if (f === TRUE || g === TRUE) r = TRUE;
            else if (f === FALSE) r = g;
            else if (g === FALSE || f === g) r = f;
            else if (f > g) {
              const s = f;
              f = g;
              g = s;
            }
            h = 0;
          } else if (op === OP_ITE) {
            if (f === TRUE) r = g;
            else if (f === FALSE) r = h;
            else if (g === h) r = g;
            else if (g === TRUE && h === FALSE) r = f;
            else if (g === FALSE && h === TRUE) {
              op = OP_NOT;
              g = 0;
              h = 0;
              continue;
            } else if (g === TRUE || f === g) {
              op = OP_OR;
              g = h;
              continue;
            } else if (h === FALSE || f === h) {
              op = OP_AND;
              continue;
            }
          } else if (op === OP_NOT) {
            if (f < 2) r = 1 - f;
          } else {
            // OP_RESTRICT: g = level fixed, h = value.
            const lf = lvl[f]!;
            if (lf > g) r = f;
            else if (lf === g) r = h ? hi[f]! : lo[f]!;
          }
          break;
        }
        if (r >= 0) {
          res[rp++] = r;
          sp--;
          continue;
        }
        const slot = hash4(op, f, g, h) & this.cMask;
        if (this.cOp[slot] === op && this.cF[slot] === f && this.cG[slot] === g && this.cH[slot] === h) {
          res[rp++] = this.cR[slot]!;
          sp--;
          continue;
        }
        let l = lvl[f]!;
        if (op === OP_AND || op === OP_OR) {
          const lg = lvl[g]!;
          if (lg < l) l = lg;
        } else if (op === OP_ITE) {
          const lg = lvl[g]!;
          const lh = lvl[h]!;
          if (lg < l) l = lg;
          if (lh < l) l = lh;
        }
        fOp[t] = op;
        fF[t] = f;
        fG[t] = g;
        fH[t] = h;
        fL[t] = l;
        fS[t] = 1;
        // Push the low cofactors.
        fOp[sp] = op;
        fF[sp] = lvl[f] === l ? lo[f]! : f;
        if (op === OP_AND || op === OP_OR) {
          fG[sp] = lvl[g] === l ? lo[g]! : g;
          fH[sp] = 0;
        } else if (op === OP_ITE) {
          fG[sp] = lvl[g] === l ? lo[g]! : g;
          fH[sp] = lvl[h] === l ? lo[h]! : h;
        } else {
          fG[sp] = g;
          fH[sp] = h;
        }
        fS[sp] = 0;
        sp++;
      } else if (state === 1) {
        fS[t] = 2;
        const op = fOp[t]!;
        const f = fF[t]!;
        const g = fG[t]!;
        const h = fH[t]!;
        const l = fL[t]!;
        fOp[sp] = op;
        fF[sp] = lvl[f] === l ? hi[f]! : f;
        if (op === OP_AND || op === OP_OR) {
          fG[sp] = lvl[g] === l ? hi[g]! : g;
          fH[sp] = 0;
        } else if (op === OP_ITE) {
          fG[sp] = lvl[g] === l ? hi[g]! : g;
          fH[sp] = lvl[h] === l ? hi[h]! : h;
        } else {
          fG[sp] = g;
          fH[sp] = h;
        }
        fS[sp] = 0;
        sp++;
      } else {
        const r1 = res[--rp]!;
        const r0 = res[--rp]!;
        const r = this.mk(fL[t]!, r0, r1);
        const op = fOp[t]!;
        const f = fF[t]!;
        const g = fG[t]!;
        const h = fH[t]!;
        const slot = hash4(op, f, g, h) & this.cMask;
        this.cOp[slot] = op;
        this.cF[slot] = f;
        this.cG[slot] = g;
        this.cH[slot] = h;
        this.cR[slot] = r;
        res[rp++] = r;
        sp--;
      }
    }
    return res[0]!;
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
