/**
 * Reading one number of a study: plain (`shape: 3.1`, `scale: 75 years`) or with provenance and
 * uncertainty (`{ value, source, note, range, uncertainty }`), into canonical units, with the domain
 * of its field checked. Unit parsing itself lives in reliability/units (pure); this module adds the
 * file positions.
 */
import { sampleQuantile } from '../reliability/distributions.js';
import { formatDuration, formatRate, isBareNumber, parseDuration, parseRate, unitKey } from '../reliability/units.js';
import { StudyError } from './errors.js';
import type { Parameter, Pos, Quantity, Uncertainty } from './types.js';
import type { PathSegment, YamlFile } from './yaml.js';

/** What each model field measures. */
export const FIELD_QUANTITY: Record<string, Quantity> = {
  probability: 'probability',
  rate: 'rate',
  exposure: 'duration',
  repair: 'duration',
  interval: 'duration',
  test_duration: 'duration',
  shape: 'number',
  scale: 'duration',
  location: 'duration',
  exercise: 'duration',
  // common-cause parameters are fractions
  beta: 'probability',
  gamma: 'probability',
  delta: 'probability',
};

export function quantityOfField(field: string): Quantity {
  if (/^alpha\d+$/.test(field)) return 'probability';
  return FIELD_QUANTITY[field] ?? 'number';
}

const EXPECTED: Record<Quantity, string> = {
  probability: 'a probability between 0 and 1, e.g. 0.003 or 3e-3',
  rate: 'a rate with its unit, such as "2e-3 /year" or "1e-6 /h"',
  duration: 'a duration with its unit, such as "8 h", "3 days", "1 month" or "75 years"',
  number: 'a number, e.g. 3.1',
};

/**
 * Units worth suggesting for a bare number, by what the field usually measures: a repair takes
 * hours or days, an exercise interval weeks or months, a Weibull scale years. The last suggestion
 * is always the old reading (years, per year), so whoever meant that can keep it.
 */
const SUGGESTED_UNITS: Record<string, string[]> = {
  repair: ['h', 'days', 'years'],
  test_duration: ['min', 'h', 'days'],
  exercise: ['days', 'weeks', 'months'],
  interval: ['weeks', 'months', 'years'],
  exposure: ['h', 'days', 'years'],
  scale: ['h', 'years'],
  location: ['h', 'years'],
};
const DEFAULT_DURATION_UNITS = ['h', 'days', 'years'];
const RATE_UNITS = ['/h', '/year'];

/** `"10 h"? "10 days"? "10 years"?`: the text as written with each likely unit. */
export function unitSuggestions(written: string, quantity: 'duration' | 'rate', field?: string): string {
  const base = field?.slice(field.lastIndexOf('.') + 1);
  const units = quantity === 'rate' ? RATE_UNITS : SUGGESTED_UNITS[base ?? ''] ?? DEFAULT_DURATION_UNITS;
  const one = Number(written) === 1;
  return units.map((u) => `"${written} ${one && quantity === 'duration' && u.endsWith('s') && u !== 'h' ? u.slice(0, -1) : u}"?`).join(' ');
}

/**
 * Parse a scalar of a quantity; throws StudyError at `at`. Returns canonical value and the text as
 * written. A duration or rate needs its unit: a bare number is refused with the likely units for
 * `field` (the model field, e.g. `repair`) suggested.
 */
