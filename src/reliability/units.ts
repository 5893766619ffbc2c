/**
 * Durations, rates and dates as a study writes them, into the project's canonical units:
 * durations in years (1 year = 365.25 days, the Julian year; 1 month = 1/12 year), rates per year.
 *
 * The parsers never throw. Each returns a discriminated result so the study reader can put the file
 * and line beside the message; on failure `expected` says what would have been right.
 */

/** Days in the canonical year (the Julian year, which averages the leap years in). */
export const DAYS_PER_YEAR = 365.25;
export const HOURS_PER_YEAR = DAYS_PER_YEAR * 24;

export type ParseResult<T> =
  | { ok: true; value: T; written: string }
  /** `bare`: the text was a number without a unit, which a duration or rate refuses. */
  | { ok: false; message: string; expected: string; bare?: true };

interface UnitDef {
  /** Length of one unit in years. */
  years: number;
  /** Spellings accepted (compared in lower case). */
  names: string[];
}

/** One table for parsing and formatting, so the two never disagree. Largest first. */
const UNITS: { key: string; singular: string; plural: string; def: UnitDef }[] = [
  { key: 'year', singular: 'year', plural: 'years', def: { years: 1, names: ['y', 'yr', 'yrs', 'year', 'years'] } },
  { key: 'month', singular: 'month', plural: 'months', def: { years: 1 / 12, names: ['mo', 'month', 'months'] } },
  { key: 'week', singular: 'week', plural: 'weeks', def: { years: 7 / DAYS_PER_YEAR, names: ['wk', 'week', 'weeks'] } },
  { key: 'day', singular: 'day', plural: 'days', def: { years: 1 / DAYS_PER_YEAR, names: ['d', 'day', 'days'] } },
  { key: 'h', singular: 'h', plural: 'h', def: { years: 1 / HOURS_PER_YEAR, names: ['h', 'hr', 'hrs', 'hour', 'hours'] } },
  { key: 'min', singular: 'min', plural: 'min', def: { years: 1 / (HOURS_PER_YEAR * 60), names: ['min', 'mins', 'minute', 'minutes'] } },
];

export type DurationUnit = 'year' | 'month' | 'week' | 'day' | 'h' | 'min';

/** Years in one of the unit, by any accepted spelling; undefined when the spelling is unknown. */
export function unitInYears(name: string): number | undefined {
  const lower = name.toLowerCase();
  for (const u of UNITS) if (u.def.names.includes(lower)) return u.def.years;
  return undefined;
}

/** The table key of a unit spelling (`hours` → `h`), or undefined when unknown. */
export function unitKey(name: string): DurationUnit | undefined {
  const lower = name.toLowerCase();
  return UNITS.find((u) => u.def.names.includes(lower))?.key as DurationUnit | undefined;
}

const DURATION_EXPECTED = 'a duration with its unit, such as "8 h", "3 days" or "0.5 year" (units: min, h, day, week, month, year)';
const RATE_EXPECTED = 'a rate with its unit, such as "2e-3 /year", "1e-6 /h" or "0.5 per year"';
const DATE_EXPECTED = 'an ISO date: "1994", "1994-05" or "2026-06-30"';

/** A decimal number as JSON and YAML write it: optional sign, digits, fraction, exponent. */
const NUMBER = String.raw`[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?`;
const DURATION_RE = new RegExp(`^(${NUMBER})\\s*([A-Za-z]+)?$`);
// "2e-3 /year", "2e-3/year", "0.5 per year", "3 / day"; the unit may be prefixed by a count of 1.
const RATE_RE = new RegExp(`^(${NUMBER})\\s*(?:(?:/|per\\s+)\\s*([A-Za-z]+))?$`, 'i');

function spell(input: string | number): string {
  return typeof input === 'number' ? String(input) : input.trim();
}

/** True when the text is a plain number with no unit (`10`, `2e-3`, `-4.5`). */
export function isBareNumber(input: string | number): boolean {
  return typeof input === 'number' || new RegExp(`^${NUMBER}$`).test(input.trim());
}

/**
 * A duration in years from a number and its unit (`8 h`, `3 days`, `1 month`, `0.25 year`,
 * `75 years`, `1e3 h`). A number without a unit is refused (`bare: true`): it once meant years, and
 * a repair time meant in hours silently became years. The sign is kept (the caller decides whether
 * a negative duration is allowed).
 */
