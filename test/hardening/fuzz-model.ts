/**
 * What the fuzzers generate and what they hold the tool to, shared by test/hardening/fuzz.test.ts
 * (a few thousand cases in every test run) and scripts/fuzz-long.ts (as many as asked).
 *
 * The property: given any study folder, the reader either returns a Study or throws StudyError /
 * StudyErrors whose positions are real places (a relative file, line and column ≥ 1) — never another
 * exception, never a hang. A study it accepts is then analysed, which must likewise either give
 * results or refuse with a StudyError.
 *
 * Three generators, from blind to informed:
 * - raw bytes in one study file (anything at all, invalid UTF-8 included);
 * - the valid study's YAML text with characters that matter to YAML inserted, deleted or replaced;
 * - the valid study as a structure, mutated (keys deleted, renamed, values replaced by values of
 *   other types, extremes, other ids, units, dates), then written out as YAML;
 * - the valid study with only its numbers changed, to extremes of the right type (so most cases are
 *   accepted and reach the failure models and the logic).
 */
import { mkdirSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { isAbsolute, join } from 'node:path';
import fc from 'fast-check';
import { parse, stringify } from 'yaml';
import { analyze } from '../../src/analysis/analyze.js';
import { StudyError, StudyErrors } from '../../src/study/errors.js';
import { readStudy } from '../../src/study/read.js';

/** The files of one case: name (relative to the study) → text or bytes. */
export type FuzzCase = Record<string, string | Uint8Array>;

const BASE_DIR = join(import.meta.dirname, '..', 'fixtures', 'hardening', 'valid-study');
const YAML_SLOTS = ['study.yaml', 'logic.yaml', 'events.yaml', 'sources.yaml'] as const;

/** The valid study's files, as text. */
export const BASE_FILES: Record<string, string> = Object.fromEntries(
  readdirSync(BASE_DIR).map((name) => [name, readFileSync(join(BASE_DIR, name), 'utf8')]),
);

/** Every section of the valid study in one object (a study may keep them all in study.yaml). */
function baseStructure(): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const slot of YAML_SLOTS) Object.assign(out, parse(BASE_FILES[slot]!) as Record<string, unknown>);
  return out;
}

/** Why a case failed the property (the input is reported by fast-check beside it). */
export class FuzzViolation extends Error {
  override name = 'FuzzViolation';
}

/** A case slower than this counts as a hang (a study is read in milliseconds). */
export const CASE_LIMIT_MS = 2000;

/**
 * Write the case into `dir` (emptied first), read it, analyse it when it reads, and throw a
 * FuzzViolation if anything but a study error comes out or it takes too long.
 */
export function runCase(dir: string, files: FuzzCase): 'accepted' | 'refused' {
  rmSync(dir, { recursive: true, force: true });
  mkdirSync(dir, { recursive: true });
  for (const [name, data] of Object.entries(files)) {
    mkdirSync(join(dir, name, '..'), { recursive: true });
    writeFileSync(join(dir, name), data);
  }
  const t0 = performance.now();
  let outcome: 'accepted' | 'refused';
  try {
    const study = readStudy(dir);
    // Keep the analysis to its point estimate and a few samples: the property is about input, not time.
    study.settings.samples = Math.min(study.settings.samples, 50);
    study.settings.horizon = Math.min(study.settings.horizon, 3);
    analyze(study);
    outcome = 'accepted';
  } catch (err) {
    checkRefusal(err);
    outcome = 'refused';
  }
  const ms = performance.now() - t0;
  if (ms > CASE_LIMIT_MS) throw new FuzzViolation(`a case took ${ms.toFixed(0)} ms (limit ${CASE_LIMIT_MS} ms)`);
  return outcome;
}

