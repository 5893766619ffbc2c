/**
 * From parsed, structurally valid study files to the typed `Study`: parameters in canonical units,
 * classes merged into events, gates and tops typed, every reference resolved. Problems are collected
 * (so one run reports as many as it can) and thrown together.
 */
import { parseDate, yearsBetween } from '../reliability/units.js';
import { ErrorCollector, FollowOnError, StudyError, StudyErrors } from './errors.js';
import { checkLogic, suggest } from './check-logic.js';
import { readSharedCauseSections } from './event-trees.js';
import { fitProvenance, fittedValue } from './fits.js';
import { lint } from './lint.js';
import { readParameter, readQuantity, checkDomain, quantityOfField } from './quantities.js';
import { entriesOf, mergeSections, type Sections } from './sections.js';
import {
  MODEL_FIELDS,
  OPTIONAL_SECTIONS,
  type OptionalSection,
  type ReportOptions,
  type Assumption,
  type BasicEvent,
  type CommonCauseGroup,
  type FitSpec,
  type Gate,
  type InputFile,
  type ModelKind,
  type Parameter,
  type Pos,
  type Scenario,
  type Settings,
  type Source,
  type Study,
  type StudyMeta,
  type Top,
} from './types.js';
import type { YamlFile } from './yaml.js';

export const DEFAULT_SETTINGS: Settings = {
  cutoff: 1e-12,
  max_order: 8,
  max_cut_sets: 10_000,
  samples: 20000,
  seed: 20260630,
  horizon: 30,
  // Live decision-diagram nodes: about 2 GB of node tables at ~32 bytes a node (node 16, unique
  // table 4, visit stamp 4, computed cache 4, collection scratch 5); garbage is collected, so only
  // the diagrams in use count (logic/bdd.ts).
  max_nodes: 64_000_000,
  on_node_budget: 'stop',
  exercise_basis: 'end',
  sensitivity_factor: 2,
  sampling: 'monte-carlo',
};

/** Runs one fit (the reader supplies it: fitting reads data files). */
export type FitRunner = (fit: FitSpec, asOf?: string) => void;

export interface BuildInput {
  root: string;
  yamlFiles: YamlFile[];
  assumptions: Assumption[];
  files: InputFile[];
  runFit: FitRunner;
}

