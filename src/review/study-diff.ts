/**
 * What changed between two revisions of a study, read from the two typed `Study` values (never from
 * the YAML text, so reformatting, reordering or moving an entry between files is no change):
 * metadata side by side; logic (tops, gates, basic events, common-cause groups) added, removed,
 * re-wired or redefined; every parameter whose value, unit, source, note, range or uncertainty
 * changed; sources, assumptions, settings, scenarios and input files.
 *
 * Pure: two studies in, plain data out. Lists follow the NEW study's order, then what only OLD had.
 */
import type { BasicEvent, CommonCauseGroup, Gate, Parameter, Scenario, Study, Top, Uncertainty } from '../study/types.js';

export interface MetaRow {
  field: string;
  old: string;
  new: string;
  changed: boolean;
}

export type GateAspect = 'op' | 'k' | 'inputs' | 'title';
export interface GateSide {
  op: Gate['op'];
  k?: number;
  inputs: string[];
  title?: string;
}
export interface GateChange {
  id: string;
  aspects: GateAspect[];
  old: GateSide;
  new: GateSide;
  inputs_added: string[];
  inputs_removed: string[];
  /** True when only the order of the inputs changed (no effect on any probability). */
  reordered_only: boolean;
}

export type EventAspect = 'title' | 'model' | 'class' | 'fields' | 'installed' | 'renewed' | 'on' | 'assumptions';
export interface EventSide {
  title: string;
  model: BasicEvent['model'];
  class?: string;
  fields: Record<string, string>;
  installed?: string;
  renewed?: string;
  age_years?: number;
  on?: boolean;
  assumptions: string[];
}
export interface EventChange {
  id: string;
  aspects: EventAspect[];
  old: EventSide;
  new: EventSide;
}

export interface TopSide {
  title: string;
  gate: string;
}
export interface TopChange {
  id: string;
  aspects: ('title' | 'gate')[];
  old: TopSide;
  new: TopSide;
}

export interface GroupSide {
  title?: string;
  members: string[];
  method: CommonCauseGroup['method'];
  testing: CommonCauseGroup['testing'];
  fields: Record<string, string>;
}
export interface GroupChange {
  id: string;
  aspects: ('title' | 'members' | 'method' | 'testing' | 'fields')[];
  old: GroupSide;
  new: GroupSide;
}

export type ParameterAspect = 'value' | 'unit' | 'source' | 'note' | 'range' | 'uncertainty' | 'fit';
export interface ParameterSide {
  value: number;
  written: string;
  quantity: Parameter['quantity'];
  source?: string;
  /** The title the source has in that revision's sources list. */
  source_title?: string;
  note?: string;
  range?: [number, number];
  uncertainty?: Uncertainty;
  fit?: string;
}
export interface ParameterChange {
  key: string;
  owner: string;
  field: string;
  aspects: ParameterAspect[];
  old: ParameterSide;
  new: ParameterSide;
  /** Basic events that use it, in either revision. */
  used_by: string[];
}
export interface ParameterOnly {
  key: string;
  side: ParameterSide;
  used_by: string[];
}

export interface SourceSide {
  title: string;
  reference?: string;
  invented?: boolean;
  note?: string;
}
export interface TextChange<S> {
  id: string;
  old: S;
  new: S;
}

export interface AssumptionSide {
  title: string;
  body: string;
}

export interface SettingChange {
  name: string;
  old: number | string;
  new: number | string;
}

export interface FileChange {
  path: string;
  status: 'added' | 'removed' | 'changed';
  old_sha256?: string;
  new_sha256?: string;
}

export interface Added<S> {
  id: string;
  side: S;
}

/**
 * A change of a structure that does not enter the top events (count sets, event trees, failure-mode
 * sets): which of its top-level fields differ; both sides as plain data without file positions.
 */
export interface StructureChange {
  id: string;
  aspects: string[];
  old: Record<string, unknown>;
  new: Record<string, unknown>;
}

export interface StructureDiff {
  added: Added<Record<string, unknown>>[];
  removed: Added<Record<string, unknown>>[];
  changed: StructureChange[];
}

