/**
 * The shared-causes stage: the common-cause groups as expanded (with the events they made and
 * changed), how many of each counted set of gates fail, the load-range event trees and the
 * combined failure modes. All at the base case, on the base case's decision diagram (whose
 * manager also holds the new count and sequence diagrams).
 */
import { NodeBudgetExceeded } from '../logic/index.js';
import { StudyError } from '../study/errors.js';
import type { Study } from '../study/types.js';
import type { AnalysisContext, Stage } from './analyze.js';
import { modeNumbers } from './combine-modes.js';
import { studyValues } from './event-probability.js';
import { quantifyTree } from './event-trees.js';
import { gateCount } from './gate-counts.js';
import type { CommonCauseResult, EventResult, EventTreeResult, FailureModeResult, Results } from './results.js';

/** The rule for members with unequal totals, as the appendix states it (see common-cause.ts). */
export const UNEQUAL_RULE =
  'NUREG/CR-5485\u2019s formulas are written for like members. Rule applied: each member keeps its own Q_t for its independent part (f1 \u00b7 Q_t), and every shared event uses the mean Q_t of the members. ' +
  'With this rule the expected number of member failures (over the members, independent plus shared parts) equals the sum of the members\u2019 own Q_t, ' +
  'while each member\u2019s own total moves towards the mean.';

/** Members whose totals differ by more than this (relative) are reported as unequal. */
const UNEQUAL = 1e-9;

export const sharedCauseStage: Stage = (ctx) => {
  try {
    return sharedCauses(ctx);
  } catch (err) {
    if (err instanceof NodeBudgetExceeded) {
      throw new StudyError(
        `the decision diagrams of the counts and event trees outgrew settings.max_nodes (${ctx.study.settings.max_nodes.toLocaleString('en-US')} nodes)`,
        undefined,
        'a larger settings.max_nodes (memory permitting), or fewer or smaller counted sets and event trees',
      );
    }
    throw err;
  }
};

function sharedCauses(ctx: AnalysisContext): Partial<Results> {
  const { study, model, compiled, base } = ctx;
  const out: Partial<Results> = {};
  const value = studyValues(study);
  if (study.commonCause.length > 0) {
    const { groups, events, warnings } = commonCauseResults(ctx);
    out.common_cause = groups;
    out.events = events;
    if (warnings.length) out.warnings = [...ctx.results.warnings, ...warnings];
  }
  if (study.counts?.length) out.gate_counts = study.counts.map((c) => gateCount(study, model, compiled, base.probability, c));
  if (study.eventTrees?.length) out.event_trees = study.eventTrees.map((t) => quantifyTree(study, model, compiled, base.probability, value, t));
  if (study.failureModes?.length) out.failure_modes = combineModes(study, out.event_trees ?? [], value);
  if (study.eventTrees?.length || study.failureModes?.length) {
    // Numbers of trees and mode sets are used by their owner (describeStudy only knows events and groups).
    out.parameters = ctx.results.parameters.map((p) => (p.owner_kind === 'tree' || p.owner_kind === 'modes') && p.used_by.length === 0 ? { ...p, used_by: [p.owner] } : p);
  }
  return out;
}

/** The `ccf-unequal-totals` warning of one group, or undefined when its members are alike (shared by `run` and `check`). */
export function unequalTotalsWarning(g: { id: string; at: { file: string; line: number } }, totals: readonly number[], reference: number): Results['warnings'][number] | undefined {
  const hi = Math.max(...totals);
  const lo = Math.min(...totals);
  if (!(hi - lo > UNEQUAL * hi)) return undefined;
  return {
    code: 'ccf-unequal-totals',
    message:
      `common-cause group '${g.id}': its members' own probabilities differ (${lo.toExponential(2)} to ${hi.toExponential(2)}); ` +
      `NUREG/CR-5485 assumes like members. The shared events use their mean, ${reference.toExponential(2)}, and each independent part the member's own value.`,
    at: { file: g.at.file, line: g.at.line },
  };
}

function commonCauseResults(ctx: AnalysisContext): { groups: CommonCauseResult[]; events: EventResult[]; warnings: Results['warnings'] } {
  const { study, model, base } = ctx;
  const expansion = model.commonCause;
  const value = studyValues(study);
  const warnings: Results['warnings'] = [];
  const byId = new Map<string, { group: string; total: number }>();
  const added: EventResult[] = [];
  const groups = expansion.groups.map((layout): CommonCauseResult => {
    const g = layout.group;
    const nums = expansion.numbers(layout, base.total, value);
    const warning = unequalTotalsWarning(g, nums.totals, nums.reference);
    if (warning) warnings.push(warning);
    const unequal = warning !== undefined;
    layout.members.forEach((i, k) => byId.set(study.events[i]!.id, { group: g.id, total: nums.totals[k]! }));
    const shared = layout.shared.map((s) => ({ id: s.id, members: s.members.map((i) => study.events[i]!.id), probability: base.probability[s.variable]! }));
    for (const s of shared) {
      const e: EventResult = {
        id: s.id,
        title: `Common-cause failure of ${s.members.join(', ')} (${g.title ?? g.id})`,
        model: 'common-cause',
        probability: s.probability,
        parameters: { ...nums.parameters },
        parameter_keys: { ...g.fields },
        assumptions: [],
        common_cause_group: g.id,
        common_cause_role: 'shared',
        common_cause_members: s.members,
      };
      added.push(e);
    }
    const r: CommonCauseResult = {
      id: g.id,
      method: g.method,
      parameters: Object.entries(g.fields).map(([field, key]) => ({ field, key, value: nums.parameters[field]! })),
      members: layout.members.map((i, k) => ({ id: study.events[i]!.id, total: nums.totals[k]!, independent: base.probability[i]! })),
      reference_total: nums.reference,
      unequal_totals: unequal,
      factors: nums.factors.slice(1),
      shared,
      rule: UNEQUAL_RULE,
    };
    if (g.title) r.title = g.title;
    if (g.method === 'alpha') r.testing = g.testing;
    if (g.dirichlet) r.dirichlet = [...g.dirichlet.a];
    return r;
  });
  const events = ctx.results.events.map((e) => {
    const m = byId.get(e.id);
    if (!m) return e;
    return { ...e, common_cause_group: m.group, common_cause_role: 'independent' as const, total_probability: m.total };
  });
  return { groups, events: [...events, ...added], warnings };
}

function combineModes(study: Study, trees: EventTreeResult[], value: (key: string) => number): FailureModeResult[] {
  return (study.failureModes ?? []).map((set) => {
    const tree = trees.find((t) => t.id === set.tree)!;
    const rangeP = tree.load.ranges.map((r) => r.probability);
    const n = modeNumbers(set, rangeP, (id) => tree.outcomes.find((x) => x.id === id)!.by_range, value);
    return {
      id: set.id,
      title: set.title,
      tree: tree.id,
      ranges: tree.load.ranges.map((r) => ({ id: r.id, title: r.title, probability: r.probability })),
      modes: set.modes.map((mode, i) => ({
        id: mode.id,
        title: mode.title,
        basis: mode.basis.kind,
        ...(mode.basis.kind === 'outcome' ? { outcome: mode.basis.outcome } : {}),
        conditional: n.conditional[i]!,
        annual: n.annual[i]!,
        adjusted: n.adjusted[i]!,
        adjusted_annual: n.adjustedAnnual[i]!,
      })),
      by_range: n.byRange,
      annual: n.total,
    };
  });
}