export function buildStudy(input: BuildInput): Study {
  const collector = new ErrorCollector();
  const errors = collector.errors;
  const attempt = <T>(fn: () => T): T | undefined => collector.attempt(fn);
  const sections = mergeSections(input.yamlFiles);
  const meta = attempt(() => readMeta(sections));
  const settings = attempt(() => readSettings(sections)) ?? DEFAULT_SETTINGS;
  const asOf = meta?.as_of;

  const sources = entriesOf(sections, 'sources').map(({ id, raw, file }): Source => {
    const s: Source = { id, title: String(raw.title ?? id), at: file.keyAt(['sources', id]) };
    if (typeof raw.reference === 'string') s.reference = raw.reference;
    if (raw.invented === true) s.invented = true;
    if (typeof raw.note === 'string') s.note = raw.note;
    return s;
  });

  const fits = entriesOf(sections, 'fits').map(({ id, raw, file }): FitSpec => {
    const f: FitSpec = {
      id,
      data: String(raw.data),
      method: raw.method === 'rank' ? 'rank' : 'mle',
      threeParameter: raw.location === true,
      confidence: typeof raw.confidence === 'number' ? raw.confidence : 0.9,
      at: file.at(['fits', id, 'data']),
    };
    if (typeof raw.life_unit === 'string') f.lifeUnit = raw.life_unit;
    if (typeof raw.group === 'string') f.group = raw.group;
    if (typeof raw.source === 'string') f.source = raw.source;
    if (typeof raw.note === 'string') f.note = raw.note;
    return f;
  });
  // Every fit runs, used or not, so bad records surface as errors either way.
  for (const f of fits) attempt(() => input.runFit(f, asOf));
  const fitSources = new Map(fits.map((f) => [f.id, f]));

  const parameters: Parameter[] = [];
  const fittedLookup = (fitId: string, field: string, at: Pos) => {
    const fit = fits.find((f) => f.id === fitId);
    if (!fit) throw new StudyError(`unknown fit '${fitId}'`, at, fits.length ? `one of the fits: ${fits.map((f) => f.id).join(', ')}` : "a fit declared under 'fits:' in events.yaml");
    if (!fit.result) throw new FollowOnError(`fit '${fitId}' could not be made (see the error for its data file)`, at, 'a fit whose data file reads and fits');
    return fittedValue(fit, field, at);
  };

  // Classes: each numeric field becomes one shared parameter.
  const classes = new Map<string, { model?: ModelKind; fields: Map<string, string>; failed?: Set<string>; assumptions: string[]; source?: string; title?: string; at: Pos }>();
  for (const { id, raw, file } of entriesOf(sections, 'classes')) {
    const fields = new Map<string, string>();
    // Fields whose value was refused (already reported): events of the class do not report them missing.
    const failed = new Set<string>();
    for (const field of numericFields(raw)) {
      const p = attempt(() =>
        readParameter(raw[field], {
          file, path: ['classes', id, field], owner: id, ownerKind: 'class', field,
          ...(typeof raw.source === 'string' ? { defaultSource: raw.source } : {}),
          fitted: fittedLookup,
        }),
      );
      if (p) {
        annotateFit(p, fitSources);
        parameters.push(p);
        fields.set(field, p.key);
      } else {
        failed.add(field);
      }
    }
    classes.set(id, {
      failed,
      ...(typeof raw.model === 'string' ? { model: raw.model as ModelKind } : {}),
      fields,
      assumptions: Array.isArray(raw.assumptions) ? raw.assumptions.map(String) : [],
      ...(typeof raw.source === 'string' ? { source: raw.source } : {}),
      ...(typeof raw.title === 'string' ? { title: raw.title } : {}),
      at: file.keyAt(['classes', id]),
    });
  }

  // Ids written but refused (already reported): a later reference to one is a follow-on, not "unknown".
  const refused = new Set<string>();
  const events: BasicEvent[] = [];
  for (const { id, raw, file } of entriesOf(sections, 'events')) {
    const e = attempt(() => readEvent(id, raw, file, classes, parameters, fittedLookup, fitSources, asOf));
    if (e) events.push(e);
    else refused.add(id);
  }

  const gates: Gate[] = [];
  for (const { id, raw, file } of entriesOf(sections, 'gates')) {
    const g = attempt(() => readGate(id, raw, file));
    if (g) gates.push(g);
    else refused.add(id);
  }
  const tops: Top[] = entriesOf(sections, 'tops').map(({ id, raw, file }) => ({
    id,
    title: String(raw.title ?? id),
    gate: String(raw.gate),
    at: file.at(['tops', id, 'gate']),
  }));

  const commonCause: CommonCauseGroup[] = [];
  for (const { id, raw, file } of entriesOf(sections, 'common_cause')) {
    const g = attempt(() => readCommonCause(id, raw, file, parameters, fittedLookup));
    if (g) commonCause.push(g);
  }

  // counts:, event_trees:, failure_modes: (after the logic and events they refer to).
  const shared = attempt(() => readSharedCauseSections({ sections, gates, tops, events, refused, parameters, sourceIds: new Set(sources.map((x) => x.id)), fitted: fittedLookup }));

  const scenarios: Scenario[] = [];
  for (const { id, raw, file } of entriesOf(sections, 'scenarios')) {
    const s = attempt(() => readScenario(id, raw, file, events, classes, asOf, refused));
    if (s) scenarios.push(s);
  }

  if (meta && errors.length === 0) {
    attempt(() => checkLogic({ tops, gates, events, commonCause, sections }));
    checkReferences({ events, parameters, sources, assumptions: input.assumptions, classes, commonCause }, errors);
  }
  collector.throwIfAny();

  const study: Study = {
    root: input.root,
    meta: meta!,
    settings,
    tops,
    gates,
    events,
    parameters,
    sources,
    assumptions: input.assumptions,
    scenarios,
    fits,
    commonCause,
    ...(shared?.counts.length ? { counts: shared.counts } : {}),
    ...(shared?.eventTrees.length ? { eventTrees: shared.eventTrees } : {}),
    ...(shared?.failureModes.length ? { failureModes: shared.failureModes } : {}),
    files: input.files,
    warnings: [],
  };
  study.warnings = lint(study);
  return study;
}

/** Every field that some model reads as a number (made once, not per event). */
const ALL_MODEL_FIELDS = new Set(Object.values(MODEL_FIELDS).flatMap((m) => [...m.required, ...m.optional]));

