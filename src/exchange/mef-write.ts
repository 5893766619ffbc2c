/**
 * A study → an Open-PSA MEF document (as an element tree for xml-write.ts). What maps to what
 * (section names of the standard's text, open-psa/mef mef/*.rst):
 *   - tops → gates no other gate refers to (fault_tree_layer.rst "Description"); a top whose id
 *     differs from its gate's is a pass-through gate (fault_tree_layer.rst "XML Representation");
 *   - gates any/all/atleast/not → define-gate with or/and/atleast/not;
 *   - switch events → define-house-event with their base-case constant;
 *   - fixed, and demand without a standby part → a basic event whose expression is its probability
 *     parameter; rate → the exponential
 *     built-in of its rate (years-1) and exposure (years) parameters (stochastic_layer.rst);
 *   - every other model → the event's probability at `as_of` as a float, with attributes naming
 *     the model and the values that produced it (listed by the command);
 *   - common-cause groups → define-CCF-group (meta_logical_layer.rst "Common Cause Groups"):
 *     beta → beta-factor, mgl → MGL (levels 2…m), alpha non-staggered → alpha-factor (levels 1…m);
 *     alpha staggered → alpha-factor with α'_k ∝ α_k / k, which gives the same Q_k when the α add
 *     up to 1;
 *   - every class, event and group parameter → define-parameter in canonical units (years,
 *     years-1) with its key and written text as label.
 * Study facts the standard has no element for (as-of, revision, settings) travel as attributes of
 * the root element, named faultbook-…, so an import by faultbook restores them.
 */
import { baseCase } from '../analysis/case.js';
import { evaluateEvents } from '../analysis/event-probability.js';
import { StudyError, StudyErrors } from '../study/errors.js';
import type { BasicEvent, CommonCauseGroup, Parameter, Study } from '../study/types.js';
import { MEMBER_TITLE_PREFIX, MEMBER_TOTAL_PREFIX, META_PREFIX } from './plain-model.js';
import type { XmlNode } from './xml-write.js';

/** MEF Identifier (mef/schema/mef.rnc): no dots, no leading, trailing or doubled hyphen. */
const MEF_IDENTIFIER = /^[A-Za-z_][A-Za-z0-9_]*(-[A-Za-z0-9_]+)*$/;
/** Name of the one fault tree an export writes. */
export const EXPORT_TREE = 'logic';

export interface ExportResult {
  root: XmlNode;
  /** Events written as their value at as_of, one line each, for the command's output. */
  valuesAtAsOf: string[];
  /** Parts of the study the document does not carry. */
  notCarried: string[];
  /** Other things the reader of the document should know (CCF groups with unequal members…). */
  notes: string[];
}

const num = (v: number): string => String(v);
const el = (name: string, attributes?: Record<string, string>, children?: XmlNode[]): XmlNode => ({
  name,
  ...(attributes ? { attributes } : {}),
  ...(children ? { children } : {}),
});
const label = (text: string): XmlNode => ({ name: 'label', text });
const floatNode = (v: number): XmlNode => el('float', { value: num(v) });
const attributesNode = (pairs: [string, string][]): XmlNode[] =>
  pairs.length ? [el('attributes', undefined, pairs.map(([name, value]) => el('attribute', { name, value })))] : [];

