/**
 * Reading logic.yaml `counts:`, `event_trees:` and `failure_modes:` into typed study parts, with
 * every reference resolved and every event tree checked to be a proper tree: each combination of
 * branch states falls in exactly one sequence, so the sequences of a load range add up to it.
 *
 *   counts:
 *     gates-failing: { title: …, of: [gate-1-fails, gate-2-fails, gate-3-fails, gate-4-fails] }
 *   event_trees:
 *     flood-response:
 *       load: { title: …, source: …, ranges: { r1: { title: …, aep: [1e-2, 1e-3] }, … } }
 *       headings:
 *         enough-gates: { title: …, fails: { atleast: { r1: 4, r2: 3 }, of: gates-failing } }
 *         crest-holds:  { title: …, fails: { by_range: { r1: 0.02, r2: 0.1 } } }
 *       outcomes: { safe: { title: … }, breach: { title: … } }
 *       sequences:
 *         - { when: { enough-gates: works }, outcome: safe }
 *         - { when: { enough-gates: fails, crest-holds: fails }, outcome: breach }
 *   failure_modes:
 *     dam: { title: …, load: flood-response, modes: { overtopping: { outcome: breach }, piping: { by_range: {…} } } }
 *
 * Numbers of trees and mode sets become Parameters (owner kinds `tree` and `modes`), so they carry
 * sources and appear in the provenance register like every other number.
 */
import { ErrorCollector, FollowOnError, StudyError } from './errors.js';
import { readParameter } from './quantities.js';
import { entriesOf, type Sections } from './sections.js';
import type {
  BasicEvent,
  BranchCondition,
  BranchState,
  CountSet,
  EventTree,
  FailureModeSet,
  Gate,
  Heading,
  LoadRange,
  ModeBasis,
  Parameter,
  Pos,
  Top,
  TreeSequence,
} from './types.js';
import type { PathSegment, YamlFile } from './yaml.js';

export interface TreeParts {
  sections: Sections;
  gates: Gate[];
  tops: Top[];
  events: BasicEvent[];
  /** Ids of events and gates that were written but refused (already reported). */
  refused?: Set<string>;
  /** The study's parameters so far; the numbers read here are appended. */
  parameters: Parameter[];
  /** Source ids, for a load's `source:`. */
  sourceIds: Set<string>;
  fitted: (fitId: string, field: string, at: Pos) => { value: number; written: string };
}

export interface SharedCauseSections {
  counts: CountSet[];
  eventTrees: EventTree[];
  failureModes: FailureModeSet[];
}

/** All three sections; problems are collected and thrown together. */
export function readSharedCauseSections(parts: TreeParts): SharedCauseSections {
  const collector = new ErrorCollector();
  const attempt = <T>(fn: () => T): T | undefined => collector.attempt(fn);
  const names = new Names(parts);
  const counts: CountSet[] = [];
  for (const { id, raw, file } of entriesOf(parts.sections, 'counts')) {
    const c = attempt(() => readCount(id, raw, file, names));
    if (c) counts.push(c);
  }
  names.counts = new Map(counts.map((c) => [c.id, c]));
  const eventTrees: EventTree[] = [];
  for (const { id, raw, file } of entriesOf(parts.sections, 'event_trees')) {
    const t = attempt(() => readTree(id, raw, file, names, parts));
    if (t) eventTrees.push(t);
  }
  const failureModes: FailureModeSet[] = [];
  const trees = new Map(eventTrees.map((t) => [t.id, t]));
  // A tree that was written but refused is already reported; its mode sets are not checked against it.
  const refused = new Set(entriesOf(parts.sections, 'event_trees').map((e) => e.id).filter((id) => !trees.has(id)));
  for (const { id, raw, file } of entriesOf(parts.sections, 'failure_modes')) {
    if (refused.has(String(raw.load))) continue;
    const f = attempt(() => readModes(id, raw, file, trees, parts));
    if (f) failureModes.push(f);
  }
  collector.throwIfAny();
  return { counts, eventTrees, failureModes };
}