function checkRefusal(err: unknown): void {
  const list = err instanceof StudyErrors ? err.errors : err instanceof StudyError ? [err] : undefined;
  if (!list) {
    const detail = err instanceof Error ? `${err.name}: ${err.message}\n${err.stack ?? ''}` : String(err);
    throw new FuzzViolation(`not a study error: ${detail}`);
  }
  if (list.length === 0) throw new FuzzViolation('StudyErrors with no errors in it');
  for (const e of list) {
    if (!(e instanceof StudyError)) throw new FuzzViolation(`StudyErrors holds ${String(e)}`);
    if (typeof e.message !== 'string' || e.message.trim() === '') throw new FuzzViolation('a study error with no message');
    if (e.at) {
      const { file, line, col } = e.at;
      if (typeof file !== 'string' || file === '' || isAbsolute(file)) throw new FuzzViolation(`error position names file '${file}'`);
      if (!(Number.isInteger(line) && line >= 1 && Number.isInteger(col) && col >= 1)) throw new FuzzViolation(`error position ${file}:${line}:${col}`);
    }
    // describe() is what the terminal shows; it must not throw either.
    e.describe();
  }
}

// --- generators ----------------------------------------------------------------------------------

/** Raw bytes (invalid UTF-8, NULs, control characters) in place of one study file. */
export function rawBytesCase(): fc.Arbitrary<FuzzCase> {
  return fc
    .record({
      slot: fc.constantFrom(...YAML_SLOTS, 'assumptions.md'),
      bytes: fc.oneof(
        fc.uint8Array({ maxLength: 400 }),
        fc.string({ unit: 'binary', maxLength: 300 }).map((s) => new TextEncoder().encode(s)),
        fc.string({ unit: fc.constantFrom(...':{}[],&*!|>\'"#%@-? \t\n\r.0123456789ae'.split('')), maxLength: 200 }).map((s) => new TextEncoder().encode(s)),
      ),
    })
    .map(({ slot, bytes }) => ({ ...BASE_FILES, [slot]: bytes }));
}

/** Characters that change what YAML means, and a few that change what a study means. */
const YAML_CHARS = [':', '{', '}', '[', ']', ',', '&', '*', '!', '|', '>', "'", '"', '#', '%', '@', '-', '?', ' ', '  ', '\t', '\n', '\r\n', '\\', '\u0000', '\uFEFF', '&a ', '*a', '!!binary ', '<<: ', '---\n', '...\n', '1e999', '.nan', '-', '0x', '~'];

/** The valid study's text with a few YAML-significant edits. */
export function textMutationCase(): fc.Arbitrary<FuzzCase> {
  const edit = fc.record({
    at: fc.double({ min: 0, max: 1, noNaN: true, maxExcluded: true }),
    del: fc.nat({ max: 6 }),
    ins: fc.array(fc.constantFrom(...YAML_CHARS), { maxLength: 3 }).map((xs) => xs.join('')),
  });
  return fc.record({ slot: fc.constantFrom(...YAML_SLOTS), edits: fc.array(edit, { minLength: 1, maxLength: 5 }) }).map(({ slot, edits }) => {
    let text = BASE_FILES[slot]!;
    for (const e of edits) {
      const i = Math.floor(e.at * (text.length + 1));
      text = text.slice(0, i) + e.ins + text.slice(i + e.del);
    }
    return { ...BASE_FILES, [slot]: text };
  });
}

