/**
 * The point estimate: every top's exact probability from its decision diagram, its minimal cut sets
 * (with the cutoff and maximum order), the rare-event and min-cut upper bound beside it, and the
 * importance of every basic event, all for one set of event probabilities.
 */
import { compile, cutSetBounds, importance, minimalCutSets, NodeBudgetExceeded, probability, type CompiledLogic } from '../logic/index.js';
import { StudyError } from '../study/errors.js';
import type { Study } from '../study/types.js';
import type { LogicModel } from './logic-model.js';
import type { CutSet, Importance, TopResult } from './results.js';

/** House events (switches) enter the diagram as constants, so cut sets never carry them. */
export function compileCase(study: Study, model: LogicModel, switches: ReadonlyMap<string, boolean>): CompiledLogic {
  const fixed = new Map<number, boolean>();
  study.events.forEach((e, i) => {
    if (e.model === 'switch') fixed.set(i, switches.get(e.id) ?? e.on ?? false);
  });
  try {
    return compile(model.graph, { fixed, maxNodes: study.settings.max_nodes });
  } catch (err) {
    if (err instanceof NodeBudgetExceeded) {
      throw new StudyError(
        `the decision diagram outgrew settings.max_nodes (${study.settings.max_nodes.toLocaleString('en-US')} nodes)`,
        undefined,
        'a larger settings.max_nodes (memory permitting), a simpler model, or settings.on_node_budget: bounds to report cut-set bounds instead of the exact value',
      );
    }
    throw err;
  }
}

export function quantifyTops(study: Study, model: LogicModel, compiled: CompiledLogic, p: Float64Array): TopResult[] {
  const ids = model.graph.variables;
  return study.tops.map((top, t) => {
    const root = compiled.gateRoots[model.topGates[t]!]!;
    const exact = probability(compiled.manager, root, p);
    const mcs = minimalCutSets(compiled.manager, root, p, { cutoff: study.settings.cutoff, maxOrder: study.settings.max_order });
    const bounds = cutSetBounds(mcs.sets);
    const cutSets: CutSet[] = mcs.sets.map((s) => ({
      events: s.vars.map((v) => ids[v]!),
      probability: s.probability,
      share: exact > 0 ? s.probability / exact : 0,
    }));
    const imp = importance(compiled.manager, root, p);
    const ranked: Importance[] = [];
    imp.birnbaum.forEach((b, v) => {
      if (study.events[v]!.model === 'switch') return;
      ranked.push({
        event: ids[v]!,
        fussell_vesely: imp.fussellVesely[v]!,
        birnbaum: b,
        criticality: imp.criticality[v]!,
        raw: imp.raw[v]!,
        rrw: imp.rrw[v]!,
      });
    });
    // Highest Fussell–Vesely first; ties in study order so the table is stable.
    ranked.sort((a, b) => b.fussell_vesely - a.fussell_vesely || ids.indexOf(a.event) - ids.indexOf(b.event));
    const summary: TopResult['cut_set_summary'] = {
      listed: cutSets.length,
      truncated: mcs.truncated,
      cutoff: study.settings.cutoff,
      max_order: study.settings.max_order,
      coherent: mcs.coherent,
    };
    if (mcs.truncatedProbability !== undefined) summary.truncated_probability = mcs.truncatedProbability;
    return {
      id: top.id,
      title: top.title,
      gate: top.gate,
      probability: { exact, rare_event: bounds.rareEvent, mcub: bounds.mcub, basis: 'exact' },
      cut_sets: cutSets,
      cut_set_summary: summary,
      importance: ranked.filter((r) => r.birnbaum !== 0 || r.fussell_vesely !== 0),
      bdd_nodes: compiled.manager.size(root),
    };
  });
}
