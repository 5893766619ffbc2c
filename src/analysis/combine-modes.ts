/**
 * Combining the failure modes of one dam that share a load (overtopping after gate failure,
 * internal erosion, a spillway structure, … all driven by the same flood), following the practice
 * discussed by R. Hill, D. Bowles, P. Jordan and R. Nathan, "Estimating overall risk of dam failure:
 * practical considerations in combining failure probabilities", ANCOLD Bulletin, 2003. Which parts
 * are used, and how they are stated here (the paper is cited from memory; each formula below is
 * stated precisely and derived, not copied):
 *
 * (All references in this comment are from memory.)
 *  1. The combination is made within each load range, where the modes' probabilities are
 *     conditional on the same load, and only then weighted by the range's annual probability.
 *     Combining annual totals would treat modes as independent across floods, which they are not.
 *  2. The plain sum Σ P_i (Boole's upper bound on the union; exact only for mutually exclusive modes).
 *  3. The uni-modal bounds  max_i P_i ≤ P(any mode) ≤ 1 − Π_i (1 − P_i)  (C. A. Cornell 1967; A. H.-S. Ang &
 *     W. H. Tang). The lower bound always holds; the upper bound holds when the modes are independent
 *     or positively dependent given the load (associated, e.g. increasing functions of shared
 *     independent causes — Esary, Proschan & Walkup 1967), which is the usual case for modes of one
 *     dam under one flood. It is exact for independent modes.
 *  4. The common-cause adjustment: the modes are taken as independent given the load, and each
 *     combination of modes that would occur together is shared equally among them, so that
 *       P_i* = P_i · Σ_{c=0}^{n−1} P(exactly c of the other modes occur) / (c + 1),
 *     which for two modes is P_A(1 − P_B/2) and for three P_A(1 − (P_B + P_C)/2 + P_B·P_C/3). The
 *     adjusted P_i* add up to 1 − Π(1 − P_i), the upper uni-modal bound, so the total is not
 *     double counted while each mode keeps its share for ranking and for consequence estimates.
 * Not implemented: any weighting of modes by which would occur first, and the paper's discussion
 * of dependence between modes beyond the shared load.
 */
import type { FailureModeSet } from '../study/types.js';

/** Sum, uni-modal lower and upper bound of the probability that at least one mode occurs. */
export function uniModalBounds(p: readonly number[]): { sum: number; lower: number; upper: number } {
  const out = new Float64Array(3);
  unionBounds(p, 0, 1, p.length, out, 0);
  return { sum: out[0]!, lower: out[1]!, upper: out[2]! };
}

/**
 * uniModalBounds on n values p[offset + i·stride], into out[at], out[at + 1], out[at + 2] (sum,
 * lower, upper): the one implementation, allocation-free for the Monte Carlo.
 */
function unionBounds(p: ArrayLike<number>, offset: number, stride: number, n: number, out: Float64Array, at: number): void {
  let sum = 0;
  let lower = 0;
  let logSurvive = 0;
  for (let i = 0; i < n; i++) {
    const x = p[offset + i * stride]!;
    sum += x;
    lower = Math.max(lower, x);
    logSurvive += Math.log1p(-x);
  }
  out[at] = sum;
  out[at + 1] = lower;
  // 1 − Π(1 − P_i) through log1p/expm1: accurate when every P_i is tiny.
  out[at + 2] = n === 0 ? 0 : -Math.expm1(logSurvive);
}

/** The common-cause adjustment (item 4 above): each mode's share of the union under independence. */
export function commonCauseAdjustment(p: readonly number[]): number[] {
  const n = p.length;
  const out = new Float64Array(n);
  shareOfUnion(p, 0, 1, n, new Float64Array(n), out, 0, 1);
  return Array.from(out);
}

/**
 * commonCauseAdjustment on n values p[offset + i·stride], into out[at + i·outStride]; `dist` is
 * working room of length ≥ n. dist is the Poisson-binomial of the other modes (poissonBinomial's
 * recursion, on one reused array).
 */