/** Ids the study uses, and names that are dangerous as object keys. */
const IDS = ['station-fails', 'both-pumps-fail', 'pump-a-fails', 'pump-b-fails', 'motor-a', 'motor-b', 'power-lost', 'motor', 'invented-survey', 'A1', 'motor-life', 'nope', '__proto__', 'constructor', 'toString', 'hasOwnProperty', 'valueOf', 'x'];
const KEYS = [
  ...IDS,
  'format', 'title', 'as_of', 'settings', 'tops', 'gates', 'events', 'classes', 'sources', 'scenarios', 'fits', 'common_cause',
  'gate', 'any', 'all', 'atleast', 'of', 'not', 'model', 'class', 'source', 'assumptions', 'installed', 'renewed', 'on',
  'probability', 'rate', 'exposure', 'repair', 'interval', 'test_duration', 'shape', 'scale', 'location', 'exercise',
  'value', 'fit', 'range', 'uncertainty', 'lognormal', 'median', 'ef', 'note', 'set', 'switch', 'renew', 'data', 'members', 'method', 'beta',
  'cutoff', 'max_order', 'max_cut_sets', 'samples', 'seed', 'horizon', 'max_nodes', 'on_node_budget', 'exercise_basis', 'sensitivity_factor', 'sampling',
];
/** Values to put anywhere. Magnitudes stay within 1e±300 for the reason given at EXTREMES below. */
const INTERESTING: unknown[] = [
  '', 0, -0, 1, -1, 2, 0.5, 1.5, 1e-300, 1e300, -1e300, Number.MAX_SAFE_INTEGER, 3.000000001, 'NaN', '.nan', '.inf', '1e999',
  '3 fortnights', '2 /year', '-2 /year', '8 h', '8 m', '0 years', '1e-18', '1e400 h', '75 years', '1 month', '2 years', '8 /h',
  '2026-13-01', '2026-02-30', '1990', '2027-01', '0000', '9999-12-31', 2026, true, false, null, [], {}, [[]], [{}],
  'faultbook/1', 'faultbook/2', 'weibull', 'fixed', 'switch', 'tested', 'demand', 'bounds', 'stop', 'mle',
  { fit: 'motor-life' }, { value: 0.5, range: [0, 1] }, { value: 2, uncertainty: { lognormal: { median: 2, ef: 3 } } },
  { lognormal: { median: 1e-3, ef: 0.5 } }, { any: [] }, { atleast: 5, of: ['motor-a'] }, { not: 'motor-a' }, { gate: 'motor-a' },
  ['motor-a', 'motor-a'], ['both-pumps-fail'], ['nope'], ...IDS,
];

type Mutation = { kind: 'delete' | 'set' | 'rename' | 'add'; pick: number; key: string; value: unknown };

const valueArb: fc.Arbitrary<unknown> = fc.oneof(
  { weight: 6, arbitrary: fc.constantFrom(...INTERESTING) },
  { weight: 2, arbitrary: fc.jsonValue({ maxDepth: 2 }) },
  { weight: 1, arbitrary: fc.string({ maxLength: 20 }) },
  { weight: 1, arbitrary: fc.double({ min: -1e300, max: 1e300 }).filter((x) => x === 0 || Math.abs(x) >= 1e-300) },
);

const mutationArb: fc.Arbitrary<Mutation> = fc.record({
  kind: fc.constantFrom('delete', 'set', 'set', 'rename', 'add'),
  pick: fc.nat(),
  key: fc.oneof({ weight: 4, arbitrary: fc.constantFrom(...KEYS) }, { weight: 1, arbitrary: fc.string({ maxLength: 12 }) }),
  value: valueArb,
});

type Container = Record<string, unknown> | unknown[];

/** Every (container, key) of a structure, the root's sections included. */
function places(root: Record<string, unknown>): { parent: Container; key: string | number }[] {
  const out: { parent: Container; key: string | number }[] = [];
  const walk = (node: unknown, depth: number) => {
    if (depth > 8 || node === null || typeof node !== 'object') return;
    if (Array.isArray(node)) node.forEach((v, i) => (out.push({ parent: node, key: i }), walk(v, depth + 1)));
    else for (const [k, v] of Object.entries(node)) out.push({ parent: node as Record<string, unknown>, key: k }), walk(v, depth + 1);
  };
  walk(root, 0);
  return out;
}

/** Own-property assignment, so a key named __proto__ is a key and not the prototype. */
function put(obj: Record<string, unknown>, key: string, value: unknown): void {
  Object.defineProperty(obj, key, { value, enumerable: true, writable: true, configurable: true });
}

function clone<T>(v: T): T {
  return v === undefined ? v : (structuredClone(v) as T);
}