export function readQuantity(raw: unknown, quantity: Quantity, at: Pos, what: string, field?: string, source?: string): { value: number; written: string } {
  // A YAML number arrives parsed (2e-3 → 0.002); messages and reports show the text as written.
  if (typeof raw === 'number' && source !== undefined && Number(source) === raw) raw = source;
  if (quantity === 'duration' || quantity === 'rate') {
    if (typeof raw !== 'number' && typeof raw !== 'string') throw new StudyError(`${what} must be text with a unit`, at, EXPECTED[quantity]);
    const r = quantity === 'duration' ? parseDuration(raw) : parseRate(raw);
    if (!r.ok) {
      if (r.bare) {
        const written = String(raw).trim();
        throw new StudyError(`${what} is written ${written} with no unit; a ${quantity} needs one`, at, `${unitSuggestions(written, quantity, field)} (${EXPECTED[quantity]})`);
      }
      throw new StudyError(`${what}: ${r.message}`, at, r.expected);
    }
    return { value: r.value, written: r.written };
  }
  if (typeof raw === 'string' && raw.trim() !== '' && !isBareNumber(raw) && (parseDuration(raw).ok || parseRate(raw).ok)) {
    throw new StudyError(`${what} is written "${raw.trim()}" with a unit, but it is a ${quantity === 'probability' ? 'probability' : 'plain number'} and takes none`, at, EXPECTED[quantity]);
  }
  const value = typeof raw === 'number' ? raw : typeof raw === 'string' && raw.trim() !== '' ? Number(raw) : NaN;
  if (!Number.isFinite(value)) throw new StudyError(`${what} is not a number`, at, EXPECTED[quantity]);
  return { value, written: typeof raw === 'string' ? raw.trim() : String(raw) };
}

/** The domain of a field: a value outside it is an error, not a warning. `written` is the text as the study gave it. */
export function checkDomain(field: string, quantity: Quantity, value: number, at: Pos, what: string, written?: string): void {
  const fail = (rule: string) => new StudyError(`${what} is ${written ?? formatPlain(value)}, outside its domain`, at, rule);
  if (!Number.isFinite(value)) throw fail('a finite number');
  if (quantity === 'probability' && (value < 0 || value > 1)) throw fail('a probability between 0 and 1');
  if (quantity === 'rate' && value < 0) throw fail('a rate of zero or more');
  if (quantity === 'duration' && value < 0) throw fail('a duration of zero or more');
  if ((field === 'shape' || field === 'scale' || field === 'interval') && value <= 0) throw fail(`a ${field} greater than zero`);
}

function formatPlain(v: number): string {
  return String(v);
}

export interface ParameterContext {
  file: YamlFile;
  path: PathSegment[];
  owner: string;
  ownerKind: Parameter['ownerKind'];
  field: string;
  /** The owner's default source, used when the parameter names none. */
  defaultSource?: string;
  /** Fitted values by fit id, for `{ fit: id }` parameters. */
  fitted: (fitId: string, field: string, at: Pos) => { value: number; written: string };
}

/** Build a Parameter from its raw YAML value. */
export function readParameter(raw: unknown, ctx: ParameterContext): Parameter {
  const quantity = quantityOfField(ctx.field);
  const at = ctx.file.at(ctx.path);
  const what = `'${ctx.owner}.${ctx.field}'`;
  const base = { key: `${ctx.owner}.${ctx.field}`, owner: ctx.owner, ownerKind: ctx.ownerKind, field: ctx.field, quantity, at } as const;
  if (typeof raw !== 'object' || raw === null) {
    const q = readQuantity(raw, quantity, at, what, ctx.field, ctx.file.sourceAt?.(ctx.path));
    checkDomain(ctx.field, quantity, q.value, at, what, q.written);
    return { ...base, value: q.value, written: q.written, ...(ctx.defaultSource ? { source: ctx.defaultSource } : {}) };
  }
  const obj = raw as Record<string, unknown>;
  if (obj.value !== undefined && obj.fit !== undefined) throw new StudyError(`${what} gives both 'value' and 'fit'`, at, "either 'value: …' or 'fit: <fit id>'");
  let q: { value: number; written: string };
  if (obj.fit !== undefined) {
    q = ctx.fitted(String(obj.fit), ctx.field, ctx.file.at([...ctx.path, 'fit']));
  } else if (obj.value !== undefined) {
    q = readQuantity(obj.value, quantity, ctx.file.at([...ctx.path, 'value']), what, ctx.field, ctx.file.sourceAt?.([...ctx.path, 'value']));
  } else {
    throw new StudyError(`${what} has neither 'value' nor 'fit'`, at, `'value: …' (${EXPECTED[quantity]}) or 'fit: <fit id>'`);
  }
  checkDomain(ctx.field, quantity, q.value, at, what, q.written);
  const p: Parameter = { ...base, value: q.value, written: q.written };
  const source = typeof obj.source === 'string' ? obj.source : ctx.defaultSource;
  if (source) p.source = source;
  if (typeof obj.note === 'string') p.note = obj.note;
  if (obj.fit !== undefined) p.fit = String(obj.fit);
  if (Array.isArray(obj.range)) {
    const rangeAt = ctx.file.at([...ctx.path, 'range']);
    const end = (i: 0 | 1, name: string): number => {
      const endAt = ctx.file.at([...ctx.path, 'range', i]);
      const r = readQuantity((obj.range as unknown[])[i], quantity, endAt, `${what} range ${name} end`, ctx.field, ctx.file.sourceAt?.([...ctx.path, 'range', i]));
      checkDomain(ctx.field, quantity, r.value, endAt, `${what} range ${name} end`, r.written);
      return r.value;
    };
    const lo = end(0, 'low');
    const hi = end(1, 'high');
    if (!(lo <= q.value && q.value <= hi)) {
      throw new StudyError(`${what} range [${obj.range.join(', ')}] does not contain the value ${q.written}`, rangeAt, 'a range [low, high] with low ≤ value ≤ high');
    }
    p.range = [lo, hi];
  }
  if (obj.uncertainty !== undefined) {
    p.uncertainty = readUncertainty(obj.uncertainty as Record<string, Record<string, unknown>>, quantity, ctx, what, q.written);
    checkAgreement(p, ctx.file.at([...ctx.path, 'uncertainty']));
  } else if (obj.fit !== undefined && (ctx.field === 'shape' || ctx.field === 'scale')) {
    // A fitted shape and scale carry the fit's own uncertainty, sampled jointly.
    p.uncertainty = { kind: 'fit', fit: String(obj.fit), which: ctx.field };
  }
  return p;
}