export function parseDuration(input: string | number): ParseResult<number> {
  const written = spell(input);
  if (typeof input === 'number') {
    if (!Number.isFinite(input)) return { ok: false, message: `${written} is not a finite duration`, expected: DURATION_EXPECTED };
    return { ok: false, message: `${written} has no unit`, expected: DURATION_EXPECTED, bare: true };
  }
  if (written === '') return { ok: false, message: 'the duration is empty', expected: DURATION_EXPECTED };
  if (/[/]|\bper\b/i.test(written)) {
    return { ok: false, message: `"${written}" is a rate, not a duration`, expected: DURATION_EXPECTED };
  }
  const m = DURATION_RE.exec(written);
  if (!m) return { ok: false, message: `"${written}" is not a number with a unit`, expected: DURATION_EXPECTED };
  const amount = Number(m[1]);
  if (!Number.isFinite(amount)) return { ok: false, message: `"${written}" is too large a number`, expected: DURATION_EXPECTED };
  const unit = m[2];
  if (unit === undefined) return { ok: false, message: `${written} has no unit`, expected: DURATION_EXPECTED, bare: true };
  if (unit === 'm' || unit === 'M') {
    return { ok: false, message: `"${unit}" could mean minutes or months`, expected: `"${m[1]} min" or "${m[1]} month"` };
  }
  const years = unitInYears(unit);
  if (years === undefined) return { ok: false, message: `unknown unit "${unit}" in "${written}"`, expected: DURATION_EXPECTED };
  return { ok: true, value: amount * years, written };
}

/**
 * A rate per year from a number and its `/unit` or `per unit` (`2e-3 /year`, `1e-6 /h`,
 * `0.5 per year`, `3 /day`, `0.1 /month`). A number without a unit is refused (`bare: true`).
 */
export function parseRate(input: string | number): ParseResult<number> {
  const written = spell(input);
  if (typeof input === 'number') {
    if (!Number.isFinite(input)) return { ok: false, message: `${written} is not a finite rate`, expected: RATE_EXPECTED };
    return { ok: false, message: `${written} has no unit`, expected: RATE_EXPECTED, bare: true };
  }
  if (written === '') return { ok: false, message: 'the rate is empty', expected: RATE_EXPECTED };
  const m = RATE_RE.exec(written);
  if (!m) {
    const looksLikeDuration = DURATION_RE.test(written);
    return {
      ok: false,
      message: looksLikeDuration ? `"${written}" is a duration, not a rate (write the unit after "/")` : `"${written}" is not a rate`,
      expected: RATE_EXPECTED,
    };
  }
  const amount = Number(m[1]);
  if (!Number.isFinite(amount)) return { ok: false, message: `"${written}" is too large a number`, expected: RATE_EXPECTED };
  const unit = m[2];
  if (unit === undefined) return { ok: false, message: `${written} has no unit`, expected: RATE_EXPECTED, bare: true };
  if (unit === 'm' || unit === 'M') {
    return { ok: false, message: `"/${unit}" could mean per minute or per month`, expected: `"${m[1]} /min" or "${m[1]} /month"` };
  }
  const years = unitInYears(unit);
  if (years === undefined) return { ok: false, message: `unknown unit "${unit}" in "${written}"`, expected: RATE_EXPECTED };
  return { ok: true, value: amount / years, written };
}

// ---------------------------------------------------------------------------------------------
// Dates

/** A calendar date (proleptic Gregorian) as far as it was written. */
export interface CalendarDate {
  year: number;
  /** 1–12; 1 when only the year was written. */
  month: number;
  /** 1–31; 1 when only the year or month was written. */
  day: number;
  /** How much of the date was written. */
  precision: 'year' | 'month' | 'day';
  /** Days since 1970-01-01, for differences. */
  dayNumber: number;
  /** The date in full ISO form, YYYY-MM-DD. */
  iso: string;
}

/**
 * Days from 1970-01-01 to a proleptic Gregorian date, by whole-era arithmetic (H. Hinnant,
 * "chrono-compatible low-level date algorithms", `days_from_civil`). No Date object, so no time
 * zone or platform can change the answer.
 */
function daysFromCivil(year: number, month: number, day: number): number {
  const y = month <= 2 ? year - 1 : year;
  const era = Math.floor(y / 400);
  const yoe = y - era * 400; // [0, 399]
  const mp = (month + 9) % 12; // March = 0
  const doy = Math.floor((153 * mp + 2) / 5) + day - 1; // [0, 365]
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy; // [0, 146096]
  return era * 146097 + doe - 719468;
}