/** What an id in a count or a condition may name, and the words for a message when it names nothing. */
class Names {
  readonly gates: Set<string>;
  readonly tops: Map<string, Top>;
  readonly events: Set<string>;
  readonly refused: Set<string>;
  counts = new Map<string, CountSet>();
  constructor(parts: TreeParts) {
    this.gates = new Set(parts.gates.map((g) => g.id));
    this.tops = new Map(parts.tops.map((t) => [t.id, t]));
    this.events = new Set(parts.events.map((e) => e.id));
    this.refused = parts.refused ?? new Set();
  }
  /** A gate, top or event id; one that was written but refused counts too (its own error says why). */
  isLogic(id: string): boolean {
    return this.gates.has(id) || this.tops.has(id) || this.events.has(id) || this.refused.has(id);
  }
}

function readCount(id: string, raw: Record<string, unknown>, file: YamlFile, names: Names): CountSet {
  const of = Array.isArray(raw.of) ? raw.of.map(String) : [];
  const at = file.keyAt(['counts', id]);
  checkMembers(of, file, ['counts', id, 'of'], `count '${id}'`, names);
  return { id, title: String(raw.title ?? id), of, at };
}

function checkMembers(of: string[], file: YamlFile, path: PathSegment[], what: string, names: Names): void {
  const at = file.at(path);
  if (of.length === 0) throw new StudyError(`${what} counts nothing`, at, 'a list of one or more gate, top or basic-event ids');
  const seen = new Set<string>();
  of.forEach((m, i) => {
    if (seen.has(m)) throw new StudyError(`${what} lists '${m}' twice`, file.at([...path, i]), 'each gate once');
    seen.add(m);
    if (!names.isLogic(m)) throw new StudyError(`${what} names '${m}', which is no gate, top or basic event`, file.at([...path, i]), 'the id of a gate, a top or a basic event');
  });
}

/** A number of a tree or a mode set, read with the domain of `quantity` and keyed `<owner>.<field>`. */
function readNumber(
  raw: unknown,
  where: { file: YamlFile; path: PathSegment[]; owner: string; ownerKind: 'tree' | 'modes'; field: string; quantity: 'probability' | 'rate'; defaultSource?: string },
  parts: TreeParts,
): Parameter {
  // The quantity's own field name gives the domain check and units; the key is then renamed.
  const p = readParameter(raw, {
    file: where.file,
    path: where.path,
    owner: where.owner,
    ownerKind: where.ownerKind,
    field: where.quantity,
    ...(where.defaultSource ? { defaultSource: where.defaultSource } : {}),
    fitted: parts.fitted,
  });
  p.field = where.field;
  p.key = `${where.owner}.${where.field}`;
  const clash = parts.parameters.find((q) => q.key === p.key);
  if (clash) throw new StudyError(`the number '${p.key}' is defined twice (also at ${clash.at.file}:${clash.at.line})`, p.at, 'distinct ids for trees, ranges, headings and modes');
  parts.parameters.push(p);
  return p;
}