export function studyToMef(study: Study): ExportResult {
  const bad = (id: string, what: string, at: Study['tops'][number]['at']) =>
    new StudyError(`${what} '${id}' is not a portable MEF name`, at, 'letters, digits, _ and single hyphens, starting with a letter (no dots): fault_tree_layer.rst "Use Portable Identifiers"');
  const errors: StudyError[] = [];
  const check = (id: string, what: string, at: Study['tops'][number]['at']) => {
    if (!MEF_IDENTIFIER.test(id)) errors.push(bad(id, what, at));
  };
  study.tops.forEach((t) => t.id !== t.gate && check(t.id, 'top', t.at));
  study.gates.forEach((g) => check(g.id, 'gate', g.at));
  study.events.forEach((e) => check(e.id, 'event', e.at));
  study.commonCause.forEach((g) => check(g.id, 'common-cause group', g.at));
  const eventNames = new Set([...study.gates.map((g) => g.id), ...study.events.map((e) => e.id)]);
  for (const t of study.tops) {
    if (t.id !== t.gate && eventNames.has(t.id)) {
      errors.push(new StudyError(`top '${t.id}' has the id of a gate or event`, t.at, 'a top id no gate or event uses (the standard has one name space for events)'));
    }
  }
  // The standard's top is a gate no other gate refers to ("Description"): a top named like a gate
  // that other gates use would come back as no top at all.
  const usedByGates = new Set(study.gates.flatMap((g) => g.inputs));
  for (const t of study.tops) {
    if (t.id === t.gate && usedByGates.has(t.gate)) {
      errors.push(new StudyError(`top '${t.id}' has the id of its gate, which other gates use`, t.at, 'a top id of its own (the standard reads a gate that other gates use as no top)'));
    }
  }
  const parameterName = new Map<string, string>();
  const exported = study.parameters.filter((p) => p.ownerKind === 'class' || p.ownerKind === 'event' || p.ownerKind === 'group');
  const taken = new Map<string, Parameter>();
  for (const p of exported) {
    const name = `${p.owner}-${p.field}`;
    const other = taken.get(name);
    if (!MEF_IDENTIFIER.test(name)) errors.push(bad(name, 'parameter', p.at));
    else if (other) errors.push(new StudyError(`parameters '${p.key}' and '${other.key}' would both be named '${name}'`, p.at, 'owner ids that do not run into each other'));
    taken.set(name, p);
    parameterName.set(p.key, name);
  }
  if (errors.length > 0) throw new StudyErrors(errors);
  const evaluation = evaluateEvents(study, baseCase());
  const total = new Map(study.events.map((e, i) => [e.id, evaluation.total[i]!]));
  const byKey = new Map(study.parameters.map((p) => [p.key, p]));
  const kindOf = new Map<string, string>([
    ...study.gates.map((g): [string, string] => [g.id, 'gate']),
    ...study.events.map((e): [string, string] => [e.id, e.model === 'switch' ? 'house-event' : 'basic-event']),
  ]);
  const ref = (id: string): XmlNode => el(kindOf.get(id)!, { name: id });
  const paramRef = (key: string): XmlNode => el('parameter', { name: parameterName.get(key)! });
  const result: ExportResult = { root: el('opsa-mef'), valuesAtAsOf: [], notCarried: [], notes: [] };

  // ── the fault tree: tops, gates, CCF groups ──
  const tree: XmlNode[] = [];
  for (const t of study.tops) {
    if (t.id === t.gate) continue;
    tree.push(el('define-gate', { name: t.id }, [label(t.title), ref(t.gate)]));
  }
  const topTitles = new Map(study.tops.filter((t) => t.id === t.gate).map((t) => [t.id, t.title]));
  for (const g of study.gates) {
    const inputs = g.inputs.map(ref);
    const formula =
      g.op === 'any' ? el('or', undefined, inputs) : g.op === 'all' ? el('and', undefined, inputs) : g.op === 'not' ? el('not', undefined, inputs) : el('atleast', { min: String(g.k) }, inputs);
    const title = topTitles.get(g.id) ?? g.title;
    tree.push(el('define-gate', { name: g.id }, [...(title ? [label(title)] : []), formula]));
  }
  const members = new Set<string>();
  for (const group of study.commonCause) {
    tree.push(ccfGroup(study, group, total, byKey, paramRef, result));
    group.members.forEach((m) => members.add(m));
  }

  // ── model data: parameters, basic and house events ──
  const data: XmlNode[] = [];
  for (const p of exported) {
    const unit = p.quantity === 'rate' ? 'years-1' : p.quantity === 'duration' ? 'years' : 'float';
    const attrs: [string, string][] = [];
    if (p.source) attrs.push([`${META_PREFIX}source`, p.source]);
    if (p.note) attrs.push([`${META_PREFIX}note`, p.note]);
    if (p.fit) attrs.push([`${META_PREFIX}fit`, p.fit]);
    data.push(el('define-parameter', { name: parameterName.get(p.key)!, unit }, [label(`${p.key} = ${p.written}`), ...attributesNode(attrs), floatNode(p.value)]));
  }
  const uncertain = exported.filter((p) => p.uncertainty).map((p) => p.key);
  if (uncertain.length) result.notCarried.push(`uncertainty distributions of ${uncertain.length} parameters (their point values are exported): ${uncertain.join(', ')}`);
  for (const e of study.events) {
    if (members.has(e.id)) continue;
    data.push(eventNode(study, e, total.get(e.id)!, byKey, paramRef, result));
  }

  // ── the root ──
  const meta: [string, string][] = [
    [`${META_PREFIX}format`, study.meta.format],
    [`${META_PREFIX}title`, study.meta.title],
    [`${META_PREFIX}facility`, study.meta.facility],
    [`${META_PREFIX}revision`, study.meta.revision],
    [`${META_PREFIX}as-of`, study.meta.as_of],
  ];
  const s = study.settings;
  for (const [name, value] of Object.entries({
    cutoff: s.cutoff,
    max_order: s.max_order,
    max_cut_sets: s.max_cut_sets,
    samples: s.samples,
    seed: s.seed,
    max_nodes: s.max_nodes,
    sensitivity_factor: s.sensitivity_factor,
    on_node_budget: s.on_node_budget,
    sampling: s.sampling,
  })) {
    meta.push([`${META_PREFIX}setting-${name}`, typeof value === 'number' ? num(value) : value]);
  }
  result.root.children = [label(study.meta.title), ...attributesNode(meta), el('define-fault-tree', { name: EXPORT_TREE }, tree), el('model-data', undefined, data)];

  const reached = new Set<string>(study.tops.map((t) => t.gate));
  const byId = new Map(study.gates.map((g) => [g.id, g]));
  const stack = [...reached];
  while (stack.length > 0) {
    for (const input of byId.get(stack.pop()!)?.inputs ?? []) {
      if (!byId.has(input) || reached.has(input)) continue;
      reached.add(input);
      stack.push(input);
    }
  }
  for (const g of study.gates) {
    if (!reached.has(g.id) && !usedByGates.has(g.id)) result.notes.push(`gate ${g.id} is reached from no top: the standard reads a gate no other gate uses as a top, so an import makes it one`);
  }
  if (study.eventTrees?.length) result.notCarried.push(`event trees (${study.eventTrees.map((t) => t.id).join(', ')}): see README, "Exchange"`);
  if (study.failureModes?.length) result.notCarried.push(`failure-mode sets (${study.failureModes.map((f) => f.id).join(', ')})`);
  if (study.counts?.length) result.notCarried.push(`gate counts (${study.counts.map((c) => c.id).join(', ')})`);
  if (study.scenarios.length) result.notCarried.push(`scenarios (${study.scenarios.map((c) => c.id).join(', ')})`);
  result.notCarried.push("study.yaml's people, dates other than as_of, scope and description; sources.yaml and assumptions.md (each parameter's source and note travel as its attributes)");
  if (study.fits.length) result.notCarried.push(`life-data fits (${study.fits.map((f) => f.id).join(', ')}): their estimates are exported as parameter values`);
  return result;
}