export interface StudyDiff {
  meta: MetaRow[];
  logic: {
    tops: { added: Added<TopSide>[]; removed: Added<TopSide>[]; changed: TopChange[] };
    gates: { added: Added<GateSide>[]; removed: Added<GateSide>[]; changed: GateChange[] };
    events: { added: Added<EventSide>[]; removed: Added<EventSide>[]; changed: EventChange[] };
    common_cause: { added: Added<GroupSide>[]; removed: Added<GroupSide>[]; changed: GroupChange[] };
    /** logic.yaml `counts:`, `event_trees:` and `failure_modes:` (they feed their own results, not the tops). */
    counts: StructureDiff;
    event_trees: StructureDiff;
    failure_modes: StructureDiff;
  };
  data: {
    parameters: { changed: ParameterChange[]; added: ParameterOnly[]; removed: ParameterOnly[] };
    sources: { added: Added<SourceSide>[]; removed: Added<SourceSide>[]; changed: TextChange<SourceSide>[] };
    assumptions: { added: Added<AssumptionSide>[]; removed: Added<AssumptionSide>[]; changed: TextChange<AssumptionSide>[] };
    settings: SettingChange[];
    scenarios: { added: string[]; removed: string[]; changed: string[] };
  };
  files: FileChange[];
  /** Nothing at all differs but the metadata (title, revision, people, dates other than as_of). */
  identical: boolean;
}

export function diffStudies(oldStudy: Study, newStudy: Study): StudyDiff {
  const diff: StudyDiff = {
    meta: metaRows(oldStudy, newStudy),
    logic: {
      tops: diffById(oldStudy.tops, newStudy.tops, topSide, (id, a, b) => topChange(id, a, b)),
      gates: diffById(oldStudy.gates, newStudy.gates, gateSide, gateChange),
      events: diffById(oldStudy.events, newStudy.events, eventSide, eventChange),
      common_cause: diffById(oldStudy.commonCause, newStudy.commonCause, groupSide, groupChange),
      counts: diffStructures(oldStudy.counts ?? [], newStudy.counts ?? []),
      event_trees: diffStructures(oldStudy.eventTrees ?? [], newStudy.eventTrees ?? []),
      failure_modes: diffStructures(oldStudy.failureModes ?? [], newStudy.failureModes ?? []),
    },
    data: {
      parameters: diffParameters(oldStudy, newStudy),
      sources: diffById(oldStudy.sources, newStudy.sources, sourceSide, (id, a, b) => (same(a, b) ? null : { id, old: a, new: b })),
      assumptions: diffById(oldStudy.assumptions, newStudy.assumptions, (a) => ({ title: a.title, body: a.body }), (id, a, b) => (same(a, b) ? null : { id, old: a, new: b })),
      settings: diffSettings(oldStudy, newStudy),
      scenarios: diffScenarios(oldStudy.scenarios, newStudy.scenarios),
    },
    files: diffFiles(oldStudy, newStudy),
    identical: false,
  };
  diff.identical =
    Object.values(diff.logic).every((x) => x.added.length + x.removed.length + x.changed.length === 0) &&
    diff.data.parameters.changed.length + diff.data.parameters.added.length + diff.data.parameters.removed.length === 0 &&
    diff.data.sources.added.length + diff.data.sources.removed.length + diff.data.sources.changed.length === 0 &&
    diff.data.assumptions.added.length + diff.data.assumptions.removed.length + diff.data.assumptions.changed.length === 0 &&
    diff.data.settings.length === 0 &&
    diff.data.scenarios.added.length + diff.data.scenarios.removed.length + diff.data.scenarios.changed.length === 0 &&
    !diff.meta.some((m) => m.changed && m.field === 'as_of');
  return diff;
}

/** Number of changes of every kind, for the summary line (metadata and files not counted). */
export function changeCount(d: StudyDiff): number {
  const l = d.logic;
  const p = d.data.parameters;
  return (
    [l.tops, l.gates, l.events, l.common_cause, l.counts, l.event_trees, l.failure_modes, d.data.sources, d.data.assumptions].reduce((n, x) => n + x.added.length + x.removed.length + x.changed.length, 0) +
    p.changed.length +
    p.added.length +
    p.removed.length +
    d.data.settings.length +
    d.data.scenarios.added.length +
    d.data.scenarios.removed.length +
    d.data.scenarios.changed.length +
    (d.meta.some((m) => m.changed && m.field === 'as_of') ? 1 : 0)
  );
}