function readTree(id: string, raw: Record<string, unknown>, file: YamlFile, names: Names, parts: TreeParts): EventTree {
  const base: PathSegment[] = ['event_trees', id];
  const at = file.keyAt(base);
  const load = (raw.load ?? {}) as Record<string, unknown>;
  const source = typeof load.source === 'string' ? load.source : undefined;
  if (source !== undefined && !parts.sourceIds.has(source)) {
    throw new StudyError(`event tree '${id}': the load cites unknown source '${source}'`, file.at([...base, 'load', 'source']), parts.sourceIds.size ? `one of the sources: ${[...parts.sourceIds].join(', ')}` : "a source declared under 'sources:'");
  }
  const rangesRaw = (load.ranges ?? {}) as Record<string, Record<string, unknown>>;
  const ranges: LoadRange[] = [];
  const aepValues: { id: string; upper: number; lower: number; at: Pos }[] = [];
  for (const [rid, r] of Object.entries(rangesRaw)) {
    const rPath = [...base, 'load', 'ranges', rid];
    const rAt = file.keyAt(rPath);
    const title = String(r?.title ?? rid);
    if (r?.aep !== undefined && r?.frequency !== undefined) throw new StudyError(`load range '${rid}' gives both 'aep' and 'frequency'`, rAt, "either 'aep: [upper, lower]' or 'frequency: 0.1 /year'");
    if (Array.isArray(r?.aep)) {
      if (r.aep.length !== 2) throw new StudyError(`load range '${rid}': 'aep' needs two values`, file.at([...rPath, 'aep']), 'aep: [more frequent bound, rarer bound], e.g. [1e-2, 1e-3]');
      const num = (i: number, field: string) =>
        readNumber((r.aep as unknown[])[i], { file, path: [...rPath, 'aep', i], owner: id, ownerKind: 'tree', field: `${rid}.${field}`, quantity: 'probability', ...(source ? { defaultSource: source } : {}) }, parts);
      const upper = num(0, 'aep_upper');
      const lower = num(1, 'aep_lower');
      if (!(upper.value > lower.value)) {
        throw new StudyError(`load range '${rid}' runs from AEP ${upper.written} to ${lower.written}`, file.at([...rPath, 'aep']), 'the more frequent (larger) exceedance probability first, e.g. [1e-2, 1e-3]');
      }
      aepValues.push({ id: rid, upper: upper.value, lower: lower.value, at: rAt });
      ranges.push({ id: rid, title, basis: 'aep', aep: [upper.key, lower.key], at: rAt });
    } else if (r?.frequency !== undefined) {
      const f = readNumber(r.frequency, { file, path: [...rPath, 'frequency'], owner: id, ownerKind: 'tree', field: `${rid}.frequency`, quantity: 'rate', ...(source ? { defaultSource: source } : {}) }, parts);
      ranges.push({ id: rid, title, basis: 'frequency', frequency: f.key, at: rAt });
    } else {
      throw new StudyError(`load range '${rid}' has neither 'aep' nor 'frequency'`, rAt, "'aep: [1e-2, 1e-3]' (annual exceedance probabilities bounding the range) or 'frequency: 0.1 /year'");
    }
  }
  if (ranges.length === 0) throw new StudyError(`event tree '${id}' has no load ranges`, file.keyAt([...base, 'load']), "'load: { ranges: { r1: { aep: [1e-2, 1e-3] } } }' (one range for a single initiating frequency)");
  // AEP ranges must not overlap: a flood counted in two ranges would be counted twice.
  const sorted = [...aepValues].sort((a, b) => b.upper - a.upper);
  for (let i = 1; i < sorted.length; i++) {
    if (sorted[i]!.upper > sorted[i - 1]!.lower) {
      throw new StudyError(`load ranges '${sorted[i - 1]!.id}' and '${sorted[i]!.id}' overlap`, sorted[i]!.at, 'ranges of annual exceedance probability that do not overlap (one may start where another ends)');
    }
  }
  const rangeIds = ranges.map((r) => r.id);

  const headings: Heading[] = [];
  for (const [hid, h] of Object.entries((raw.headings ?? {}) as Record<string, Record<string, unknown>>)) {
    const hPath = [...base, 'headings', hid];
    headings.push({ id: hid, title: String(h?.title ?? hid), fails: readCondition(h?.fails, file, [...hPath, 'fails'], id, hid, rangeIds, names, parts), at: file.keyAt(hPath) });
  }

  const outcomes = Object.entries((raw.outcomes ?? {}) as Record<string, Record<string, unknown>>).map(([oid, o]) => ({
    id: oid,
    title: String(o?.title ?? oid),
    at: file.keyAt([...base, 'outcomes', oid]),
  }));
  const outcomeIds = new Set(outcomes.map((o) => o.id));
  if (outcomes.length === 0) throw new StudyError(`event tree '${id}' has no outcomes`, at, "'outcomes: { passes-safely: { title: … }, breach: { title: … } }'");

  const headingIndex = new Map(headings.map((h, i) => [h.id, i]));
  const rawSequences = Array.isArray(raw.sequences) ? (raw.sequences as Record<string, unknown>[]) : [];
  const written: Omit<TreeSequence, 'id'>[] = rawSequences.map((s, i) => {
    const sPath = [...base, 'sequences', i];
    const sAt = file.at(sPath);
    const path: (BranchState | null)[] = headings.map(() => null);
    for (const [hid, state] of Object.entries((s?.when ?? {}) as Record<string, unknown>)) {
      const h = headingIndex.get(hid);
      const kAt = file.keyAt([...sPath, 'when', hid]);
      if (h === undefined) throw new StudyError(`a sequence of '${id}' names unknown heading '${hid}'`, kAt, `one of the headings: ${headings.map((x) => x.id).join(', ') || '(none)'}`);
      if (state !== 'works' && state !== 'fails') throw new StudyError(`a sequence of '${id}' gives heading '${hid}' the state '${String(state)}'`, kAt, "'works' or 'fails'");
      path[h] = state;
    }
    const outcome = String(s?.outcome ?? '');
    if (!outcomeIds.has(outcome)) throw new StudyError(`a sequence of '${id}' ends in unknown outcome '${outcome}'`, file.at([...sPath, 'outcome']), `one of the outcomes: ${[...outcomeIds].join(', ')}`);
    return { path, outcome, at: sAt };
  });
  const arranged = arrangeSequences(written, headings.map((h) => h.id), at);
  const sequences = arranged.map((s, i) => ({ id: `S${i + 1}`, ...s }));

  const tree: EventTree = { id, title: String(raw.title ?? id), load: { title: String(load.title ?? 'Initiating load'), ranges }, headings, outcomes, sequences, at };
  if (source) tree.load.source = source;
  if (typeof load.note === 'string') tree.load.note = load.note;
  return tree;
}

