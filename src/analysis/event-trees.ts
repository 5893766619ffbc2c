/**
 * Load-range event trees. For each range of the initiating load and each sequence, the sequence is
 * one Boolean expression — the AND of its failed headings' conditions and the negations of its
 * working ones — quantified exactly on the decision diagram, not a product of branch numbers. A
 * basic event that several headings share (station power under two gate headings, the same gates
 * counted with two thresholds) is then conditioned correctly: P(B fails | A failed) comes out of
 * the diagram rather than being taken as P(B fails).
 *
 * Headings with a fixed or per-range probability are not logic: they are independent of every
 * basic event by definition, so they enter as a factor p or 1 − p. A sequence's probability in a
 * range is then  P(range) × Π(factors) × P(AND of its logic conditions).
 *
 * Because the sequences of a tree partition every combination of branch states (the study reader
 * checks the tree), the outcomes of a range add up to the range's probability.
 */
import { ProbabilityEvaluator, probability, type CompiledLogic } from '../logic/index.js';
import type { BranchCondition, EventTree, Study } from '../study/types.js';
import { logicNode } from './logic-node.js';
import type { LogicModel } from './logic-model.js';
import type { EventTreeResult } from './results.js';

type Value = (key: string) => number;

/** A heading's failure branch in one range: a diagram node (logic) or a plain probability. */
type Branch = { node: number } | { q: number };

/**
 * How to compute a tree's sequences and outcomes from the probabilities of its logic (one diagram
 * root per sequence and range) and the values of its numbers: the recipe holds no probability, so
 * the base case and every Monte Carlo trial compute with the same code (`treeNumbersInto`).
 */
export interface TreeRecipe {
  tree: EventTree;
  /** cells[i·R + r]: sequence i in range r — the index of its logic root, and its plain branch factors in heading order. */
  cells: { root: number; factors: { key: string; fails: boolean }[] }[];
  /** Outcome index of each sequence, and of each outcome id. */
  outcomeOf: number[];
  outcomeIndex: Map<string, number>;
  /** The same, as arrays of indices (slots = indices of study.parameters). */
  plan: TreePlan;
}

/** A tree's computation as indices only, for evaluating it many times without lookups or allocation. */
export interface TreePlan {
  ranges: number;
  sequences: number;
  outcomes: number;
  /** Per range r: the slots of its AEP pair at 2r, 2r + 1 (upper, lower), or of its frequency and −1. */
  rangeSlots: Int32Array;
  /** Per cell (i·R + r): its logic root, and the span [factorStart[cell], factorStart[cell + 1]) of its factors. */
  cellRoot: Int32Array;
  factorStart: Int32Array;
  factorSlot: Int32Array;
  /** 1 when the factor is the heading's failure (q), 0 when it works (1 − q). */
  factorFails: Uint8Array;
  outcomeOf: Int32Array;
  /** Per outcome o: its sequences, in sequence order, at [outcomeStart[o], outcomeStart[o + 1]) of outcomeSequences. */
  outcomeStart: Int32Array;
  outcomeSequences: Int32Array;
  /** The values it reads: slot and parameter key. */
  reads: { slot: number; key: string }[];
}

/** The numbers of one tree at one set of values. */
export interface TreeNumbers {
  rangeP: number[];
  /** [sequence][range]: P(sequence | range) and its annual part. */
  conditional: number[][];
  byRange: number[][];
  probability: number[];
  /** [outcome][range] and annual. */
  outcomeByRange: number[][];
  outcomeProbability: number[];
}

/** Working arrays of one tree's evaluation, made once and reused (layouts [sequence·R + range], [outcome·R + range]). */
export class TreeWork {
  readonly rangeP: Float64Array;
  readonly conditional: Float64Array;
  readonly byRange: Float64Array;
  readonly probability: Float64Array;
  readonly outcomeByRange: Float64Array;
  readonly outcomeProbability: Float64Array;

  constructor(plan: TreePlan) {
    const R = plan.ranges;
    this.rangeP = new Float64Array(R);
    this.conditional = new Float64Array(plan.sequences * R);
    this.byRange = new Float64Array(plan.sequences * R);
    this.probability = new Float64Array(plan.sequences);
    this.outcomeByRange = new Float64Array(plan.outcomes * R);
    this.outcomeProbability = new Float64Array(plan.outcomes);
  }
}

