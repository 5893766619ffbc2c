/**
 * The numbers a risk assessment consumes, beyond the tops: event-tree sequences and outcomes,
 * combined failure modes and gate counts. A `DerivedRecipe` says how to compute all of them from
 * the probabilities of a fixed list of diagram roots and the parameters' values; it holds no
 * probability and no reference to the decision-diagram manager (plain data, so a worker thread can
 * take a copy). The shared-causes stage computes its sections at the base case through the same
 * functions (`treeNumbersInto`, `combineModesInto`, `tails`), so a Monte Carlo trial with every
 * parameter at its value gives the sections' numbers, bit for bit.
 */
import type { CompiledLogic } from '../logic/index.js';
import type { CountSet, FailureModeSet, Study } from '../study/types.js';
import { combineModesInto, modePlan, ModeWork, type ModePlan } from './combine-modes.js';
import { treeNumbersInto, treeRecipe, TreeWork, type TreeRecipe } from './event-trees.js';
import { countRecipe } from './gate-counts.js';
import type { LogicModel } from './logic-model.js';
import type { QuantityUncertainty, Results } from './results.js';

export type QuantityKey = Pick<QuantityUncertainty, 'kind' | 'owner' | 'id'>;

export interface DerivedRecipe {
  trees: TreeRecipe[];
  /** Each mode set, the index of its tree among `trees`, and its plan (slots = indices of study.parameters). */
  modes: { set: FailureModeSet; tree: number; plan: ModePlan }[];
  counts: { set: CountSet; exactly: number[] }[];
  /** The quantities in output order: per tree its outcomes then its sequences, per mode set its modes then sum, lower, upper, per count set at-least-1..n. */
  quantities: QuantityKey[];
  /** Number of diagram roots the recipes index. */
  rootCount: number;
}

/** The recipe and the manager roots it reads (same order as its root indices); undefined when the study has none of these. */
export function derivedRecipe(study: Study, model: LogicModel, compiled: CompiledLogic): { recipe: DerivedRecipe; roots: number[] } | undefined {
  const roots: number[] = [];
  const trees = (study.eventTrees ?? []).map((t) => treeRecipe(study, model, compiled, t, roots));
  const parameterIndex = new Map(study.parameters.map((p, i) => [p.key, i]));
  const modes = (study.failureModes ?? []).map((set) => {
    const tree = trees.findIndex((r) => r.tree.id === set.tree);
    const recipe = trees[tree]!;
    const plan = modePlan(set, recipe.plan.ranges, (key) => parameterIndex.get(key)!, (id) => recipe.outcomeIndex.get(id)!);
    return { set, tree, plan };
  });
  const counts = (study.counts ?? []).map((set) => countRecipe(study, model, compiled, set, roots));
  const quantities: QuantityKey[] = [];
  for (const { tree } of trees) {
    for (const o of tree.outcomes) quantities.push({ kind: 'event-tree-outcome', owner: tree.id, id: o.id });
    for (const s of tree.sequences) quantities.push({ kind: 'event-tree-sequence', owner: tree.id, id: s.id });
  }
  for (const { set } of modes) {
    for (const m of set.modes) quantities.push({ kind: 'failure-mode', owner: set.id, id: m.id });
    for (const id of ['sum', 'lower', 'upper']) quantities.push({ kind: 'failure-modes-combined', owner: set.id, id });
  }
  for (const { set } of counts) for (let j = 1; j <= set.of.length; j++) quantities.push({ kind: 'gate-count', owner: set.id, id: `at-least-${j}` });
  if (quantities.length === 0) return undefined;
  return { recipe: { trees, modes, counts, quantities, rootCount: roots.length }, roots };
}

/**
 * Every quantity of the recipe, trial by trial, with working arrays made once (one per thread): a
 * trial reads its roots' probabilities and its parameter values through offsets and strides, so the
 * Monte Carlo's batch arrays are read in place.
 */
export class DerivedEvaluator {
  private readonly trees: TreeWork[];
  private readonly modes: ModeWork[];

  constructor(private readonly recipe: DerivedRecipe) {
    this.trees = recipe.trees.map((t) => new TreeWork(t.plan));
    this.modes = recipe.modes.map((m) => new ModeWork(m.plan));
  }

  /**
   * One trial's quantities, in the recipe's order, into out[at + q·outStride]: root j's probability
   * at rootP[rootOffset + j·rootStride], parameter i's value at values[valueOffset + i].
   */
  evaluate(
    rootP: ArrayLike<number>,
    rootOffset: number,
    rootStride: number,
    values: ArrayLike<number>,
    valueOffset: number,
    out: Float64Array,
    at: number,
    outStride: number,
  ): void {
    const recipe = this.recipe;
    let k = 0;
    for (let t = 0; t < recipe.trees.length; t++) {
      const w = this.trees[t]!;
      treeNumbersInto(recipe.trees[t]!.plan, rootP, rootOffset, rootStride, values, valueOffset, w);
      for (let o = 0; o < w.outcomeProbability.length; o++) out[at + outStride * k++] = w.outcomeProbability[o]!;
      for (let i = 0; i < w.probability.length; i++) out[at + outStride * k++] = w.probability[i]!;
    }
    for (let s = 0; s < recipe.modes.length; s++) {
      const { plan, tree } = recipe.modes[s]!;
      const t = this.trees[tree]!;
      const w = this.modes[s]!;
      combineModesInto(plan, t.rangeP, t.outcomeByRange, values, valueOffset, w);
      for (let i = 0; i < w.adjustedAnnual.length; i++) out[at + outStride * k++] = w.adjustedAnnual[i]!;
      for (let j = 0; j < 3; j++) out[at + outStride * k++] = w.total[j]!;
    }
    for (let c = 0; c < recipe.counts.length; c++) {
      const exactly = recipe.counts[c]!.exactly;
      // tails(), on the count's own entries: P(at least j) = Σ_{i ≥ j} P(exactly i), summed from the top.
      let s = 0;
      for (let j = exactly.length - 1; j >= 1; j--) {
        s += rootP[rootOffset + exactly[j]! * rootStride]!;
        out[at + outStride * (k + j - 1)] = s;
      }
      k += exactly.length - 1;
    }
  }
}

/** The base-case value of each quantity, read from its own section of the results. */
export function sectionValue(results: Pick<Results, 'event_trees' | 'failure_modes' | 'gate_counts'>, q: QuantityKey): number {
  const missing = (): never => {
    throw new Error(`no base-case value for ${q.kind} '${q.owner}' / '${q.id}'`);
  };
  switch (q.kind) {
    case 'event-tree-outcome':
      return results.event_trees?.find((t) => t.id === q.owner)?.outcomes.find((o) => o.id === q.id)?.probability ?? missing();
    case 'event-tree-sequence':
      return results.event_trees?.find((t) => t.id === q.owner)?.sequences.find((s) => s.id === q.id)?.probability ?? missing();
    case 'failure-mode':
      return results.failure_modes?.find((f) => f.id === q.owner)?.modes.find((m) => m.id === q.id)?.adjusted_annual ?? missing();
    case 'failure-modes-combined': {
      const a = results.failure_modes?.find((f) => f.id === q.owner)?.annual ?? missing();
      return q.id === 'sum' ? a.sum : q.id === 'lower' ? a.lower : a.upper;
    }
    case 'gate-count': {
      const j = Number(q.id.slice('at-least-'.length));
      return results.gate_counts?.find((c) => c.id === q.owner)?.at_least.exact[j] ?? missing();
    }
  }
}