function metaRows(a: Study, b: Study): MetaRow[] {
  const list = (x: string[]) => x.join('; ');
  const rows: [string, string, string][] = [
    ['title', a.meta.title, b.meta.title],
    ['facility', a.meta.facility, b.meta.facility],
    ['revision', a.meta.revision, b.meta.revision],
    ['status', a.meta.status, b.meta.status],
    ['issued', a.meta.issued ?? '', b.meta.issued ?? ''],
    ['as_of', a.meta.as_of, b.meta.as_of],
    ['prepared_by', list(a.meta.prepared_by), list(b.meta.prepared_by)],
    ['reviewed_by', list(a.meta.reviewed_by), list(b.meta.reviewed_by)],
    ['format', a.meta.format, b.meta.format],
    ['scope', a.meta.scope ?? '', b.meta.scope ?? ''],
    ['description', a.meta.description ?? '', b.meta.description ?? ''],
  ];
  return rows.map(([field, o, n]) => ({ field, old: o, new: n, changed: o !== n }));
}

/** Added, removed and changed entries of two id-keyed lists; `change` returns null for "the same". */
function diffById<T extends { id: string }, S, C>(
  olds: T[],
  news: T[],
  side: (x: T) => S,
  change: (id: string, a: S, b: S) => C | null,
): { added: Added<S>[]; removed: Added<S>[]; changed: C[] } {
  const oldById = new Map(olds.map((x) => [x.id, x]));
  const newIds = new Set(news.map((x) => x.id));
  const added: Added<S>[] = [];
  const changed: C[] = [];
  for (const n of news) {
    const o = oldById.get(n.id);
    if (!o) {
      added.push({ id: n.id, side: side(n) });
      continue;
    }
    const c = change(n.id, side(o), side(n));
    if (c) changed.push(c);
  }
  const removed = olds.filter((o) => !newIds.has(o.id)).map((o) => ({ id: o.id, side: side(o) }));
  return { added, removed, changed };
}

function topSide(t: Top): TopSide {
  return { title: t.title, gate: t.gate };
}
function topChange(id: string, a: TopSide, b: TopSide): TopChange | null {
  const aspects: TopChange['aspects'] = [];
  if (a.title !== b.title) aspects.push('title');
  if (a.gate !== b.gate) aspects.push('gate');
  return aspects.length ? { id, aspects, old: a, new: b } : null;
}

function gateSide(g: Gate): GateSide {
  const s: GateSide = { op: g.op, inputs: [...g.inputs] };
  if (g.k !== undefined) s.k = g.k;
  if (g.title !== undefined) s.title = g.title;
  return s;
}
function gateChange(id: string, a: GateSide, b: GateSide): GateChange | null {
  const aspects: GateAspect[] = [];
  if (a.op !== b.op) aspects.push('op');
  if (a.k !== b.k) aspects.push('k');
  const sameSet = sameMembers(a.inputs, b.inputs);
  const sameOrder = sameMembers(a.inputs, b.inputs, true);
  if (!sameOrder) aspects.push('inputs');
  if (a.title !== b.title) aspects.push('title');
  if (!aspects.length) return null;
  return {
    id,
    aspects,
    old: a,
    new: b,
    inputs_added: b.inputs.filter((x) => !a.inputs.includes(x)),
    inputs_removed: a.inputs.filter((x) => !b.inputs.includes(x)),
    reordered_only: sameSet && !sameOrder && aspects.length === 1,
  };
}