/**
 * Builds the logic of every sequence × range as one conjunction on the compiled manager and
 * appends the roots to `roots` (the recipe refers to them by their index there).
 */
export function treeRecipe(study: Study, model: LogicModel, compiled: CompiledLogic, tree: EventTree, roots: number[]): TreeRecipe {
  const m = compiled.manager;
  const R = tree.load.ranges.length;
  const node = (id: string) => logicNode(study, model, compiled, id).node;
  const logicOf = (c: BranchCondition, r: number): number | undefined =>
    c.kind === 'gate' ? node(c.gate) : c.kind === 'atleast' ? m.atleast(c.k[r]!, c.of.map(node)) : undefined;
  const keyOf = (c: BranchCondition, r: number): string | undefined => (c.kind === 'probability' ? c.key : c.kind === 'by-range' ? c.keys[r]! : undefined);
  const cells: TreeRecipe['cells'] = [];
  for (const s of tree.sequences) {
    for (let r = 0; r < R; r++) {
      const logic: number[] = [];
      const factors: { key: string; fails: boolean }[] = [];
      s.path.forEach((state, h) => {
        if (state === null) return;
        const c = tree.headings[h]!.fails;
        const key = keyOf(c, r);
        if (key !== undefined) factors.push({ key, fails: state === 'fails' });
        else {
          const n = logicOf(c, r)!;
          logic.push(state === 'fails' ? n : m.not(n));
        }
      });
      cells.push({ root: roots.length, factors });
      roots.push(m.andAll(logic));
    }
  }
  const outcomeIndex = new Map(tree.outcomes.map((o, i) => [o.id, i]));
  const outcomeOf = tree.sequences.map((s) => outcomeIndex.get(s.outcome)!);
  const parameterIndex = new Map(study.parameters.map((p, i) => [p.key, i]));
  const plan = treePlan(tree, cells, outcomeOf, (key) => parameterIndex.get(key)!);
  return { tree, cells, outcomeOf, outcomeIndex, plan };
}

function treePlan(tree: EventTree, cells: TreeRecipe['cells'], outcomeOf: number[], slotOf: (key: string) => number): TreePlan {
  const reads = new Map<number, string>();
  const slot = (key: string): number => {
    const s = slotOf(key);
    reads.set(s, key);
    return s;
  };
  const R = tree.load.ranges.length;
  const rangeSlots = new Int32Array(2 * R);
  tree.load.ranges.forEach((r, k) => {
    rangeSlots[2 * k] = slot(r.basis === 'aep' ? r.aep![0] : r.frequency!);
    rangeSlots[2 * k + 1] = r.basis === 'aep' ? slot(r.aep![1]) : -1;
  });
  const factorStart = new Int32Array(cells.length + 1);
  const factorSlot: number[] = [];
  const factorFails: number[] = [];
  cells.forEach((cell, k) => {
    factorStart[k] = factorSlot.length;
    for (const f of cell.factors) {
      factorSlot.push(slot(f.key));
      factorFails.push(f.fails ? 1 : 0);
    }
  });
  factorStart[cells.length] = factorSlot.length;
  const outcomeStart = new Int32Array(tree.outcomes.length + 1);
  const outcomeSequences: number[] = [];
  tree.outcomes.forEach((_, o) => {
    outcomeStart[o] = outcomeSequences.length;
    outcomeOf.forEach((of, i) => {
      if (of === o) outcomeSequences.push(i);
    });
  });
  outcomeStart[tree.outcomes.length] = outcomeSequences.length;
  return {
    ranges: R,
    sequences: tree.sequences.length,
    outcomes: tree.outcomes.length,
    rangeSlots,
    cellRoot: Int32Array.from(cells, (c) => c.root),
    factorStart,
    factorSlot: Int32Array.from(factorSlot),
    factorFails: Uint8Array.from(factorFails),
    outcomeOf: Int32Array.from(outcomeOf),
    outcomeStart,
    outcomeSequences: Int32Array.from(outcomeSequences),
    reads: [...reads].map(([s, key]) => ({ slot: s, key })),
  };
}