/** The fields of each model, required and optional, as a set. */
const FIELDS_OF_MODEL = new Map(Object.entries(MODEL_FIELDS).map(([model, m]) => [model, new Set([...m.required, ...m.optional])]));

function numericFields(raw: Record<string, unknown>): string[] {
  return Object.keys(raw).filter((k) => ALL_MODEL_FIELDS.has(k));
}

/** A fitted parameter cites its fit's source and says where its value came from. */
function annotateFit(p: Parameter, fits: Map<string, FitSpec>): void {
  if (!p.fit) return;
  const f = fits.get(p.fit);
  if (!f?.result) return;
  if (!p.source && f.source) p.source = f.source;
  p.note = p.note ? `${p.note}; ${fitProvenance(f)}` : fitProvenance(f);
}

function readMeta(sections: Sections): StudyMeta {
  const get = (k: string) => sections.get(k)?.value;
  const studyFile = sections.get('format')?.file ?? sections.get('title')?.file;
  const at = (k: string): Pos => sections.get(k)?.file.at([k]) ?? { file: studyFile?.file ?? 'study.yaml', line: 1, col: 1 };
  if (get('format') !== 'faultbook/1') throw new StudyError("the study does not declare 'format: faultbook/1'", at('format'), "'format: faultbook/1' in study.yaml");
  const asOfRaw = get('as_of');
  if (asOfRaw === undefined) throw new StudyError("the study has no 'as_of' date (the snapshot date every age is taken at)", at('format'), "'as_of: 2026-06-30' in study.yaml");
  const asOf = parseDate(String(asOfRaw));
  if (!asOf.ok) throw new StudyError(`as_of: ${asOf.message}`, at('as_of'), asOf.expected);
  const issued = get('issued');
  if (issued !== undefined) {
    const d = parseDate(String(issued));
    if (!d.ok) throw new StudyError(`issued: ${d.message}`, at('issued'), d.expected);
  }
  const list = (k: string) => (Array.isArray(get(k)) ? (get(k) as unknown[]).map(String) : []);
  const meta: StudyMeta = {
    format: 'faultbook/1',
    title: String(get('title') ?? 'Untitled study'),
    facility: String(get('facility') ?? ''),
    revision: String(get('revision') ?? ''),
    status: get('status') === 'issued' ? 'issued' : 'draft',
    prepared_by: list('prepared_by'),
    reviewed_by: list('reviewed_by'),
    as_of: String(asOfRaw),
  };
  if (issued !== undefined) meta.issued = String(issued);
  if (typeof get('scope') === 'string') meta.scope = get('scope') as string;
  if (typeof get('description') === 'string') meta.description = get('description') as string;
  const report = readReportBlock(sections);
  if (report) meta.report = report;
  return meta;
}

/**
 * study.yaml `report:` (shape already checked by the schema): the appendix label, names and logo
 * path as written, and the sections to leave out, each checked against the optional ones.
 */
function readReportBlock(sections: Sections): ReportOptions | undefined {
  const located = sections.get('report');
  if (!located || located.value === null || typeof located.value !== 'object') return undefined;
  const raw = located.value as Record<string, unknown>;
  const out: ReportOptions = {};
  if (typeof raw.appendix === 'string') out.appendix = raw.appendix;
  if (typeof raw.client === 'string') out.client = raw.client;
  if (typeof raw.consultant === 'string') out.consultant = raw.consultant;
  if (typeof raw.logo === 'string') out.logo = raw.logo;
  if (Array.isArray(raw.omit)) {
    const names: string[] = OPTIONAL_SECTIONS.slice();
    const errors: StudyError[] = [];
    const omit: OptionalSection[] = [];
    raw.omit.forEach((name, i) => {
      const text = String(name);
      if (names.includes(text)) {
        if (!omit.includes(text as OptionalSection)) omit.push(text as OptionalSection);
      } else {
        errors.push(
          new StudyError(
            `report: omit names unknown section '${text}'`,
            located.file.at(['report', 'omit', i]),
            suggest(text, names, `one of the optional sections: ${names.join(', ')}`),
          ),
        );
      }
    });
    if (errors.length === 1) throw errors[0]!;
    if (errors.length > 1) throw new StudyErrors(errors);
    out.omit = omit;
  }
  return out;
}

function readSettings(sections: Sections): Settings {
  const s = sections.get('settings');
  const raw = (s?.value ?? {}) as Partial<Settings>;
  return { ...DEFAULT_SETTINGS, ...raw };
}