function readCondition(
  raw: unknown,
  file: YamlFile,
  path: PathSegment[],
  tree: string,
  heading: string,
  rangeIds: string[],
  names: Names,
  parts: TreeParts,
): BranchCondition {
  const at = file.at(path);
  const expected = "one of 'probability: p', 'by_range: { <range>: p, … }', 'gate: <gate id>', 'top: <top id>' or 'atleast: k (or { <range>: k, … }), of: <count id or list>'";
  const c = (raw ?? {}) as Record<string, unknown>;
  const kinds = ['probability', 'by_range', 'gate', 'top', 'atleast'].filter((k) => c[k] !== undefined);
  if (kinds.length !== 1) throw new StudyError(kinds.length === 0 ? `heading '${heading}' has no failure condition` : `heading '${heading}' mixes ${kinds.join(' and ')}`, at, expected);
  if (c.of !== undefined && kinds[0] !== 'atleast') throw new StudyError(`heading '${heading}': 'of' goes with 'atleast'`, file.keyAt([...path, 'of']), expected);
  const source = typeof c.source === 'string' ? c.source : undefined;
  if (source !== undefined && kinds[0] !== 'probability' && kinds[0] !== 'by_range') {
    throw new StudyError(`heading '${heading}': 'source' goes with 'probability' or 'by_range'`, file.keyAt([...path, 'source']), 'the source on the numbers, not on a logic condition');
  }
  switch (kinds[0]) {
    case 'probability': {
      const p = readNumber(c.probability, { file, path: [...path, 'probability'], owner: tree, ownerKind: 'tree', field: `${heading}.probability`, quantity: 'probability', ...(source ? { defaultSource: source } : {}) }, parts);
      return { kind: 'probability', key: p.key };
    }
    case 'by_range':
      return { kind: 'by-range', keys: readByRange(c.by_range, file, [...path, 'by_range'], tree, 'tree', heading, rangeIds, parts, source) };
    case 'gate': {
      const g = String(c.gate);
      if (!names.gates.has(g) && names.refused.has(g)) throw new FollowOnError(`heading '${heading}' names gate '${g}', which was refused`, file.at([...path, 'gate']), 'see the error for it');
      if (!names.gates.has(g)) throw new StudyError(`heading '${heading}' names unknown gate '${g}'`, file.at([...path, 'gate']), names.tops.has(g) ? `'top: ${g}' (it is a top)` : 'a gate id from logic.yaml');
      return { kind: 'gate', gate: g };
    }
    case 'top': {
      const t = names.tops.get(String(c.top));
      if (!t) throw new StudyError(`heading '${heading}' names unknown top '${String(c.top)}'`, file.at([...path, 'top']), `one of the tops: ${[...names.tops.keys()].join(', ')}`);
      return { kind: 'gate', gate: t.gate, top: t.id };
    }
    default: {
      let of: string[];
      let count: string | undefined;
      if (typeof c.of === 'string') {
        const set = names.counts.get(c.of);
        if (!set) throw new StudyError(`heading '${heading}' counts unknown set '${c.of}'`, file.at([...path, 'of']), names.counts.size ? `one of the counts: ${[...names.counts.keys()].join(', ')}, or a list of ids` : "a set under 'counts:', or a list of gate ids");
        of = set.of;
        count = set.id;
      } else if (Array.isArray(c.of)) {
        of = c.of.map(String);
        checkMembers(of, file, [...path, 'of'], `heading '${heading}'`, names);
      } else {
        throw new StudyError(`heading '${heading}' has 'atleast' without 'of'`, at, "'of: <count id>' or 'of: [gate-1-fails, gate-2-fails, …]'");
      }
      const n = of.length;
      const kAt = file.at([...path, 'atleast']);
      const checkK = (k: unknown, where: Pos): number => {
        if (typeof k !== 'number' || !Number.isInteger(k) || k < 0 || k > n + 1) {
          throw new StudyError(`heading '${heading}': at least ${String(k)} of ${n}`, where, `a whole number from 0 (fails whatever the gates do) to ${n + 1} (cannot fail)`);
        }
        return k;
      };
      let k: number[];
      if (typeof c.atleast === 'object' && c.atleast !== null) {
        const byRange = c.atleast as Record<string, unknown>;
        for (const r of Object.keys(byRange)) {
          if (!rangeIds.includes(r)) throw new StudyError(`heading '${heading}' gives k for unknown load range '${r}'`, file.keyAt([...path, 'atleast', r]), `one of the ranges: ${rangeIds.join(', ')}`);
        }
        k = rangeIds.map((r) => {
          if (byRange[r] === undefined) throw new StudyError(`heading '${heading}' gives no k for load range '${r}'`, kAt, `a k for every range: ${rangeIds.join(', ')}`);
          return checkK(byRange[r], file.at([...path, 'atleast', r]));
        });
      } else {
        const one = checkK(c.atleast, kAt);
        k = rangeIds.map(() => one);
      }
      const out: BranchCondition = { kind: 'atleast', k, of };
      if (count) out.count = count;
      return out;
    }
  }
}