function eventSide(e: BasicEvent): EventSide {
  const s: EventSide = { title: e.title, model: e.model, fields: { ...e.fields }, assumptions: [...e.assumptions] };
  if (e.class !== undefined) s.class = e.class;
  if (e.installed !== undefined) s.installed = e.installed;
  if (e.renewed !== undefined) s.renewed = e.renewed;
  if (e.ageYears !== undefined) s.age_years = e.ageYears;
  if (e.on !== undefined) s.on = e.on;
  return s;
}
function eventChange(id: string, a: EventSide, b: EventSide): EventChange | null {
  const aspects: EventAspect[] = [];
  if (a.title !== b.title) aspects.push('title');
  if (a.model !== b.model) aspects.push('model');
  if (a.class !== b.class) aspects.push('class');
  if (!same(sortedEntries(a.fields), sortedEntries(b.fields))) aspects.push('fields');
  if (a.installed !== b.installed) aspects.push('installed');
  if (a.renewed !== b.renewed) aspects.push('renewed');
  if (a.on !== b.on) aspects.push('on');
  if (!sameMembers(a.assumptions, b.assumptions)) aspects.push('assumptions');
  return aspects.length ? { id, aspects, old: a, new: b } : null;
}

function groupSide(g: CommonCauseGroup): GroupSide {
  const s: GroupSide = { members: [...g.members], method: g.method, testing: g.testing, fields: { ...g.fields } };
  if (g.title !== undefined) s.title = g.title;
  return s;
}
function groupChange(id: string, a: GroupSide, b: GroupSide): GroupChange | null {
  const aspects: GroupChange['aspects'] = [];
  if (a.title !== b.title) aspects.push('title');
  if (!sameMembers(a.members, b.members)) aspects.push('members');
  if (a.method !== b.method) aspects.push('method');
  if (a.testing !== b.testing) aspects.push('testing');
  if (!same(sortedEntries(a.fields), sortedEntries(b.fields))) aspects.push('fields');
  return aspects.length ? { id, aspects, old: a, new: b } : null;
}

function sourceSide(s: Study['sources'][number]): SourceSide {
  const out: SourceSide = { title: s.title };
  if (s.reference !== undefined) out.reference = s.reference;
  if (s.invented) out.invented = true;
  if (s.note !== undefined) out.note = s.note;
  return out;
}

function parameterSide(p: Parameter, study: Study): ParameterSide {
  const s: ParameterSide = { value: p.value, written: p.written, quantity: p.quantity };
  if (p.source !== undefined) {
    s.source = p.source;
    const title = study.sources.find((x) => x.id === p.source)?.title;
    if (title !== undefined) s.source_title = title;
  }
  if (p.note !== undefined) s.note = p.note;
  if (p.range !== undefined) s.range = [p.range[0], p.range[1]];
  if (p.uncertainty !== undefined) s.uncertainty = { ...p.uncertainty };
  if (p.fit !== undefined) s.fit = p.fit;
  return s;
}