function readEvent(
  id: string,
  raw: Record<string, unknown>,
  file: YamlFile,
  classes: Map<string, { model?: ModelKind; fields: Map<string, string>; failed?: Set<string>; assumptions: string[]; source?: string; title?: string; at: Pos }>,
  parameters: Parameter[],
  fitted: (fitId: string, field: string, at: Pos) => { value: number; written: string },
  fitSources: Map<string, FitSpec>,
  asOf: string | undefined,
): BasicEvent {
  const at = file.keyAt(['events', id]);
  const className = typeof raw.class === 'string' ? raw.class : undefined;
  const cls = className ? classes.get(className) : undefined;
  if (className && !cls) {
    throw new StudyError(`event '${id}' names unknown class '${className}'`, file.at(['events', id, 'class']), classes.size ? `one of the classes: ${[...classes.keys()].join(', ')}` : "a class under 'classes:' in events.yaml");
  }
  const model = (typeof raw.model === 'string' ? raw.model : cls?.model) as ModelKind | undefined;
  if (!model) throw new StudyError(`event '${id}' has no model`, at, `'model: fixed | rate | repairable | tested | demand | weibull | switch', here or on its class`);
  const spec = MODEL_FIELDS[model];
  const allowed = FIELDS_OF_MODEL.get(model)!;
  const fields: Record<string, string> = {};
  const own = numericFields(raw);
  for (const field of own) {
    if (!allowed.has(field)) {
      throw new StudyError(`event '${id}': '${field}' is not a parameter of the ${model} model`, file.keyAt(['events', id, field]), `fields of ${model}: ${[...spec.required, ...spec.optional].join(', ') || 'none'}`);
    }
    const defaultSource = typeof raw.source === 'string' ? raw.source : cls?.source;
    const p = readParameter(raw[field], { file, path: ['events', id, field], owner: id, ownerKind: 'event', field, ...(defaultSource ? { defaultSource } : {}), fitted });
    annotateFit(p, fitSources);
    parameters.push(p);
    fields[field] = p.key;
  }
  for (const [field, key] of cls?.fields ?? []) {
    if (fields[field]) continue;
    if (!allowed.has(field)) {
      // A class may serve events of several models only when the field means something to this one.
      if (typeof raw.model === 'string') continue;
      throw new StudyError(`class '${className}': '${field}' is not a parameter of the ${model} model`, cls!.at, `fields of ${model}: ${[...spec.required, ...spec.optional].join(', ')}`);
    }
    fields[field] = key;
  }
  for (const field of spec.required) {
    if (!fields[field]) {
      if (cls?.failed?.has(field)) continue;
      throw new StudyError(`event '${id}' (${model} model) has no '${field}'`, at, `'${field}: …' on the event or its class (${model} needs ${spec.required.join(', ')})`);
    }
  }
  const event: BasicEvent = {
    id,
    title: String(raw.title ?? cls?.title ?? id),
    model,
    fields,
    assumptions: [...(cls?.assumptions ?? []), ...(Array.isArray(raw.assumptions) ? raw.assumptions.map(String) : [])],
    at,
  };
  if (className) event.class = className;
  if (model === 'switch') {
    if (typeof raw.on !== 'boolean') throw new StudyError(`switch event '${id}' has no 'on: true' or 'on: false'`, at, "'on: true' (the condition holds) or 'on: false'");
    event.on = raw.on;
  } else if (raw.on !== undefined) {
    throw new StudyError(`event '${id}': 'on' is only for switch (house) events`, file.keyAt(['events', id, 'on']), "remove 'on', or use 'model: switch'");
  }
  for (const key of ['installed', 'renewed'] as const) {
    if (raw[key] === undefined) continue;
    if (model !== 'weibull') throw new StudyError(`event '${id}': '${key}' only matters to the weibull model`, file.keyAt(['events', id, key]), `remove '${key}', or use 'model: weibull'`);
    const d = parseDate(String(raw[key]));
    const dAt = file.at(['events', id, key]);
    if (!d.ok) throw new StudyError(`event '${id}' ${key}: ${d.message}`, dAt, d.expected);
    if (asOf && yearsBetween(String(raw[key]), asOf) < 0) throw new StudyError(`event '${id}' was ${key} ${String(raw[key])}, after the study's as_of date ${asOf}`, dAt, `a date on or before ${asOf}`);
    event[key] = String(raw[key]);
  }
  if (event.installed && event.renewed && yearsBetween(event.installed, event.renewed) < 0) {
    throw new StudyError(`event '${id}' was renewed (${event.renewed}) before it was installed (${event.installed})`, file.at(['events', id, 'renewed']), `a renewal date after ${event.installed}`);
  }
  if (model === 'weibull') {
    const since = event.renewed ?? event.installed;
    if (!since) throw new StudyError(`weibull event '${id}' has no 'installed' (or 'renewed') date to take its age from`, at, "'installed: 1994' or 'renewed: 2011-05'");
    if (asOf) event.ageYears = yearsBetween(since, asOf);
  }
  return event;
}