/** A probability per load range, every range given and no other. */
function readByRange(
  raw: unknown,
  file: YamlFile,
  path: PathSegment[],
  owner: string,
  ownerKind: 'tree' | 'modes',
  item: string,
  rangeIds: string[],
  parts: TreeParts,
  source?: string,
): string[] {
  const byRange = (raw ?? {}) as Record<string, unknown>;
  for (const r of Object.keys(byRange)) {
    if (!rangeIds.includes(r)) throw new StudyError(`'${item}' gives a probability for unknown load range '${r}'`, file.keyAt([...path, r]), `one of the ranges: ${rangeIds.join(', ')}`);
  }
  return rangeIds.map((r) => {
    if (byRange[r] === undefined) throw new StudyError(`'${item}' gives no probability for load range '${r}'`, file.at(path), `a probability for every range: ${rangeIds.join(', ')}`);
    return readNumber(byRange[r], { file, path: [...path, r], owner, ownerKind, field: `${item}.${r}`, quantity: 'probability', ...(source ? { defaultSource: source } : {}) }, parts).key;
  });
}

/**
 * Puts the sequences in tree order and checks they form a tree over the headings (in their
 * order): at each branch point every sequence below it either asks the next heading or none does;
 * an asked heading has sequences on both branches; each full path ends in exactly one sequence.
 * Then every combination of branch states belongs to exactly one sequence.
 */