function isLeap(year: number): boolean {
  return (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0;
}

function daysInMonth(year: number, month: number): number {
  return [31, isLeap(year) ? 29 : 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31][month - 1]!;
}

/**
 * An ISO 8601 calendar date: `1994`, `1994-05` or `2026-06-30`. A year-only or month-only date
 * means the START of that period (1994 → 1994-01-01, 1994-05 → 1994-05-01). Why the start: it is a
 * fixed rule anyone can predict from the text, and it is never later than the writer meant, so an
 * age counted from an installation or renewal date is never understated by the rounding.
 */
export function parseDate(text: string): ParseResult<CalendarDate> {
  const written = String(text).trim();
  const m = /^(\d{4})(?:-(\d{2})(?:-(\d{2}))?)?$/.exec(written);
  if (!m) {
    const hint = /^\d{1,2}[./-]\d{1,2}[./-]\d{2,4}$/.test(written) ? ' (day-first and month-first forms are ambiguous)' : '';
    return { ok: false, message: `"${written}" is not an ISO date${hint}`, expected: DATE_EXPECTED };
  }
  const year = Number(m[1]);
  const month = m[2] === undefined ? 1 : Number(m[2]);
  const day = m[3] === undefined ? 1 : Number(m[3]);
  if (month < 1 || month > 12) return { ok: false, message: `"${written}" has month ${m[2]}, not 01–12`, expected: DATE_EXPECTED };
  const dim = daysInMonth(year, month);
  if (day < 1 || day > dim) {
    return { ok: false, message: `"${written}": ${m[1]}-${m[2]} has days 01–${dim}`, expected: DATE_EXPECTED };
  }
  const precision = m[3] !== undefined ? 'day' : m[2] !== undefined ? 'month' : 'year';
  const iso = `${m[1]}-${String(month).padStart(2, '0')}-${String(day).padStart(2, '0')}`;
  return { ok: true, value: { year, month, day, precision, dayNumber: daysFromCivil(year, month, day), iso }, written };
}

/**
 * Years from one date to another, (days between)/365.25; negative when `to` is earlier. Dates may
 * be given as ISO text or as parsed dates; text that is not a date gives NaN (callers parse first
 * and report errors there).
 */
export function yearsBetween(from: string | CalendarDate, to: string | CalendarDate): number {
  const a = typeof from === 'string' ? parseDate(from) : { ok: true as const, value: from };
  const b = typeof to === 'string' ? parseDate(to) : { ok: true as const, value: to };
  if (!a.ok || !b.ok) return NaN;
  return (b.value.dayNumber - a.value.dayNumber) / DAYS_PER_YEAR;
}

// ---------------------------------------------------------------------------------------------
// Formatting for reports

/** Up to `digits` significant digits, no trailing zeros, no exponent for ordinary magnitudes. */
function significant(v: number, digits: number): string {
  if (v === 0) return '0';
  const rounded = Number(v.toPrecision(digits));
  const abs = Math.abs(rounded);
  if (abs >= 1e-3 && abs < 1e7) return String(rounded);
  return exponential(rounded, digits);
}

/** `2e-3`, `8.766e-3`, `1.5e+7` → `1.5e7`: mantissa without trailing zeros. */
function exponential(v: number, digits: number): string {
  const [mant, exp] = v.toExponential(digits - 1).split('e') as [string, string];
  const m = mant.includes('.') ? mant.replace(/0+$/, '').replace(/\.$/, '') : mant;
  return `${m}e${exp.replace(/^\+/, '')}`;
}

/**
 * True when v (below 100 000) is a whole number or has one decimal, to within the rounding of the
 * unit conversion (about 1e-11 at that size, far inside the 1e-7 allowed). One decimal, not two, so
 * half a month reads "2.174 weeks" rather than "365.25 h".
 */
function isRound(v: number): boolean {
  if (!(Math.abs(v) < 1e5)) return false;
  return Math.abs(v * 10 - Math.round(v * 10)) <= 1e-7;
}

/**
 * A duration for a report, in its natural unit: the largest unit in which it is at least 1 and a
 * round number (`3 days`, `1 month`, `1000 h`, `75 years`), else the largest unit in which it is at
 * least 1, to 4 significant digits (`81.88 years`). Below a minute: minutes.
 */
export function formatDuration(years: number): string {
  if (Number.isNaN(years)) return 'NaN';
  if (!Number.isFinite(years)) return years > 0 ? '∞' : '−∞';
  if (years === 0) return '0 years';
  const sign = years < 0 ? '-' : '';
  const y = Math.abs(years);
  const fitting = UNITS.filter((u) => y / u.def.years >= 1 - 1e-12);
  // A round amount counts only up to 1000 of a unit: 21915 min is round but no way to say half a month.
  const chosen = fitting.find((u) => y / u.def.years <= 1000 + 1e-9 && isRound(y / u.def.years)) ?? fitting[0] ?? UNITS[UNITS.length - 1]!;
  const amount = y / chosen.def.years;
  const text = isRound(amount) ? String(Math.round(amount * 10) / 10) : significant(amount, 4);
  const name = text === '1' ? chosen.singular : chosen.plural;
  return `${sign}${text} ${name}`;
}

/**
 * A rate for a report, per year unless another unit is asked for: `2e-3 /year`, `0.5 /year`,
 * `1e-6 /h`. Small rates in exponent form (as data handbooks print them), 4 significant digits.
 */
export function formatRate(perYear: number, unit: DurationUnit = 'year'): string {
  const u = UNITS.find((x) => x.key === unit)!;
  const v = perYear * u.def.years;
  if (Number.isNaN(v)) return 'NaN';
  const text = v !== 0 && Math.abs(v) < 0.01 ? exponential(Number(v.toPrecision(4)), 4) : significant(v, 4);
  return `${text} /${u.singular}`;
}