function readGate(id: string, raw: Record<string, unknown>, file: YamlFile): Gate {
  const at = file.keyAt(['gates', id]);
  const kinds = (['any', 'all', 'atleast', 'not'] as const).filter((k) => raw[k] !== undefined);
  const expected = "exactly one of 'any: [...]', 'all: [...]', 'atleast: k, of: [...]' or 'not: id'";
  if (kinds.length !== 1) throw new StudyError(kinds.length === 0 ? `gate '${id}' has no logic` : `gate '${id}' mixes ${kinds.join(' and ')}`, at, expected);
  const op = kinds[0]!;
  const title = typeof raw.title === 'string' ? { title: raw.title } : {};
  if (op === 'not') {
    if (raw.of !== undefined) throw new StudyError(`gate '${id}': 'of' goes with 'atleast'`, file.keyAt(['gates', id, 'of']), expected);
    return { id, op, inputs: [String(raw.not)], inputsAt: [file.at(['gates', id, 'not'])], at, ...title };
  }
  if (op === 'atleast') {
    if (!Array.isArray(raw.of)) throw new StudyError(`voting gate '${id}' has no 'of: [...]' list`, at, `'atleast: ${String(raw.atleast)}, of: [a, b, c]'`);
    const inputs = raw.of.map(String);
    const k = Number(raw.atleast);
    const kAt = file.at(['gates', id, 'atleast']);
    if (inputs.length === 0) throw new StudyError(`gate '${id}' has no inputs`, file.at(['gates', id, 'of']), 'at least one input id');
    if (k > inputs.length) throw new StudyError(`voting gate '${id}' needs ${k} of only ${inputs.length} inputs`, kAt, `k between 1 and ${inputs.length}`);
    if (k < 1) throw new StudyError(`voting gate '${id}' has k = ${k}`, kAt, `k between 1 and ${inputs.length}`);
    return { id, op, k, inputs, inputsAt: inputs.map((_, i) => file.at(['gates', id, 'of', i])), at, ...title };
  }
  if (raw.of !== undefined) throw new StudyError(`gate '${id}': 'of' goes with 'atleast'`, file.keyAt(['gates', id, 'of']), expected);
  const inputs = (raw[op] as unknown[]).map(String);
  if (inputs.length === 0) throw new StudyError(`gate '${id}' has no inputs`, file.at(['gates', id, op]), 'at least one input id');
  return { id, op, inputs, inputsAt: inputs.map((_, i) => file.at(['gates', id, op, i])), at, ...title };
}

const CCF_FIELDS: Record<CommonCauseGroup['method'], (m: number) => string[]> = {
  beta: () => ['beta'],
  // Multiple Greek letter: beta, gamma, delta, … for groups of 2, 3, 4 (NUREG/CR-5485).
  mgl: (m) => ['beta', 'gamma', 'delta'].slice(0, Math.max(1, Math.min(3, m - 1))),
  alpha: (m) => Array.from({ length: m }, (_, i) => `alpha${i + 1}`),
};