function eventNode(
  study: Study,
  e: BasicEvent,
  q: number,
  byKey: Map<string, Parameter>,
  paramRef: (key: string) => XmlNode,
  result: ExportResult,
): XmlNode {
  const head = [label(e.title)];
  if (e.model === 'switch') {
    return el('define-house-event', { name: e.id }, [...head, el('constant', { value: e.on ? 'true' : 'false' })]);
  }
  if (e.model === 'fixed') return el('define-basic-event', { name: e.id }, [...head, paramRef(e.fields.probability!)]);
  if (e.model === 'demand' && !e.fields.rate && !e.fields.interval) {
    // A demand model without its standby part is its per-demand probability.
    return el('define-basic-event', { name: e.id }, [...head, ...attributesNode([[`${META_PREFIX}model`, 'demand']]), paramRef(e.fields.probability!)]);
  }
  if (e.model === 'rate') {
    return el('define-basic-event', { name: e.id }, [...head, el('exponential', undefined, [paramRef(e.fields.rate!), paramRef(e.fields.exposure!)])]);
  }
  // No expression of the standard gives this model as faultbook computes it: its value at as_of.
  const described = describeModel(study, e, byKey);
  result.valuesAtAsOf.push(`${e.id}: ${described} → ${num(q)} at ${study.meta.as_of}`);
  const attrs: [string, string][] = [
    [`${META_PREFIX}model`, e.model],
    [`${META_PREFIX}parameters`, described],
    [`${META_PREFIX}value-at`, study.meta.as_of],
  ];
  return el('define-basic-event', { name: e.id }, [...head, ...attributesNode(attrs), floatNode(q)]);
}

