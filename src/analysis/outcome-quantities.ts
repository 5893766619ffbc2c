/**
 * The numbers a risk assessment consumes, beyond the tops: event-tree sequences and outcomes,
 * combined failure modes and gate counts. A `DerivedRecipe` says how to compute all of them from
 * the probabilities of a fixed list of diagram roots and the parameters' values; it holds no
 * probability and no reference to the decision-diagram manager (plain data, so a worker thread can
 * take a copy). The shared-causes stage computes its sections at the base case through the same
 * functions (`treeNumbers`, `modeNumbers`, `tails`), so a Monte Carlo trial with every parameter at
 * its value gives the sections' numbers, bit for bit.
 */
import type { CompiledLogic } from '../logic/index.js';
import type { CountSet, FailureModeSet, Study } from '../study/types.js';
import { modeNumbers } from './combine-modes.js';
import { treeNumbers, treeRecipe, type TreeNumbers, type TreeRecipe } from './event-trees.js';
import { countRecipe } from './gate-counts.js';
import type { LogicModel } from './logic-model.js';
import type { QuantityUncertainty, Results } from './results.js';

export type QuantityKey = Pick<QuantityUncertainty, 'kind' | 'owner' | 'id'>;

export interface DerivedRecipe {
  trees: TreeRecipe[];
  modes: { set: FailureModeSet; tree: number }[];
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
  const modes = (study.failureModes ?? []).map((set) => ({ set, tree: trees.findIndex((r) => r.tree.id === set.tree) }));
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

/** Every quantity of the recipe, in its order, into `out`, from the roots' probabilities and the parameters' values. */
export function derivedValues(recipe: DerivedRecipe, rootP: ArrayLike<number>, value: (key: string) => number, out: Float64Array): void {
  let k = 0;
  const numbers: TreeNumbers[] = [];
  for (const r of recipe.trees) {
    const n = treeNumbers(r, rootP, value);
    numbers.push(n);
    for (const x of n.outcomeProbability) out[k++] = x;
    for (const x of n.probability) out[k++] = x;
  }
  for (const { set, tree } of recipe.modes) {
    const t = numbers[tree]!;
    const outcomes = recipe.trees[tree]!.outcomeIndex;
    const n = modeNumbers(set, t.rangeP, (id) => t.outcomeByRange[outcomes.get(id)!]!, value);
    for (const x of n.adjustedAnnual) out[k++] = x;
    out[k++] = n.total.sum;
    out[k++] = n.total.lower;
    out[k++] = n.total.upper;
  }
  for (const { exactly } of recipe.counts) {
    // tails(), on the count's own entries: P(at least j) = Σ_{i ≥ j} P(exactly i), summed from the top.
    let s = 0;
    const at = k;
    for (let j = exactly.length - 1; j >= 1; j--) {
      s += rootP[exactly[j]!]!;
      out[at + j - 1] = s;
    }
    k += exactly.length - 1;
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