function readCommonCause(
  id: string,
  raw: Record<string, unknown>,
  file: YamlFile,
  parameters: Parameter[],
  fitted: (fitId: string, field: string, at: Pos) => { value: number; written: string },
): CommonCauseGroup {
  const at = file.keyAt(['common_cause', id]);
  const members = (raw.members as unknown[]).map(String);
  if (members.length < 2) throw new StudyError(`common-cause group '${id}' has fewer than two members`, file.at(['common_cause', id, 'members']), 'two or more basic-event ids');
  if (new Set(members).size !== members.length) throw new StudyError(`common-cause group '${id}' lists a member twice`, file.at(['common_cause', id, 'members']), 'each member once');
  const method = raw.method as CommonCauseGroup['method'];
  const wanted = CCF_FIELDS[method](members.length);
  if (method === 'mgl' && members.length > 4) throw new StudyError(`multiple Greek letter group '${id}' has ${members.length} members`, at, 'at most 4 members with beta, gamma, delta; use the alpha-factor method for larger groups');
  const fields: Record<string, string> = {};
  // The group's own parameters by field (the study's parameter list is long; no search through it).
  const own = new Map<string, Parameter>();
  for (const field of wanted) {
    if (raw[field] === undefined) throw new StudyError(`common-cause group '${id}' (${method}) has no '${field}'`, at, `${method} with ${members.length} members needs ${wanted.join(', ')}`);
    const p = readParameter(raw[field], { file, path: ['common_cause', id, field], owner: id, ownerKind: 'group', field, fitted });
    parameters.push(p);
    fields[field] = p.key;
    own.set(field, p);
  }
  for (const key of Object.keys(raw)) {
    if (/^(beta|gamma|delta|alpha\d+)$/.test(key) && !wanted.includes(key)) {
      throw new StudyError(`common-cause group '${id}': '${key}' is not used by the ${method} method with ${members.length} members`, file.keyAt(['common_cause', id, key]), `only ${wanted.join(', ')}`);
    }
  }
  if (method === 'alpha') {
    const sum = wanted.reduce((s, f) => s + own.get(f)!.value, 0);
    if (Math.abs(sum - 1) > 1e-6) throw new StudyError(`common-cause group '${id}': the alpha factors add up to ${sum}`, at, 'alpha1 + … + alphaM = 1');
  }
  const dirichlet = raw.uncertainty === undefined ? undefined : readAlphaUncertainty(id, method, raw.uncertainty, file, wanted.map((f) => own.get(f)!));
  if (method === 'alpha') {
    for (const f of wanted) {
      const p = own.get(f)!;
      if (p.uncertainty) {
        throw new StudyError(
          `common-cause group '${id}': '${f}' states an uncertainty of its own; the alpha factors add up to 1, so their uncertainty is stated for the group, jointly`,
          file.at(['common_cause', id, f, 'uncertainty']),
          `remove it from '${f}' and give the group 'uncertainty: { dirichlet: { concentration: 40 } }' (the stated alphas are the mean) or 'uncertainty: { dirichlet: [a1, …, a${wanted.length}] }'`,
        );
      }
    }
  }
  // The testing scheme changes only the alpha-factor formulas; elsewhere it would be silently ignored.
  if (raw.testing !== undefined && method !== 'alpha') throw new StudyError(`common-cause group '${id}': 'testing' matters only to the alpha-factor method`, file.keyAt(['common_cause', id, 'testing']), `remove 'testing', or use 'method: alpha'`);
  const g: CommonCauseGroup = { id, members, method, testing: raw.testing === 'staggered' ? 'staggered' : 'non-staggered', fields, at };
  if (dirichlet) g.dirichlet = dirichlet;
  if (typeof raw.title === 'string') g.title = raw.title;
  return g;
}

/**
 * A group's `uncertainty:`: alpha factors only, as a Dirichlet distribution (NUREG/CR-5485: the
 * alpha factors' joint uncertainty, the factors summing to 1), given either by an overall
 * concentration A with the stated alphas as the mean (a_k = A·alpha_k), or by its parameters
 * a_1…a_M, whose mean a_k/Σa must then be the stated alphas.
 */