/**
 * A tree's numbers into `w`, from its logic roots' probabilities `logicP[logicOffset + root·logicStride]`
 * and its numbers' values `values[valueOffset + slot]`: P(range) from the AEP pair or the
 * frequency; per sequence and range Π(factors) × P(logic), times P(range); sums in a fixed order.
 * The base case (`treeNumbers`) and every Monte Carlo trial compute through this.
 */
export function treeNumbersInto(
  plan: TreePlan,
  logicP: ArrayLike<number>,
  logicOffset: number,
  logicStride: number,
  values: ArrayLike<number>,
  valueOffset: number,
  w: TreeWork,
): void {
  const R = plan.ranges;
  const S = plan.sequences;
  const { rangeSlots, cellRoot, factorStart, factorSlot, factorFails, outcomeStart, outcomeSequences } = plan;
  const { rangeP, conditional, byRange, probability, outcomeByRange, outcomeProbability } = w;
  for (let r = 0; r < R; r++) {
    const upper = values[valueOffset + rangeSlots[2 * r]!]!;
    const lowerSlot = rangeSlots[2 * r + 1]!;
    rangeP[r] = lowerSlot < 0 ? upper : upper - values[valueOffset + lowerSlot]!;
  }
  for (let i = 0; i < S; i++) {
    let total = 0;
    for (let r = 0; r < R; r++) {
      const cell = i * R + r;
      let factor = 1;
      for (let f = factorStart[cell]!; f < factorStart[cell + 1]!; f++) {
        const q = values[valueOffset + factorSlot[f]!]!;
        factor *= factorFails[f] ? q : 1 - q;
      }
      const c = factor * logicP[logicOffset + cellRoot[cell]! * logicStride]!;
      conditional[cell] = c;
      const a = rangeP[r]! * c;
      byRange[cell] = a;
      total += a;
    }
    probability[i] = total;
  }
  for (let o = 0; o < plan.outcomes; o++) {
    let total = 0;
    for (let r = 0; r < R; r++) {
      let s = 0;
      for (let k = outcomeStart[o]!; k < outcomeStart[o + 1]!; k++) s += byRange[outcomeSequences[k]! * R + r]!;
      outcomeByRange[o * R + r] = s;
      total += s;
    }
    outcomeProbability[o] = total;
  }
}

/** A tree's numbers from its logic roots' probabilities (`logicP[root]`) and its numbers' values (`treeNumbersInto`, once). */
export function treeNumbers(recipe: TreeRecipe, logicP: ArrayLike<number>, value: Value): TreeNumbers {
  const plan = recipe.plan;
  const values = planValues(plan.reads, value);
  const w = new TreeWork(plan);
  treeNumbersInto(plan, logicP, 0, 1, values, 0, w);
  const R = plan.ranges;
  const rows = (xs: Float64Array, n: number) => Array.from({ length: n }, (_, i) => Array.from(xs.subarray(i * R, (i + 1) * R)));
  return {
    rangeP: Array.from(w.rangeP),
    conditional: rows(w.conditional, plan.sequences),
    byRange: rows(w.byRange, plan.sequences),
    probability: Array.from(w.probability),
    outcomeByRange: rows(w.outcomeByRange, plan.outcomes),
    outcomeProbability: Array.from(w.outcomeProbability),
  };
}

/** A values array for a plan's reads: values[slot] = value(key). */
export function planValues(reads: readonly { slot: number; key: string }[], value: Value): Float64Array {
  let size = 0;
  for (const r of reads) size = Math.max(size, r.slot + 1);
  const values = new Float64Array(size);
  for (const r of reads) values[r.slot] = value(r.key);
  return values;
}

