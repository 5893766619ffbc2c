/**
 * The point estimate: every top's exact probability from its decision diagram, its minimal cut sets
 * (with the cutoff and maximum order), the rare-event and min-cut upper bound beside it, and the
 * importance of every basic event, all for one set of event probabilities.
 */
import { compile, cutSetBounds, importance, minimalCutSets, NodeBudgetExceeded, ProbabilityEvaluator, type CompiledLogic } from '../logic/index.js';
import { ExpansionBudgetExceeded, topDownCutSets } from '../logic/cut-sets-topdown.js';
import { StudyError } from '../study/errors.js';
import { reachable } from '../study/reach.js';
import type { Study } from '../study/types.js';
import type { LogicModel } from './logic-model.js';
import type { CutSet, Importance, TopResult } from './results.js';

/** House-event states of a case, by variable index: switches enter the logic as constants. */
function switchStates(study: Study, switches: ReadonlyMap<string, boolean>): Map<number, boolean> {
  const fixed = new Map<number, boolean>();
  study.events.forEach((e, i) => {
    if (e.model === 'switch') fixed.set(i, switches.get(e.id) ?? e.on ?? false);
  });
  return fixed;
}

function budgetError(study: Study): StudyError {
  return new StudyError(
    `the decision diagram outgrew settings.max_nodes (${study.settings.max_nodes.toLocaleString('en-US')} nodes)`,
    undefined,
    'a larger settings.max_nodes (memory permitting), a simpler model, or settings.on_node_budget: bounds to report cut-set bounds instead of the exact value',
  );
}

function compileWithin(study: Study, model: LogicModel, switches: ReadonlyMap<string, boolean>): CompiledLogic | NodeBudgetExceeded {
  try {
    return compile(model.graph, { fixed: switchStates(study, switches), maxNodes: study.settings.max_nodes });
  } catch (err) {
    if (err instanceof NodeBudgetExceeded) return err;
    throw err;
  }
}

/** House events (switches) enter the diagram as constants, so cut sets never carry them. */
export function compileCase(study: Study, model: LogicModel, switches: ReadonlyMap<string, boolean>): CompiledLogic {
  const compiled = compileWithin(study, model, switches);
  if (compiled instanceof NodeBudgetExceeded) throw budgetError(study);
  return compiled;
}

/**
 * The base case's diagram; undefined when it outgrew settings.max_nodes and the study asked for
 * cut-set bounds instead (settings.on_node_budget: bounds), in which case use `boundTops`.
 */
export function compileBaseCase(study: Study, model: LogicModel, switches: ReadonlyMap<string, boolean>): CompiledLogic | undefined {
  const compiled = compileWithin(study, model, switches);
  if (!(compiled instanceof NodeBudgetExceeded)) return compiled;
  if (study.settings.on_node_budget === 'bounds') return undefined;
  throw budgetError(study);
}

/** Warning code carried by results whose top probabilities are bounds, not exact values. */
export const BOUND_WARNING = 'node-budget-bounds';

/**
 * Without a diagram: each top's minimal cut sets by top-down expansion with the cutoff, and in place
 * of the exact value the min-cut upper bound over the kept sets and every dropped partial product,
 * which is a true upper bound (see logic/cut-sets-topdown.ts); `basis` says so. rare_event and
 * mcub keep their meaning of the exact case (over the listed cut sets only), so the reported bound is
 * never below mcub, and equals it when the cutoff dropped nothing. Importance needs the diagram and
 * is left out.
 */
export function boundTops(study: Study, model: LogicModel, switches: ReadonlyMap<string, boolean>, p: Float64Array): TopResult[] {
  const ids = model.graph.variables;
  const fixed = switchStates(study, switches);
  return study.tops.map((top, t) => {
    let td;
    try {
      td = topDownCutSets(model.graph, model.topGates[t]!, p, { cutoff: study.settings.cutoff, maxOrder: study.settings.max_order, fixed });
    } catch (err) {
      if (err instanceof ExpansionBudgetExceeded) {
        throw new StudyError(
          `top '${top.id}': the decision diagram outgrew settings.max_nodes and the cut-set expansion that replaces it stopped after ${err.steps.toLocaleString('en-US')} steps`,
          top.at,
          'a larger settings.cutoff or a smaller settings.max_order (fewer cut sets to expand), or a larger settings.max_nodes',
        );
      }
      throw err;
    }
    const bound = td.upperBound;
    const listed = cutSetBounds(td.sets);
    return {
      id: top.id,
      title: top.title,
      gate: top.gate,
      probability: { exact: bound, rare_event: listed.rareEvent, mcub: listed.mcub, basis: 'bound' },
      cut_sets: td.sets.map((s): CutSet => ({ events: s.vars.map((v) => ids[v]!), probability: s.probability, share: bound > 0 ? s.probability / bound : 0 })),
      cut_set_summary: {
        listed: td.sets.length,
        truncated: td.droppedTerms,
        cutoff: study.settings.cutoff,
        max_order: study.settings.max_order,
        coherent: td.coherent,
      },
      bdd_nodes: 0,
    };
  });
}