function shareOfUnion(p: ArrayLike<number>, offset: number, stride: number, n: number, dist: Float64Array, out: Float64Array, at: number, outStride: number): void {
  for (let i = 0; i < n; i++) {
    dist[0] = 1;
    for (let j = 1; j < n; j++) dist[j] = 0;
    let m = 0;
    for (let k = 0; k < n; k++) {
      if (k === i) continue;
      const q = p[offset + k * stride]!;
      for (let j = m + 1; j >= 1; j--) dist[j] = dist[j]! * (1 - q) + dist[j - 1]! * q;
      dist[0] = dist[0]! * (1 - q);
      m += 1;
    }
    let share = 0;
    for (let c = 0; c < n; c++) share += dist[c]! / (c + 1);
    out[at + i * outStride] = p[offset + i * stride]! * share;
  }
}

/** The numbers of one set of failure modes at one set of values. */
export interface ModeNumbers {
  /** [mode][range]: P(mode | range), and after the common-cause adjustment. */
  conditional: number[][];
  adjusted: number[][];
  /** [mode]: Σ_r P(r)·P(mode | r), before and after the adjustment. */
  annual: number[];
  adjustedAnnual: number[];
  byRange: { sum: number; lower: number; upper: number }[];
  total: { sum: number; lower: number; upper: number };
}

/**
 * A set of modes prepared for repeated evaluation: where each mode's number in each range comes
 * from, as indices, so an evaluation reads arrays only (no key lookup, no allocation).
 */
export interface ModePlan {
  modes: number;
  ranges: number;
  /**
   * source[i·R + r] for mode i in range r: ≥ 0, the slot of its probability among the values;
   * < 0, −1 − the index of the tree outcome it is read from.
   */
  source: Int32Array;
  /** The values it reads: slot and parameter key. */
  reads: { slot: number; key: string }[];
}

/**
 * The plan of one set: `slotOf(key)` places a parameter among the values, `outcomeOf(id)` is the
 * index of a tree outcome in the outcome-by-range table the evaluation is given.
 */
export function modePlan(set: FailureModeSet, ranges: number, slotOf: (key: string) => number, outcomeOf: (id: string) => number): ModePlan {
  const R = ranges;
  const source = new Int32Array(set.modes.length * R);
  const reads = new Map<number, string>();
  const slot = (key: string): number => {
    const s = slotOf(key);
    reads.set(s, key);
    return s;
  };
  set.modes.forEach((mode, i) => {
    const b = mode.basis;
    for (let r = 0; r < R; r++) {
      source[i * R + r] = b.kind === 'probability' ? slot(b.key) : b.kind === 'by-range' ? slot(b.keys[r]!) : -1 - outcomeOf(b.outcome);
    }
  });
  return { modes: set.modes.length, ranges: R, source, reads: [...reads].map(([s, key]) => ({ slot: s, key })) };
}

/** Working arrays of one plan's evaluation, made once and reused (layouts [mode·R + range], [range], [mode]). */
export class ModeWork {
  readonly conditional: Float64Array;
  readonly adjusted: Float64Array;
  /** Per range: sum, lower, upper at 3·r. */
  readonly byRange: Float64Array;
  readonly annual: Float64Array;
  readonly adjustedAnnual: Float64Array;
  /** sum, lower, upper. */
  readonly total = new Float64Array(3);
  readonly dist: Float64Array;

  constructor(plan: ModePlan) {
    const n = plan.modes;
    const R = plan.ranges;
    this.conditional = new Float64Array(n * R);
    this.adjusted = new Float64Array(n * R);
    this.byRange = new Float64Array(3 * R);
    this.annual = new Float64Array(n);
    this.adjustedAnnual = new Float64Array(n);
    this.dist = new Float64Array(Math.max(1, n));
  }
}