export function arrangeSequences<S extends { path: (BranchState | null)[]; at: Pos }>(sequences: S[], headings: string[], treeAt: Pos): S[] {
  const out: S[] = [];
  const describe = (prefix: (BranchState | null)[]): string => {
    const asked = prefix.map((s, i) => (s ? `${headings[i]} ${s}` : null)).filter(Boolean);
    return asked.length ? `after ${asked.join(', ')}` : 'at the start of the tree';
  };
  const walk = (group: S[], depth: number, prefix: (BranchState | null)[]): void => {
    if (depth === headings.length) {
      if (group.length === 0) throw new StudyError(`no sequence covers the branch ${describe(prefix)}`, treeAt, 'one sequence for every end of the tree');
      if (group.length > 1) throw new StudyError(`${group.length} sequences cover the same branch (${describe(prefix)})`, group[1]!.at, 'each branch in one sequence only');
      out.push(group[0]!);
      return;
    }
    const asked = group.filter((s) => s.path[depth] !== null);
    if (asked.length === 0) {
      walk(group, depth + 1, [...prefix, null]);
      return;
    }
    if (asked.length !== group.length) {
      const loose = group.find((s) => s.path[depth] === null)!;
      throw new StudyError(
        `sequences overlap ${describe(prefix)}: some ask heading '${headings[depth]}' and this one does not, so it covers both of its branches`,
        loose.at,
        `either every sequence ${describe(prefix)} states '${headings[depth]}: works' or 'fails', or none does`,
      );
    }
    for (const state of ['works', 'fails'] as const) {
      const branch = group.filter((s) => s.path[depth] === state);
      if (branch.length === 0) throw new StudyError(`no sequence covers '${headings[depth]}: ${state}' ${describe(prefix)}`, treeAt, 'a sequence for both branches of every heading asked');
      walk(branch, depth + 1, [...prefix, state]);
    }
  };
  if (sequences.length === 0) throw new StudyError('the event tree has no sequences', treeAt, "'sequences: [ { when: { <heading>: works }, outcome: <outcome> }, … ]'");
  walk(sequences, 0, []);
  return out;
}

function readModes(id: string, raw: Record<string, unknown>, file: YamlFile, trees: Map<string, EventTree>, parts: TreeParts): FailureModeSet {
  const base: PathSegment[] = ['failure_modes', id];
  const at = file.keyAt(base);
  const treeId = String(raw.load ?? '');
  const tree = trees.get(treeId);
  if (!tree) throw new StudyError(`failure modes '${id}' name unknown event tree '${treeId}' as their load`, file.at([...base, 'load']), trees.size ? `one of the event trees: ${[...trees.keys()].join(', ')}` : "an event tree under 'event_trees:' whose load ranges the modes share");
  const rangeIds = tree.load.ranges.map((r) => r.id);
  const modes: FailureModeSet['modes'] = [];
  for (const [mid, m] of Object.entries((raw.modes ?? {}) as Record<string, Record<string, unknown>>)) {
    const mPath = [...base, 'modes', mid];
    const mAt = file.keyAt(mPath);
    const kinds = ['outcome', 'by_range', 'probability'].filter((k) => m?.[k] !== undefined);
    const expected = "one of 'outcome: <outcome of the tree>', 'by_range: { <range>: p, … }' or 'probability: p'";
    if (kinds.length !== 1) throw new StudyError(kinds.length === 0 ? `failure mode '${mid}' has no probability` : `failure mode '${mid}' mixes ${kinds.join(' and ')}`, mAt, expected);
    const source = typeof m.source === 'string' ? m.source : undefined;
    if (source !== undefined && kinds[0] === 'outcome') throw new StudyError(`failure mode '${mid}': 'source' goes with 'by_range' or 'probability'`, file.keyAt([...mPath, 'source']), 'the source on the numbers; an outcome takes its numbers from the event tree');
    let basis: ModeBasis;
    if (kinds[0] === 'outcome') {
      const o = String(m.outcome);
      if (!tree.outcomes.some((x) => x.id === o)) throw new StudyError(`failure mode '${mid}' names outcome '${o}', which tree '${tree.id}' does not have`, file.at([...mPath, 'outcome']), `one of: ${tree.outcomes.map((x) => x.id).join(', ')}`);
      basis = { kind: 'outcome', outcome: o };
    } else if (kinds[0] === 'by_range') {
      basis = { kind: 'by-range', keys: readByRange(m.by_range, file, [...mPath, 'by_range'], id, 'modes', mid, rangeIds, parts, source) };
    } else {
      basis = { kind: 'probability', key: readNumber(m.probability, { file, path: [...mPath, 'probability'], owner: id, ownerKind: 'modes', field: `${mid}.probability`, quantity: 'probability', ...(source ? { defaultSource: source } : {}) }, parts).key };
    }
    modes.push({ id: mid, title: String(m?.title ?? mid), basis, at: mAt });
  }
  if (modes.length === 0) throw new StudyError(`failure modes '${id}' list no modes`, at, "'modes: { overtopping: { outcome: breach }, piping: { by_range: { … } } }'");
  return { id, title: String(raw.title ?? id), tree: tree.id, modes, at };
}
