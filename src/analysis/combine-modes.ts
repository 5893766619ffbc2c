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
  let sum = 0;
  let lower = 0;
  let logSurvive = 0;
  for (const x of p) {
    sum += x;
    lower = Math.max(lower, x);
    logSurvive += Math.log1p(-x);
  }
  // 1 − Π(1 − P_i) through log1p/expm1: accurate when every P_i is tiny.
  return { sum, lower, upper: p.length === 0 ? 0 : -Math.expm1(logSurvive) };
}

/** The common-cause adjustment (item 4 above): each mode's share of the union under independence. */
export function commonCauseAdjustment(p: readonly number[]): number[] {
  const n = p.length;
  // dist = the Poisson-binomial of the other modes (poissonBinomial's recursion, on one reused array).
  const dist = new Array<number>(n).fill(0);
  return p.map((pi, i) => {
    dist.fill(0);
    dist[0] = 1;
    let m = 0;
    for (let k = 0; k < n; k++) {
      if (k === i) continue;
      const q = p[k]!;
      for (let j = m + 1; j >= 1; j--) dist[j] = dist[j]! * (1 - q) + dist[j - 1]! * q;
      dist[0] = dist[0]! * (1 - q);
      m += 1;
    }
    let share = 0;
    for (let c = 0; c < n; c++) share += dist[c]! / (c + 1);
    return pi * share;
  });
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
 * The combination of one set of modes: the load ranges' probabilities `rangeP`, each outcome's
 * annual probability per range (`outcomeByRange(id)`, from the event tree) and the values of the
 * modes' own numbers. The base case and every Monte Carlo trial compute through this.
 */
export function modeNumbers(
  set: FailureModeSet,
  rangeP: readonly number[],
  outcomeByRange: (outcome: string) => readonly number[],
  value: (key: string) => number,
): ModeNumbers {
  // Plain loops (this runs in every Monte Carlo trial); the arithmetic is the formulas above, in a fixed order.
  const R = rangeP.length;
  const n = set.modes.length;
  const conditional: number[][] = [];
  for (const mode of set.modes) {
    const b = mode.basis;
    const c = new Array<number>(R);
    if (b.kind === 'probability') for (let r = 0; r < R; r++) c[r] = value(b.key);
    else if (b.kind === 'by-range') for (let r = 0; r < R; r++) c[r] = value(b.keys[r]!);
    else {
      // P(outcome | range): the outcome's annual probability in the range over the range's.
      const o = outcomeByRange(b.outcome);
      for (let r = 0; r < R; r++) c[r] = rangeP[r]! > 0 ? o[r]! / rangeP[r]! : 0;
    }
    conditional.push(c);
  }
  const byRange: { sum: number; lower: number; upper: number }[] = [];
  const adjusted: number[][] = conditional.map(() => new Array<number>(R));
  const perRange = new Array<number>(n);
  for (let r = 0; r < R; r++) {
    for (let i = 0; i < n; i++) perRange[i] = conditional[i]![r]!;
    byRange.push(uniModalBounds(perRange));
    const a = commonCauseAdjustment(perRange);
    for (let i = 0; i < n; i++) adjusted[i]![r] = a[i]!;
  }
  const annualOf = (xs: readonly number[]): number => {
    let s = 0;
    for (let r = 0; r < R; r++) s += rangeP[r]! * xs[r]!;
    return s;
  };
  const sums = new Array<number>(R);
  const lowers = new Array<number>(R);
  const uppers = new Array<number>(R);
  for (let r = 0; r < R; r++) {
    sums[r] = byRange[r]!.sum;
    lowers[r] = byRange[r]!.lower;
    uppers[r] = byRange[r]!.upper;
  }
  return {
    conditional,
    adjusted,
    annual: conditional.map(annualOf),
    adjustedAnnual: adjusted.map(annualOf),
    byRange,
    total: { sum: annualOf(sums), lower: annualOf(lowers), upper: annualOf(uppers) },
  };
}