/**
 * The combination of one set of modes (the formulas above, in a fixed order) into `w`: the load
 * ranges' probabilities `rangeP[r]`, each tree outcome's annual probability per range
 * `outcomeByRange[o·R + r]`, and the values of the modes' own numbers at `values[offset + slot]`.
 * The base case (`modeNumbers`) and every Monte Carlo trial compute through this.
 */
export function combineModesInto(plan: ModePlan, rangeP: ArrayLike<number>, outcomeByRange: ArrayLike<number>, values: ArrayLike<number>, offset: number, w: ModeWork): void {
  const R = plan.ranges;
  const n = plan.modes;
  const source = plan.source;
  const conditional = w.conditional;
  for (let i = 0; i < n; i++) {
    for (let r = 0; r < R; r++) {
      const src = source[i * R + r]!;
      // P(outcome | range): the outcome's annual probability in the range over the range's.
      conditional[i * R + r] = src >= 0 ? values[offset + src]! : rangeP[r]! > 0 ? outcomeByRange[(-1 - src) * R + r]! / rangeP[r]! : 0;
    }
  }
  for (let r = 0; r < R; r++) {
    unionBounds(conditional, r, R, n, w.byRange, 3 * r);
    shareOfUnion(conditional, r, R, n, w.dist, w.adjusted, r, R);
  }
  for (let i = 0; i < n; i++) {
    w.annual[i] = annualOf(rangeP, conditional, i * R, 1, R);
    w.adjustedAnnual[i] = annualOf(rangeP, w.adjusted, i * R, 1, R);
  }
  for (let k = 0; k < 3; k++) w.total[k] = annualOf(rangeP, w.byRange, k, 3, R);
}

/** Σ_r P(r)·x_r over xs[at + r·stride], summed in range order. */
function annualOf(rangeP: ArrayLike<number>, xs: ArrayLike<number>, at: number, stride: number, R: number): number {
  let s = 0;
  for (let r = 0; r < R; r++) s += rangeP[r]! * xs[at + r * stride]!;
  return s;
}

/**
 * The combination of one set of modes: the load ranges' probabilities `rangeP`, each outcome's
 * annual probability per range (`outcomeByRange(id)`, from the event tree) and the values of the
 * modes' own numbers (`combineModesInto`, prepared for this one evaluation).
 */
export function modeNumbers(
  set: FailureModeSet,
  rangeP: readonly number[],
  outcomeByRange: (outcome: string) => readonly number[],
  value: (key: string) => number,
): ModeNumbers {
  const R = rangeP.length;
  const keys: string[] = [];
  const outcomes: string[] = [];
  const indexIn = (list: string[], id: string): number => {
    const k = list.indexOf(id);
    return k >= 0 ? k : list.push(id) - 1;
  };
  const plan = modePlan(set, R, (key) => indexIn(keys, key), (id) => indexIn(outcomes, id));
  const values = Float64Array.from(keys, value);
  const table = new Float64Array(outcomes.length * R);
  outcomes.forEach((id, o) => table.set(outcomeByRange(id).slice(0, R), o * R));
  const w = new ModeWork(plan);
  combineModesInto(plan, rangeP, table, values, 0, w);
  const n = plan.modes;
  const rows = (xs: Float64Array) => Array.from({ length: n }, (_, i) => Array.from(xs.subarray(i * R, (i + 1) * R)));
  const bounds = (at: number) => ({ sum: w.byRange[at]!, lower: w.byRange[at + 1]!, upper: w.byRange[at + 2]! });
  return {
    conditional: rows(w.conditional),
    adjusted: rows(w.adjusted),
    annual: Array.from(w.annual),
    adjustedAnnual: Array.from(w.adjustedAnnual),
    byRange: Array.from({ length: R }, (_, r) => bounds(3 * r)),
    total: { sum: w.total[0]!, lower: w.total[1]!, upper: w.total[2]! },
  };
}