/** One `cut-sets-capped` warning per top whose cut sets the cap cut short. */
export function cappedWarnings(tops: readonly TopResult[]): { code: string; message: string }[] {
  return tops.flatMap((top) => {
    const s = top.cut_set_summary;
    if (!s.capped) return [];
    const atMost = s.capped_exact ? '' : 'at most ';
    return [
      {
        code: CAPPED_WARNING,
        message:
          `top '${top.id}': only the ${s.listed.toLocaleString('en-US')} most probable cut sets are listed (settings.max_cut_sets); ` +
          `${atMost}${s.capped.toLocaleString('en-US')} more at or above the cutoff were left out, with a total probability of ${atMost}${(s.capped_probability ?? 0).toPrecision(3)}. ` +
          'The exact top probability and the importance measures include them (they come from the decision diagram).',
      },
    ];
  });
}

/** The warning code of a top whose cut-set list was cut short by settings.max_cut_sets. */
export const CAPPED_WARNING = 'cut-sets-capped';

/** The results warning that says the numbers are bounds, and what was left out. */
export function boundWarning(study: Study): { code: string; message: string } {
  return {
    code: BOUND_WARNING,
    message:
      `the decision diagram outgrew settings.max_nodes (${study.settings.max_nodes.toLocaleString('en-US')} nodes), so each top probability is an UPPER BOUND ` +
      '(the min-cut upper bound over the cut sets kept and those dropped by the cutoff), not the exact value; ' +
      'importance, sensitivity, uncertainty and the other analyses that need the diagram are left out',
  };
}

/** Probability of every study gate, in one pass over the diagram (for the numbers under each diagram node). */
function gateProbabilities(study: Study, model: LogicModel, compiled: CompiledLogic, p: Float64Array): Map<string, number> {
  const ids = study.gates.map((g) => g.id);
  const roots = ids.map((id) => compiled.gateRoots[model.gate.get(id)!]!);
  const values = new ProbabilityEvaluator(compiled.manager, roots).evaluate(p);
  return new Map(ids.map((id, i) => [id, values[i]!]));
}

/** The gates under a top (its own gate included), in study order. */
function gatesUnder(study: Study, gate: string): string[] {
  const under = reachable(study.gates, [gate]);
  return study.gates.map((g) => g.id).filter((id) => under.has(id));
}

export function quantifyTops(study: Study, model: LogicModel, compiled: CompiledLogic, p: Float64Array): TopResult[] {
  const ids = model.graph.variables;
  const gateP = gateProbabilities(study, model, compiled, p);
  return study.tops.map((top, t) => {
    const root = compiled.gateRoots[model.topGates[t]!]!;
    const mcs = minimalCutSets(compiled.manager, root, p, {
      cutoff: study.settings.cutoff,
      maxOrder: study.settings.max_order,
      maxSets: study.settings.max_cut_sets,
    });
    // Coherence (no negation reaches the top) lets the measures be clamped to their exact ranges.
    const imp = importance(compiled.manager, root, p, undefined, { coherent: mcs.coherent });
    // The exact probability is the importance passes' own bottom-up pass (the same sum as probability()).
    const exact = imp.probability;
    const bounds = cutSetBounds(mcs.sets);
    const cutSets: CutSet[] = mcs.sets.map((s) => ({
      events: s.vars.map((v) => ids[v]!),
      probability: s.probability,
      share: exact > 0 ? s.probability / exact : 0,
    }));
    const variables: number[] = [];
    imp.birnbaum.forEach((_, v) => {
      // Variables past the study's events are common-cause events (never switches).
      if (study.events[v]?.model !== 'switch') variables.push(v);
    });
    // Highest Fussell–Vesely first; ties in variable (study) order so the table is stable.
    variables.sort((a, b) => imp.fussellVesely[b]! - imp.fussellVesely[a]! || a - b);
    const ranked: Importance[] = variables.map((v) => ({
      event: ids[v]!,
      fussell_vesely: imp.fussellVesely[v]!,
      birnbaum: imp.birnbaum[v]!,
      criticality: imp.criticality[v]!,
      raw: imp.raw[v]!,
      rrw: imp.rrw[v]!,
    }));
    const summary: TopResult['cut_set_summary'] = {
      listed: cutSets.length,
      truncated: mcs.truncated,
      cutoff: study.settings.cutoff,
      max_order: study.settings.max_order,
      coherent: mcs.coherent,
      max_cut_sets: study.settings.max_cut_sets,
      capped: mcs.capped,
      capped_probability: mcs.cappedProbability,
      capped_exact: mcs.cappedExact,
    };
    if (mcs.truncatedProbability !== undefined) summary.truncated_probability = mcs.truncatedProbability;
    const listed = ranked.filter((r) => r.birnbaum !== 0 || r.fussell_vesely !== 0);
    const none = ranked.filter((r) => r.birnbaum === 0 && r.fussell_vesely === 0).map((r) => r.event);
    return {
      id: top.id,
      title: top.title,
      gate: top.gate,
      probability: { exact, rare_event: bounds.rareEvent, mcub: bounds.mcub, basis: 'exact' },
      cut_sets: cutSets,
      cut_set_summary: summary,
      importance: listed,
      ...(none.length > 0
        ? { no_effect: { events: none, note: `${none.length === 1 ? 'this event has' : 'these events have'} zero importance: the top does not depend on ${none.length === 1 ? 'it' : 'them'}, so no change to ${none.length === 1 ? 'its' : 'their'} data can change it` } }
        : {}),
      gate_probabilities: Object.fromEntries(gatesUnder(study, top.gate).map((id) => [id, gateP.get(id)!])),
      bdd_nodes: compiled.manager.size(root),
    };
  });
}