function applyMutation(root: Record<string, unknown>, m: Mutation): void {
  const all = places(root);
  if (all.length === 0) return;
  const { parent, key } = all[m.pick % all.length]!;
  if (Array.isArray(parent)) {
    const i = key as number;
    if (m.kind === 'delete') parent.splice(i, 1);
    else if (m.kind === 'add') parent.splice(i, 0, clone(m.value));
    else parent[i] = clone(m.value);
    return;
  }
  const k = key as string;
  switch (m.kind) {
    case 'delete':
      delete parent[k];
      break;
    case 'set':
      put(parent, k, clone(m.value));
      break;
    case 'rename': {
      const v = parent[k];
      delete parent[k];
      put(parent, m.key, v);
      break;
    }
    case 'add': {
      const target = parent[k];
      if (target && typeof target === 'object' && !Array.isArray(target)) put(target as Record<string, unknown>, m.key, clone(m.value));
      else put(parent, m.key, clone(m.value));
    }
  }
}

/**
 * The valid study as a structure with 1–6 mutations, written back as YAML: all in study.yaml, or
 * split into the conventional files (a section may then land in two files).
 */
export function structureCase(): fc.Arbitrary<FuzzCase> {
  return fc.record({ mutations: fc.array(mutationArb, { minLength: 1, maxLength: 6 }), split: fc.boolean() }).map(({ mutations, split }) => {
    const root = baseStructure();
    for (const m of mutations) applyMutation(root, m);
    const files: FuzzCase = { 'assumptions.md': BASE_FILES['assumptions.md']! };
    if (!split) {
      files['study.yaml'] = stringify(root);
      return files;
    }
    const home: Record<string, string> = { tops: 'logic.yaml', gates: 'logic.yaml', scenarios: 'logic.yaml', common_cause: 'logic.yaml', classes: 'events.yaml', events: 'events.yaml', fits: 'events.yaml', sources: 'sources.yaml' };
    const parts: Record<string, Record<string, unknown>> = {};
    for (const [k, v] of Object.entries(root)) put((parts[home[k] ?? 'study.yaml'] ??= {}), k, v);
    for (const [name, part] of Object.entries(parts)) files[name] = stringify(part);
    return files;
  });
}

/**
 * Numbers and quantities of the right kind, at the edges. Kept within 1e-300…1e300: beyond that the
 * sensitivity stage's ×/÷ factor leaves the double range (a value of 1e308 doubles to ∞, 5e-324
 * halves to 0), which is reported to the lead as a defect of src/analysis/sensitivity.ts rather
 * than fixed here.
 */
const EXTREMES: unknown[] = [
  0, 1, 1e-300, 1e-18, 1e-15, 1 - 1e-16, 0.9999999999, 1e15, 1e100, 1e300,
  '1e-300 h', '1e300 years', '1e-18 /year', '1e290 /h', '1e-300 /h', '1 min', '0 h', '1e5 years', '1e-12 years',
  '0001', '1900', '2026-06-30', '2026-06', '1000-01-01',
];

/** The valid study with 1–3 of its numbers (or quantities, or dates) replaced by extremes. */
export function extremeValueCase(): fc.Arbitrary<FuzzCase> {
  return fc.array(fc.record({ pick: fc.nat(), value: fc.oneof(fc.constantFrom(...EXTREMES), fc.constant(0), fc.double({ min: 1e-300, max: 1e300, noNaN: true })) }), { minLength: 1, maxLength: 3 }).map((changes) => {
    const root = baseStructure();
    for (const c of changes) {
      const numeric = places(root).filter(({ parent, key }) => {
        const v = (parent as Record<string | number, unknown>)[key];
        return typeof v === 'number' || (typeof v === 'string' && /^\d/.test(v));
      });
      const { parent, key } = numeric[c.pick % numeric.length]!;
      // A number put where a duration or rate was keeps that unit (a bare one is refused by design).
      const old = (parent as Record<string | number, unknown>)[key];
      const unit = typeof old === 'string' ? /^[-+0-9.eE]+\s+(\/?\s*[A-Za-z]+)$/.exec(old)?.[1] : undefined;
      const value = unit !== undefined && typeof c.value === 'number' ? `${c.value} ${unit}` : c.value;
      if (Array.isArray(parent)) parent[key as number] = value;
      else put(parent, key as string, value);
    }
    return { 'study.yaml': stringify(root), 'assumptions.md': BASE_FILES['assumptions.md']! };
  });
}