function readAlphaUncertainty(id: string, method: CommonCauseGroup['method'], raw: unknown, file: YamlFile, alphas: Parameter[]): { a: number[]; at: Pos } {
  const path = ['common_cause', id, 'uncertainty'];
  const at = file.at(path);
  const m = alphas.length;
  const form = `'uncertainty: { dirichlet: { concentration: 40 } }' (the stated alphas are the mean) or 'uncertainty: { dirichlet: [a1, …, a${m}] }'`;
  if (method !== 'alpha') {
    throw new StudyError(`common-cause group '${id}': a group-level 'uncertainty' is the alpha factors' joint one`, file.keyAt(path), `state the uncertainty on '${method === 'beta' ? 'beta' : 'beta, gamma, delta'}' itself, e.g. 'beta: { value: 0.05, uncertainty: { lognormal: { median: 0.05, ef: 2 } } }'`);
  }
  const body = raw !== null && typeof raw === 'object' ? (raw as Record<string, unknown>).dirichlet : undefined;
  if (body === undefined || Object.keys(raw as object).length !== 1) throw new StudyError(`common-cause group '${id}': the alpha factors' uncertainty must be a Dirichlet distribution`, at, form);
  const dAt = file.at([...path, 'dirichlet']);
  if (Array.isArray(body)) {
    const a = body.map(Number);
    if (a.length !== m) throw new StudyError(`common-cause group '${id}': the Dirichlet has ${a.length} parameters for ${m} alpha factors`, dAt, `one parameter per alpha factor: [a1, …, a${m}]`);
    a.forEach((x, k) => {
      if (!(x > 0) || !Number.isFinite(x)) throw new StudyError(`common-cause group '${id}': Dirichlet parameter a${k + 1} is ${String(body[k])}`, file.at([...path, 'dirichlet', k]), 'a positive number');
    });
    const total = a.reduce((s, x) => s + x, 0);
    const mean = a.map((x) => x / total);
    if (mean.some((x, k) => Math.abs(x - alphas[k]!.value) > 1e-6)) {
      throw new StudyError(
        `common-cause group '${id}': the Dirichlet's mean (${mean.map((x) => x.toPrecision(4)).join(', ')}) is not the stated alphas (${alphas.map((p) => p.value).join(', ')})`,
        dAt,
        `alphas equal to a_k / (a1 + … + a${m}), or 'dirichlet: { concentration: ${total.toPrecision(4)} }' to keep the stated alphas as the mean`,
      );
    }
    return { a, at: dAt };
  }
  const concentration = body !== null && typeof body === 'object' ? Number((body as Record<string, unknown>).concentration) : NaN;
  if (!(concentration > 0) || !Number.isFinite(concentration) || Object.keys(body as object).length !== 1) {
    throw new StudyError(`common-cause group '${id}': the Dirichlet needs a positive 'concentration' or a list of its parameters`, dAt, form);
  }
  if (alphas.some((p) => !(p.value > 0))) {
    throw new StudyError(`common-cause group '${id}': a Dirichlet needs every alpha factor above 0`, dAt, 'alphas above 0 (a factor of exactly 0 cannot vary)');
  }
  return { a: alphas.map((p) => concentration * p.value), at: dAt };
}

