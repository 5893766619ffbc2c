/**
 * Reading one number of a study: plain (`shape: 3.1`, `scale: 75 years`) or with provenance and
 * uncertainty (`{ value, source, note, range, uncertainty }`), into canonical units, with the domain
 * of its field checked. Unit parsing itself lives in reliability/units (pure); this module adds the
 * file positions.
 */
import { parseDuration, parseRate } from '../reliability/units.js';
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
  rate: 'a rate such as "2e-3 /year" or "1e-6 /h" (a bare number is per year)',
  duration: 'a duration such as "8 h", "3 days", "1 month" or "75 years" (a bare number is years)',
  number: 'a number, e.g. 3.1',
};

/** Parse a scalar of a quantity; throws StudyError at `at`. Returns canonical value and the text as written. */
export function readQuantity(raw: unknown, quantity: Quantity, at: Pos, what: string): { value: number; written: string } {
  if (quantity === 'duration' || quantity === 'rate') {
    if (typeof raw !== 'number' && typeof raw !== 'string') throw new StudyError(`${what} must be a number or text with a unit`, at, EXPECTED[quantity]);
    const r = quantity === 'duration' ? parseDuration(raw) : parseRate(raw);
    if (!r.ok) throw new StudyError(`${what}: ${r.message}`, at, r.expected);
    return { value: r.value, written: r.written };
  }
  const value = typeof raw === 'number' ? raw : typeof raw === 'string' && raw.trim() !== '' ? Number(raw) : NaN;
  if (!Number.isFinite(value)) throw new StudyError(`${what} is not a number`, at, EXPECTED[quantity]);
  return { value, written: typeof raw === 'string' ? raw.trim() : String(raw) };
}

/** The domain of a field: a value outside it is an error, not a warning. */
export function checkDomain(field: string, quantity: Quantity, value: number, at: Pos, what: string): void {
  const fail = (rule: string) => new StudyError(`${what} is ${formatPlain(value)}, outside its domain`, at, rule);
  if (!Number.isFinite(value)) throw fail('a finite number');
  if (quantity === 'probability' && (value < 0 || value > 1)) throw fail('a probability between 0 and 1');
  if (quantity === 'rate' && value < 0) throw fail('a rate of zero or more');
  if (quantity === 'duration' && value < 0) throw fail('a duration of zero or more');
  if ((field === 'shape' || field === 'scale' || field === 'interval') && value <= 0) throw fail(`a ${field} greater than zero`);
}

function formatPlain(v: number): string {
  return Number.isFinite(v) ? String(v) : String(v);
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
    const q = readQuantity(raw, quantity, at, what);
    checkDomain(ctx.field, quantity, q.value, at, what);
    return { ...base, value: q.value, written: q.written, ...(ctx.defaultSource ? { source: ctx.defaultSource } : {}) };
  }
  const obj = raw as Record<string, unknown>;
  if (obj.value !== undefined && obj.fit !== undefined) throw new StudyError(`${what} gives both 'value' and 'fit'`, at, "either 'value: …' or 'fit: <fit id>'");
  let q: { value: number; written: string };
  if (obj.fit !== undefined) {
    q = ctx.fitted(String(obj.fit), ctx.field, ctx.file.at([...ctx.path, 'fit']));
  } else if (obj.value !== undefined) {
    q = readQuantity(obj.value, quantity, ctx.file.at([...ctx.path, 'value']), what);
  } else {
    throw new StudyError(`${what} has neither 'value' nor 'fit'`, at, `'value: …' (${EXPECTED[quantity]}) or 'fit: <fit id>'`);
  }
  checkDomain(ctx.field, quantity, q.value, at, what);
  const p: Parameter = { ...base, value: q.value, written: q.written };
  const source = typeof obj.source === 'string' ? obj.source : ctx.defaultSource;
  if (source) p.source = source;
  if (typeof obj.note === 'string') p.note = obj.note;
  if (obj.fit !== undefined) p.fit = String(obj.fit);
  if (Array.isArray(obj.range)) {
    const rangeAt = ctx.file.at([...ctx.path, 'range']);
    const lo = readQuantity(obj.range[0], quantity, rangeAt, `${what} range`).value;
    const hi = readQuantity(obj.range[1], quantity, rangeAt, `${what} range`).value;
    checkDomain(ctx.field, quantity, lo, rangeAt, `${what} range low end`);
    checkDomain(ctx.field, quantity, hi, rangeAt, `${what} range high end`);
    if (!(lo <= q.value && q.value <= hi)) {
      throw new StudyError(`${what} range [${obj.range.join(', ')}] does not contain the value ${q.written}`, rangeAt, 'a range [low, high] with low ≤ value ≤ high');
    }
    p.range = [lo, hi];
  }
  if (obj.uncertainty !== undefined) {
    p.uncertainty = readUncertainty(obj.uncertainty as Record<string, Record<string, unknown>>, quantity, ctx, what);
  } else if (obj.fit !== undefined && (ctx.field === 'shape' || ctx.field === 'scale')) {
    // A fitted shape and scale carry the fit's own uncertainty, sampled jointly.
    p.uncertainty = { kind: 'fit', fit: String(obj.fit), which: ctx.field };
  }
  return p;
}

function readUncertainty(raw: Record<string, Record<string, unknown>>, quantity: Quantity, ctx: ParameterContext, what: string): Uncertainty {
  const kind = Object.keys(raw)[0]!;
  const body = raw[kind]!;
  const path = [...ctx.path, 'uncertainty', kind];
  const num = (name: string, q: Quantity = quantity): number => {
    const at = ctx.file.at([...path, name]);
    return readQuantity(body[name], q, at, `${what} uncertainty ${name}`).value;
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