/** "weibull: shape = 3.1, scale = 75 years, exercise = 1 month, age 32.17 years" for the attribute and the output. */
function describeModel(study: Study, e: BasicEvent, byKey: Map<string, Parameter>): string {
  const parts = Object.entries(e.fields).map(([field, key]) => {
    const p = byKey.get(key)!;
    return `${field} = ${p.fit ? `${num(p.value)}${p.quantity === 'duration' ? ' years' : ''} (fit ${p.fit})` : p.written}`;
  });
  if (e.ageYears !== undefined) parts.push(`age ${num(Number(e.ageYears.toPrecision(6)))} years from ${e.renewed ?? e.installed}`);
  if (e.model === 'weibull' && e.fields.exercise) parts.push(`exercise basis ${study.settings.exercise_basis}`);
  return `${e.model}: ${parts.join(', ')}`;
}

function ccfGroup(
  study: Study,
  group: CommonCauseGroup,
  total: Map<string, number>,
  byKey: Map<string, Parameter>,
  paramRef: (key: string) => XmlNode,
  result: ExportResult,
): XmlNode {
  const totals = group.members.map((m) => total.get(m)!);
  const equal = totals.every((t) => t === totals[0]);
  // The standard's group has one distribution for every member. faultbook keeps a member's own
  // total for its independent part and uses the mean for the shared events (DEVELOPERS.md), so
  // the mean is the distribution and the own totals travel as attributes.
  const distribution = equal ? totals[0]! : totals.reduce((a, b) => a + b, 0) / totals.length;
  const attrs: [string, string][] = [];
  const events = new Map(study.events.map((e) => [e.id, e]));
  group.members.forEach((m, i) => {
    attrs.push([`${MEMBER_TITLE_PREFIX}${m}`, events.get(m)!.title]);
    if (!equal) attrs.push([`${MEMBER_TOTAL_PREFIX}${m}`, num(totals[i]!)]);
    const e = events.get(m)!;
    if (e.model !== 'fixed') result.valuesAtAsOf.push(`${m} (member of ${group.id}): ${describeModel(study, e, byKey)} → ${num(totals[i]!)} at ${study.meta.as_of}`);
  });
  if (!equal) {
    result.notes.push(
      `common-cause group ${group.id}: members' totals differ; distribution = their mean ${num(distribution)}, own totals in attributes ${MEMBER_TOTAL_PREFIX}<member> (read by faultbook import; another tool applies the mean to every member)`,
    );
  }
  const m = group.members.length;
  let model: string;
  let factors: XmlNode[];
  const factor = (level: number, value: XmlNode) => el('factor', { level: String(level) }, [value]);
  switch (group.method) {
    case 'beta':
      model = 'beta-factor';
      factors = [el('factor', undefined, [paramRef(group.fields.beta!)])];
      break;
    case 'mgl':
      model = 'MGL';
      factors = ['beta', 'gamma', 'delta'].slice(0, m - 1).map((f, i) => factor(i + 2, paramRef(group.fields[f]!)));
      break;
    case 'alpha': {
      model = 'alpha-factor';
      const alphas = Array.from({ length: m }, (_, i) => byKey.get(group.fields[`alpha${i + 1}`]!)!.value);
      if (group.testing === 'non-staggered') {
        factors = alphas.map((_, i) => factor(i + 1, paramRef(group.fields[`alpha${i + 1}`]!)));
      } else {
        // meta_logical_layer.rst gives the non-staggered form Q_k = k/C(m−1,k−1) · α_k/Σiα_i · Q.
        // With α'_k = (α_k/k)/Σ_j(α_j/j) it equals the staggered α_k/C(m−1,k−1) · Q when Σα_k = 1.
        const scaled = alphas.map((a, i) => a / (i + 1));
        const sum = scaled.reduce((a, b) => a + b, 0);
        factors = scaled.map((a, i) => factor(i + 1, floatNode(a / sum)));
        attrs.push([`${META_PREFIX}testing`, 'staggered'], [`${META_PREFIX}alphas-as-given`, alphas.map(num).join(' ')]);
        result.notes.push(`common-cause group ${group.id}: alpha factors for staggered testing written in the standard's (non-staggered) form α'_k = (α_k/k)/Σ_j(α_j/j)`);
      }
      break;
    }
  }
  return el('define-CCF-group', { name: group.id, model }, [
    ...(group.title ? [label(group.title)] : []),
    ...attributesNode(attrs),
    el('members', undefined, group.members.map((id) => el('basic-event', { name: id }))),
    el('distribution', undefined, [floatNode(distribution)]),
    el('factors', undefined, factors),
  ]);
}