/** The unit as written (`months` and `month` are one unit): the text after the number, if any. */
export function writtenUnit(written: string): string {
  const m = /^\s*[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?\s*(.*)$/.exec(written);
  const unit = (m ? m[1]! : '').trim().toLowerCase();
  return unit.replace(/s$/, '');
}

function diffParameters(a: Study, b: Study): StudyDiff['data']['parameters'] {
  const usedBy = (key: string) => {
    const ids = new Set<string>();
    for (const s of [b, a]) for (const e of s.events) if (Object.values(e.fields).includes(key)) ids.add(e.id);
    return [...ids];
  };
  const oldByKey = new Map(a.parameters.map((p) => [p.key, p]));
  const newKeys = new Set(b.parameters.map((p) => p.key));
  const changed: ParameterChange[] = [];
  const added: ParameterOnly[] = [];
  for (const np of b.parameters) {
    const op = oldByKey.get(np.key);
    if (!op) {
      added.push({ key: np.key, side: parameterSide(np, b), used_by: usedBy(np.key) });
      continue;
    }
    const o = parameterSide(op, a);
    const n = parameterSide(np, b);
    const aspects: ParameterAspect[] = [];
    if (!Object.is(o.value, n.value)) aspects.push('value');
    if (writtenUnit(o.written) !== writtenUnit(n.written) && !o.fit && !n.fit) aspects.push('unit');
    // A source whose own title changed is listed under sources; here only a different source counts.
    if (o.source !== n.source) aspects.push('source');
    if (o.note !== n.note) aspects.push('note');
    if (!same(o.range, n.range)) aspects.push('range');
    if (!same(o.uncertainty, n.uncertainty)) aspects.push('uncertainty');
    if (o.fit !== n.fit) aspects.push('fit');
    if (aspects.length) changed.push({ key: np.key, owner: np.owner, field: np.field, aspects, old: o, new: n, used_by: usedBy(np.key) });
  }
  const removed = a.parameters.filter((p) => !newKeys.has(p.key)).map((p) => ({ key: p.key, side: parameterSide(p, a), used_by: usedBy(p.key) }));
  return { changed, added, removed };
}

function diffSettings(a: Study, b: Study): SettingChange[] {
  const out: SettingChange[] = [];
  const names = [...new Set([...Object.keys(b.settings), ...Object.keys(a.settings)])] as (keyof Study['settings'])[];
  for (const name of names) {
    const o = a.settings[name];
    const n = b.settings[name];
    if (!Object.is(o, n)) out.push({ name, old: o, new: n });
  }
  return out;
}

function scenarioKey(s: Scenario): string {
  return JSON.stringify({
    title: s.title,
    set: s.set.map((x) => [x.key, x.value]).sort(),
    switches: s.switches.map((x) => [x.event, x.on]).sort(),
    renew: s.renew.map((x) => [x.event, x.date]).sort(),
  });
}
function diffScenarios(a: Scenario[], b: Scenario[]): StudyDiff['data']['scenarios'] {
  const oldById = new Map(a.map((s) => [s.id, s]));
  const newIds = new Set(b.map((s) => s.id));
  return {
    added: b.filter((s) => !oldById.has(s.id)).map((s) => s.id),
    removed: a.filter((s) => !newIds.has(s.id)).map((s) => s.id),
    changed: b.filter((s) => oldById.has(s.id) && scenarioKey(oldById.get(s.id)!) !== scenarioKey(s)).map((s) => s.id),
  };
}

function diffFiles(a: Study, b: Study): FileChange[] {
  const oldByPath = new Map(a.files.map((f) => [f.path, f.sha256]));
  const newPaths = new Set(b.files.map((f) => f.path));
  const out: FileChange[] = [];
  for (const f of b.files) {
    const o = oldByPath.get(f.path);
    if (o === undefined) out.push({ path: f.path, status: 'added', new_sha256: f.sha256 });
    else if (o !== f.sha256) out.push({ path: f.path, status: 'changed', old_sha256: o, new_sha256: f.sha256 });
  }
  for (const f of a.files) if (!newPaths.has(f.path)) out.push({ path: f.path, status: 'removed', old_sha256: f.sha256 });
  return out;
}

function diffStructures<T extends { id: string }>(olds: T[], news: T[]): StructureDiff {
  return diffById(olds, news, (x) => withoutPositions(x) as Record<string, unknown>, (id, a, b) => {
    const aspects = [...new Set([...Object.keys(b), ...Object.keys(a)])].filter((k) => !same(a[k], b[k]));
    return aspects.length ? { id, aspects, old: a, new: b } : null;
  });
}

/** Plain data with every `at` (file position) removed: moving an entry in its file is no change. */
function withoutPositions(x: unknown): unknown {
  if (Array.isArray(x)) return x.map(withoutPositions);
  if (x && typeof x === 'object') {
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(x)) if (k !== 'at') out[k] = withoutPositions(v);
    return out;
  }
  return x;
}

function sortedEntries(r: Record<string, string>): [string, string][] {
  return Object.entries(r).sort((x, y) => (x[0] < y[0] ? -1 : x[0] > y[0] ? 1 : 0));
}

function sameMembers(a: string[], b: string[], ordered = false): boolean {
  if (a.length !== b.length) return false;
  if (ordered) return a.every((x, i) => x === b[i]);
  const sa = [...a].sort();
  const sb = [...b].sort();
  return sa.every((x, i) => x === sb[i]);
}

/** Structural equality of plain data (key order ignored). */
function same(a: unknown, b: unknown): boolean {
  return canonical(a) === canonical(b);
}
function canonical(x: unknown): string {
  if (x === undefined) return 'undefined';
  if (Array.isArray(x)) return `[${x.map(canonical).join(',')}]`;
  if (x && typeof x === 'object') {
    return `{${Object.keys(x)
      .sort()
      .map((k) => `${JSON.stringify(k)}:${canonical((x as Record<string, unknown>)[k])}`)
      .join(',')}}`;
  }
  return JSON.stringify(x) ?? String(x);
}