/**
 * A point value and its own distribution must describe the same number: a point value outside the
 * distribution's 1st–99th percentile is a slip (a rate per year with a median per hour is 8766×
 * apart), not a judgement to sample from.
 */
function checkAgreement(p: Parameter, at: Pos): void {
  const u = p.uncertainty;
  if (!u || u.kind === 'fit') return;
  const lo = sampleQuantile(u, 0.01);
  const hi = sampleQuantile(u, 0.99);
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) return;
  const slack = 1e-9 * Math.max(Math.abs(lo), Math.abs(hi));
  if (p.value >= lo - slack && p.value <= hi + slack) return;
  const show = (v: number) => inUnitsOf(v, p.quantity, p.written);
  throw new StudyError(
    `'${p.key}' is ${p.written}, outside its own uncertainty's 1st–99th percentile (${show(lo)} to ${show(hi)})`,
    at,
    'a point value and a distribution in the same unit that describe the same number (check the units of both)',
  );
}

/** A value in the unit the study wrote its point value in (so `/h` stays `/h`). */
function inUnitsOf(v: number, quantity: Quantity, written: string): string {
  const unit = /([A-Za-z]+)\s*$/.exec(written)?.[1];
  const key = unit ? unitKey(unit) : undefined;
  if (quantity === 'rate') return formatRate(v, key ?? 'year');
  if (quantity === 'duration') return formatDuration(v);
  return String(Number(v.toPrecision(4)));
}

/** The point value and an uncertainty number must both carry a unit of the same dimension, or both none. */
function checkSameUnitKind(raw: unknown, quantity: Quantity, at: Pos, what: string, name: string, pointWritten: string): void {
  if (typeof raw !== 'number' && typeof raw !== 'string') return;
  const text = String(raw).trim();
  const bare = isBareNumber(text);
  const kindOf = (t: string): string => (isBareNumber(t) ? 'none' : parseRate(t).ok ? 'rate' : parseDuration(t).ok ? 'duration' : 'other');
  const unitful = quantity === 'duration' || quantity === 'rate';
  if (unitful && bare) {
    const unit = pointWritten.replace(/^[-+0-9.eE]+\s*/, '');
    throw new StudyError(`${what} is ${pointWritten} with a unit, but its uncertainty ${name} ${text} has none`, at, `the ${name} with its unit too, e.g. "${text} ${unit}"`);
  }
  if (!unitful && !bare && kindOf(text) !== 'other') {
    throw new StudyError(`${what} is ${pointWritten} with no unit, but its uncertainty ${name} is written "${text}"`, at, `a ${quantity === 'probability' ? 'probability' : 'plain number'} for the ${name} as for the value`);
  }
  const k = kindOf(text);
  if (unitful && (k === 'rate' || k === 'duration') && k !== quantity) {
    throw new StudyError(`${what} is a ${quantity} (${pointWritten}), but its uncertainty ${name} "${text}" is a ${k}`, at, `the ${name} as a ${quantity}, in a unit like the value's`);
  }
}