function readScenario(
  id: string,
  raw: Record<string, unknown>,
  file: YamlFile,
  events: BasicEvent[],
  classes: Map<string, { model?: ModelKind; fields: Map<string, string>; failed?: Set<string> }>,
  asOf: string | undefined,
  refused: Set<string>,
): Scenario {
  const at = file.keyAt(['scenarios', id]);
  const s: Scenario = { id, title: String(raw.title ?? id), set: [], switches: [], renew: [], at };
  for (const [key, value] of Object.entries((raw.set ?? {}) as Record<string, unknown>)) {
    const kAt = file.keyAt(['scenarios', id, 'set', key]);
    const dot = key.lastIndexOf('.');
    const owner = key.slice(0, dot);
    const field = key.slice(dot + 1);
    const event = events.find((e) => e.id === owner);
    const cls = classes.get(owner);
    const known = event ? Object.keys(event.fields) : cls ? [...cls.fields.keys()] : undefined;
    if (refused.has(owner) || cls?.failed?.has(field)) throw new FollowOnError(`scenario '${id}' sets '${key}', whose owner or value was refused`, kAt, 'see the error for it');
    if (dot < 1 || !known) {
      // Did you mean: the nearest '<owner>.<field>' the study has.
      const keys = [...events.flatMap((e) => Object.keys(e.fields).map((f) => `${e.id}.${f}`)), ...[...classes].flatMap(([c, v]) => [...v.fields.keys()].map((f) => `${c}.${f}`))];
      throw new StudyError(`scenario '${id}' sets '${key}', which names no event or class`, kAt, suggest(key, keys, "'<event or class id>.<field>', e.g. 'hoist-motor.exercise'"));
    }
    if (!known.includes(field)) throw new StudyError(`scenario '${id}' sets '${key}', but '${owner}' has no '${field}'`, kAt, suggest(key, known.map((f) => `${owner}.${f}`), `one of: ${known.map((f) => `${owner}.${f}`).join(', ')}`));
    const quantity = quantityOfField(field);
    const vAt = file.at(['scenarios', id, 'set', key]);
    const q = readQuantity(value, quantity, vAt, `scenario '${id}' ${key}`, field, file.sourceAt?.(['scenarios', id, 'set', key]));
    checkDomain(field, quantity, q.value, vAt, `scenario '${id}' ${key}`, q.written);
    s.set.push({ key, value: q.value, written: q.written, at: vAt });
  }
  for (const [eventId, on] of Object.entries((raw.switch ?? {}) as Record<string, unknown>)) {
    const kAt = file.keyAt(['scenarios', id, 'switch', eventId]);
    const e = events.find((x) => x.id === eventId);
    if (!e && refused.has(eventId)) throw new FollowOnError(`scenario '${id}' switches '${eventId}', which was refused`, kAt, 'see the error for it');
    if (!e || e.model !== 'switch') throw new StudyError(`scenario '${id}' switches '${eventId}', which is not a switch event`, kAt, `one of: ${events.filter((x) => x.model === 'switch').map((x) => x.id).join(', ') || '(the study has no switch events)'}`);
    s.switches.push({ event: eventId, on: Boolean(on), at: kAt });
  }
  for (const [eventId, date] of Object.entries((raw.renew ?? {}) as Record<string, unknown>)) {
    const kAt = file.keyAt(['scenarios', id, 'renew', eventId]);
    const e = events.find((x) => x.id === eventId);
    if (!e && refused.has(eventId)) throw new FollowOnError(`scenario '${id}' renews '${eventId}', which was refused`, kAt, 'see the error for it');
    if (!e || e.model !== 'weibull') throw new StudyError(`scenario '${id}' renews '${eventId}', which is not a weibull event`, kAt, 'the id of an event with model weibull (renewal restarts its age)');
    const d = parseDate(String(date));
    if (!d.ok) throw new StudyError(`scenario '${id}' renew ${eventId}: ${d.message}`, file.at(['scenarios', id, 'renew', eventId]), d.expected);
    if (asOf && yearsBetween(asOf, String(date)) < 0) throw new StudyError(`scenario '${id}' renews '${eventId}' on ${String(date)}, before as_of ${asOf}`, file.at(['scenarios', id, 'renew', eventId]), `a planned date on or after ${asOf}`);
    s.renew.push({ event: eventId, date: String(date), at: kAt });
  }
  return s;
}

function checkReferences(
  s: {
    events: BasicEvent[];
    parameters: Parameter[];
    sources: Source[];
    assumptions: Assumption[];
    classes: Map<string, { assumptions: string[]; at: Pos }>;
    commonCause: CommonCauseGroup[];
  },
  errors: StudyError[],
): void {
  const sourceIds = new Set(s.sources.map((x) => x.id));
  const hint = s.sources.length ? `one of the sources: ${s.sources.map((x) => x.id).join(', ')}` : "a source declared under 'sources:' in sources.yaml";
  for (const p of s.parameters) {
    if (p.source && !sourceIds.has(p.source)) errors.push(new StudyError(`'${p.key}' cites unknown source '${p.source}'`, p.at, hint));
  }
  const assumptionIds = new Set(s.assumptions.map((a) => a.id));
  const ahint = s.assumptions.length ? `one of: ${s.assumptions.map((a) => a.id).join(', ')}` : "an assumption written as '## A1 …' in assumptions.md";
  for (const e of s.events) {
    for (const a of e.assumptions) if (!assumptionIds.has(a)) errors.push(new StudyError(`event '${e.id}' rests on unknown assumption '${a}'`, e.at, ahint));
  }
  const eventById = new Map(s.events.map((e) => [e.id, e]));
  const groupOf = new Map<string, string>();
  for (const g of s.commonCause) {
    for (const m of g.members) {
      const event = eventById.get(m);
      if (!event) errors.push(new StudyError(`common-cause group '${g.id}' names unknown event '${m}'`, g.at, 'basic-event ids from events.yaml'));
      else if (event.model === 'switch') errors.push(new StudyError(`common-cause group '${g.id}' names switch (house) event '${m}'`, g.at, 'basic events that can fail; a switch is a condition, not a failure'));
      // One failure mode of a component belongs to one group (NUREG/CR-5485): two groups would count its shared causes twice.
      const other = groupOf.get(m);
      if (other !== undefined) errors.push(new StudyError(`event '${m}' is in common-cause groups '${other}' and '${g.id}'`, g.at, 'each event in one group at most'));
      groupOf.set(m, g.id);
    }
  }
}