export function quantifyTree(study: Study, model: LogicModel, compiled: CompiledLogic, p: Float64Array, value: Value, tree: EventTree): EventTreeResult {
  const m = compiled.manager;
  const R = tree.load.ranges.length;
  const node = (id: string) => logicNode(study, model, compiled, id).node;

  // branch[h][r]: the branch numbers a spreadsheet would multiply, shown beside the exact values.
  const branch: Branch[][] = tree.headings.map((h) => tree.load.ranges.map((_, r) => branchOf(h.fails, r)));
  function branchOf(c: BranchCondition, r: number): Branch {
    switch (c.kind) {
      case 'probability':
        return { q: value(c.key) };
      case 'by-range':
        return { q: value(c.keys[r]!) };
      case 'gate':
        return { node: node(c.gate) };
      case 'atleast':
        return { node: m.atleast(c.k[r]!, c.of.map(node)) };
    }
  }
  const marginal = (b: Branch, state: 'works' | 'fails'): number => {
    if ('q' in b) return state === 'fails' ? b.q : 1 - b.q;
    return probability(m, state === 'fails' ? b.node : m.not(b.node), p);
  };

  // Every sequence × range as one conjunction; one prepared pass evaluates them all.
  const roots: number[] = [];
  const recipe = treeRecipe(study, model, compiled, tree, roots);
  const numbers = treeNumbers(recipe, new ProbabilityEvaluator(m, roots).evaluate(p), value);
  const rangeP = numbers.rangeP;
  const products = tree.sequences.map((s) =>
    Array.from({ length: R }, (_, r) => {
      let product = 1;
      s.path.forEach((state, h) => {
        if (state !== null) product *= marginal(branch[h]![r]!, state);
      });
      return product;
    }),
  );

  const sequences: EventTreeResult['sequences'] = tree.sequences.map((s, i) => ({
    id: s.id,
    path: [...s.path],
    outcome: s.outcome,
    conditional: numbers.conditional[i]!,
    by_range: numbers.byRange[i]!,
    probability: numbers.probability[i]!,
    product_of_branches: sum(Array.from({ length: R }, (_, r) => rangeP[r]! * products[i]![r]!)),
  }));
  const outcomes: EventTreeResult['outcomes'] = tree.outcomes.map((o, k) => {
    const mine = sequences.filter((s) => s.outcome === o.id);
    return { id: o.id, title: o.title, probability: numbers.outcomeProbability[k]!, by_range: numbers.outcomeByRange[k]!, product_of_branches: sum(mine.map((s) => s.product_of_branches)) };
  });
  const bases = new Set(tree.load.ranges.map((r) => r.basis));
  const load: EventTreeResult['load'] = {
    title: tree.load.title,
    basis: bases.size > 1 ? 'mixed' : tree.load.ranges[0]!.basis,
    ranges: tree.load.ranges.map((r, i) => ({
      id: r.id,
      title: r.title,
      ...(r.basis === 'aep' ? { aep: [value(r.aep![0]), value(r.aep![1])] as [number, number] } : { frequency: value(r.frequency!) }),
      probability: rangeP[i]!,
    })),
    total: sum(rangeP),
  };
  if (tree.load.source) load.source = tree.load.source;
  if (tree.load.note) load.note = tree.load.note;
  return {
    id: tree.id,
    title: tree.title,
    load,
    headings: tree.headings.map((h, j) => ({
      id: h.id,
      title: h.title,
      condition: conditionWords(h.fails, tree),
      kind: h.fails.kind,
      ...(h.fails.kind === 'gate' ? { gate: h.fails.gate, ...(h.fails.top ? { top: h.fails.top } : {}) } : {}),
      ...(h.fails.kind === 'atleast' ? { of: [...h.fails.of], k: [...h.fails.k], ...(h.fails.count ? { count: h.fails.count } : {}) } : {}),
      fails: branch[j]!.map((b) => marginal(b, 'fails')),
    })),
    sequences,
    outcomes,
    check: { sum_of_outcomes: sum(outcomes.map((o) => o.probability)), initiating: load.total },
  };
}

/** Sum in a fixed order (the same on every run). */
function sum(xs: readonly number[]): number {
  let s = 0;
  for (const x of xs) s += x;
  return s;
}

function conditionWords(c: BranchCondition, tree: EventTree): string {
  switch (c.kind) {
    case 'probability':
      return 'fixed probability';
    case 'by-range':
      return 'probability by load range';
    case 'gate':
      return c.top ? `top ${c.top} occurs` : `gate ${c.gate} fails`;
    case 'atleast': {
      const what = c.count ?? c.of.join(', ');
      const ks = [...new Set(c.k)];
      if (ks.length === 1) return `at least ${ks[0]} of ${c.of.length} (${what}) fail`;
      return `at least k of ${c.of.length} (${what}) fail, k = ${tree.load.ranges.map((r, i) => `${c.k[i]} in ${r.id}`).join(', ')}`;
    }
  }
}