function readUncertainty(raw: Record<string, Record<string, unknown>>, quantity: Quantity, ctx: ParameterContext, what: string, pointWritten: string): Uncertainty {
  const kind = Object.keys(raw)[0]!;
  const body = raw[kind]!;
  const path = [...ctx.path, 'uncertainty', kind];
  const num = (name: string, q: Quantity = quantity): number => {
    const at = ctx.file.at([...path, name]);
    const source = ctx.file.sourceAt?.([...path, name]);
    const raw = typeof body[name] === 'number' && source !== undefined && Number(source) === body[name] ? source : body[name];
    if (q === quantity) checkSameUnitKind(raw, quantity, at, what, name, pointWritten);
    return readQuantity(raw, q, at, `${what} uncertainty ${name}`, ctx.field).value;
  };
  const at = ctx.file.at(path);
  const positive = (name: string, v: number) => {
    if (!(v > 0)) throw new StudyError(`${what} uncertainty: ${name} must be greater than zero`, ctx.file.at([...path, name]), `a positive ${name}`);
    return v;
  };
  switch (kind) {
    case 'lognormal': {
      const ef = num('ef', 'number');
      if (!(ef >= 1)) throw new StudyError(`${what} uncertainty: error factor ${ef} is below 1`, ctx.file.at([...path, 'ef']), 'an error factor EF ≥ 1 (95th / 50th percentile)');
      if (body.median !== undefined && body.mean !== undefined) throw new StudyError(`${what} uncertainty gives both median and mean`, at, 'one of median or mean, with ef');
      if (body.median !== undefined) return { kind: 'lognormal', median: positive('median', num('median')), ef };
      if (body.mean === undefined) throw new StudyError(`${what} lognormal uncertainty needs a median or a mean`, at, 'lognormal: { median: …, ef: … }');
      // NUREG/CR-6823: mean = median·exp(σ²/2), σ = ln(EF)/1.645.
      const sigma = Math.log(ef) / 1.645;
      return { kind: 'lognormal', median: positive('mean', num('mean')) / Math.exp((sigma * sigma) / 2), ef };
    }
    case 'normal': {
      const u: Uncertainty = { kind: 'normal', mean: num('mean'), sd: positive('sd', num('sd')) };
      if (body.min !== undefined) u.min = num('min');
      if (body.max !== undefined) u.max = num('max');
      if (u.min !== undefined && u.max !== undefined && !(u.min < u.max)) throw new StudyError(`${what} uncertainty: min must be below max`, at, 'min < max');
      return u;
    }
    case 'uniform': {
      const min = num('min');
      const max = num('max');
      if (!(min < max)) throw new StudyError(`${what} uncertainty: min must be below max`, at, 'min < max');
      return { kind: 'uniform', min, max };
    }
    case 'triangular': {
      const min = num('min');
      const mode = num('mode');
      const max = num('max');
      if (!(min <= mode && mode <= max && min < max)) throw new StudyError(`${what} uncertainty: needs min ≤ mode ≤ max`, at, 'min ≤ mode ≤ max with min < max');
      return { kind: 'triangular', min, mode, max };
    }
    case 'beta': {
      if (quantity !== 'probability') throw new StudyError(`${what}: a beta distribution is only for probabilities`, at, 'lognormal, normal, uniform, triangular or gamma');
      return { kind: 'beta', a: positive('a', num('a', 'number')), b: positive('b', num('b', 'number')) };
    }
    case 'gamma':
      return { kind: 'gamma', shape: positive('shape', num('shape', 'number')), scale: positive('scale', num('scale')) };
    default:
      throw new StudyError(`${what}: unknown uncertainty '${kind}'`, at, 'lognormal, normal, uniform, triangular, beta or gamma');
  }
}
