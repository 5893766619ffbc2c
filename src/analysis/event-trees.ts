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

export function rangeProbabilities(tree: EventTree, value: Value): number[] {
  return tree.load.ranges.map((r) => (r.basis === 'aep' ? value(r.aep![0]) - value(r.aep![1]) : value(r.frequency!)));
}

/**
 * How to compute a tree's sequences and outcomes from the probabilities of its logic (one diagram
 * root per sequence and range) and the values of its numbers: the recipe holds no probability, so
 * the base case and every Monte Carlo trial compute with the same code (`treeNumbers`).
 */
export interface TreeRecipe {
  tree: EventTree;
  /** cells[i·R + r]: sequence i in range r — the index of its logic root, and its plain branch factors in heading order. */
  cells: { root: number; factors: { key: string; fails: boolean }[] }[];
  /** Outcome index of each sequence, and of each outcome id. */
  outcomeOf: number[];
  outcomeIndex: Map<string, number>;
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
  return { tree, cells, outcomeOf: tree.sequences.map((s) => outcomeIndex.get(s.outcome)!), outcomeIndex };
}

/** A tree's numbers from its logic roots' probabilities (`logicP[root]`) and its numbers' values. */
export function treeNumbers(recipe: TreeRecipe, logicP: ArrayLike<number>, value: Value): TreeNumbers {
  const { tree, cells } = recipe;
  const R = tree.load.ranges.length;
  const rangeP = rangeProbabilities(tree, value);
  const conditional: number[][] = [];
  const byRange: number[][] = [];
  const probability: number[] = [];
  for (let i = 0; i < tree.sequences.length; i++) {
    const c = new Array<number>(R);
    const a = new Array<number>(R);
    for (let r = 0; r < R; r++) {
      const cell = cells[i * R + r]!;
      let factor = 1;
      for (const f of cell.factors) {
        const q = value(f.key);
        factor *= f.fails ? q : 1 - q;
      }
      c[r] = factor * logicP[cell.root]!;
      a[r] = rangeP[r]! * c[r]!;
    }
    conditional.push(c);
    byRange.push(a);
    probability.push(sum(a));
  }
  const outcomeByRange: number[][] = [];
  const outcomeProbability: number[] = [];
  tree.outcomes.forEach((_, o) => {
    const a = new Array<number>(R).fill(0);
    for (let r = 0; r < R; r++) {
      let s = 0;
      for (let i = 0; i < byRange.length; i++) if (recipe.outcomeOf[i] === o) s += byRange[i]![r]!;
      a[r] = s;
    }
    outcomeByRange.push(a);
    outcomeProbability.push(sum(a));
  });
  return { rangeP, conditional, byRange, probability, outcomeByRange, outcomeProbability };
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
