/**
 * Every number the appendix prints goes through this module, so the HTML and the PDF (which both
 * read the view model) show the same characters, and one style is used throughout.
 *
 * Probabilities: engineering-style scientific notation with three significant figures and a signed
 * two-digit exponent, `1.23E-04`. It is the form reliability tables commonly use, it survives copy,
 * paste and text extraction unchanged (no superscripts), and it sorts visually by exponent.
 * Shares of the top-event probability: percentages. Durations and rates use the project's unit
 * formatters (src/reliability/units.ts), so the appendix writes them as the study reader reads them.
 */
import { formatDuration as unitsFormatDuration, formatRate as unitsFormatRate, unitInYears, type DurationUnit } from '../reliability/units.js';

const DASH = '—';

function finite(x: number | undefined | null): x is number {
  return typeof x === 'number' && Number.isFinite(x);
}

/** `1.23E-04`; exactly zero prints as `0`; a missing value as an em dash. */
export function formatProbability(p: number | undefined | null): string {
  if (!finite(p)) return DASH;
  if (p === 0) return '0';
  return formatScientific(p);
}

/** Three significant figures, mantissa with two decimals, exponent `E±NN`. */
export function formatScientific(x: number): string {
  if (!Number.isFinite(x)) return x > 0 ? '∞' : x < 0 ? '−∞' : DASH;
  if (x === 0) return '0';
  // toExponential rounds to the nearest representable 3-figure mantissa and carries into the exponent
  // (9.996e-5 → "1.00e-4"), which is what a hand-written table would show.
  const [mantissa, exponent] = x.toExponential(2).split('e');
  const e = Number(exponent);
  const sign = e < 0 ? '-' : '+';
  return `${mantissa}E${sign}${String(Math.abs(e)).padStart(2, '0')}`;
}

/**
 * A share of the top-event probability as a percentage: three significant figures (trailing zeros
 * kept, so a column reads evenly) down to 0.001%, below that `<0.001%` (noise in a ranked list).
 */
export function formatShare(share: number | undefined | null): string {
  if (!finite(share)) return DASH;
  if (share === 0) return '0%';
  const percent = share * 100;
  if (Math.abs(percent) < 0.001) return '<0.001%';
  return `${toSignificant(percent, 3)}%`;
}

/**
 * A plain quantity (a Weibull shape, a ratio such as RAW or RRW): three significant figures in
 * positional notation when that is readable, scientific otherwise. Infinity prints as `∞`
 * (RRW of an event that is in every cut set).
 */
export function formatNumber(x: number | undefined | null): string {
  if (typeof x === 'number' && Number.isNaN(x)) return DASH;
  if (x === Infinity) return '∞';
  if (x === -Infinity) return '−∞';
  if (!finite(x)) return DASH;
  if (x === 0) return '0';
  const a = Math.abs(x);
  if (a >= 1e5 || a < 1e-3) return formatScientific(x);
  return trimZeros(toSignificant(x, 3));
}

/** A ratio shown with three significant figures, trailing zeros kept (`1.00`, `12.4`): columns line up. */
export function formatRatio(x: number | undefined | null): string {
  if (x === Infinity) return '∞';
  if (!finite(x)) return DASH;
  const a = Math.abs(x);
  if (a !== 0 && (a >= 1e5 || a < 1e-3)) return formatScientific(x);
  return toSignificant(x, 3);
}

/** Whole numbers with thousands separators: `12,345`. */
export function formatCount(n: number | undefined | null): string {
  if (!finite(n)) return DASH;
  const sign = n < 0 ? '-' : '';
  const digits = String(Math.round(Math.abs(n)));
  return sign + digits.replace(/\B(?=(\d{3})+(?!\d))/g, ',');
}

/**
 * A duration given in years (the canonical unit) in its natural unit (`3 days`, `1 month`,
 * `75 years`): the project's one duration formatter, from src/reliability/units.ts.
 */
export function formatDuration(years: number | undefined | null): string {
  return finite(years) ? unitsFormatDuration(years) : DASH;
}

/** A rate given per year (canonical): `2e-3 /year`, `0.5 /year` (src/reliability/units.ts). */
export function formatRate(perYear: number | undefined | null): string {
  return finite(perYear) ? unitsFormatRate(perYear) : DASH;
}

/** An age in years at the study's `as_of` date, one decimal: `32.2 years` (ages are not exact to the day). */
export function formatAge(years: number | undefined | null): string {
  if (!finite(years)) return DASH;
  const text = years.toFixed(1);
  return `${text} ${text === '1.0' ? 'year' : 'years'}`;
}

/** A value of the given study quantity (`probability`, `rate`, `duration`, `number`) in canonical units. */
export function formatQuantity(quantity: string, value: number | undefined | null): string {
  switch (quantity) {
    case 'probability':
      return formatProbability(value);
    case 'rate':
      return formatRate(value);
    case 'duration':
      return formatDuration(value);
    default:
      return formatNumber(value);
  }
}

/** Unit names for durations shown in a written unit: singular and plural. */
const UNIT_WORDS: Record<DurationUnit, [string, string]> = {
  year: ['year', 'years'],
  month: ['month', 'months'],
  week: ['week', 'weeks'],
  day: ['day', 'days'],
  h: ['h', 'h'],
  min: ['min', 'min'],
};

/** The unit a study value was written in (`24 h` → h, `2e-3 /h` → h), if it is one we know. */
function writtenUnit(written: string | undefined): DurationUnit | undefined {
  const m = /^\s*[-+]?[\d.]+(?:[eE][-+]?\d+)?\s*(?:\/|per\s+)?\s*([A-Za-z]+)\s*$/.exec(written ?? '');
  if (!m) return undefined;
  const years = unitInYears(m[1]!);
  if (years === undefined) return undefined;
  return (Object.keys(UNIT_WORDS) as DurationUnit[]).find((k) => unitInYears(k) === years);
}

/**
 * A value of a study quantity in the unit its parameter was written in, so the appendix keeps the
 * author's units: a rate written `1e-3 /h` stays per hour, a duration written `24 h` stays hours
 * (halved, `12 h`, not `0.5 days`). Other quantities, or an unknown unit, as formatQuantity.
 */
export function formatAsWritten(quantity: string, value: number | undefined | null, written: string | undefined): string {
  if (!finite(value)) return DASH;
  const unit = writtenUnit(written);
  if (unit && quantity === 'rate') return unitsFormatRate(value, unit);
  if (unit && quantity === 'duration') {
    const amount = value / unitInYears(unit)!;
    const text = formatNumber(amount);
    return `${text} ${UNIT_WORDS[unit][text === '1' ? 0 : 1]}`;
  }
  return formatQuantity(quantity, value);
}

/** Positional notation with `figures` significant figures (never exponent form for 1e-3 ≤ |x| < 1e5). */
function toSignificant(x: number, figures: number): string {
  if (x === 0) return (0).toFixed(figures - 1);
  const magnitude = Math.floor(Math.log10(Math.abs(x)));
  // Rounding can carry into the next decade (999.6 → 1000); recompute the decimals from the rounded value.
  let decimals = Math.max(0, figures - 1 - magnitude);
  let text = x.toFixed(decimals);
  const roundedMagnitude = Math.floor(Math.log10(Math.abs(Number(text))));
  if (roundedMagnitude > magnitude) {
    decimals = Math.max(0, figures - 1 - roundedMagnitude);
    text = x.toFixed(decimals);
  }
  return text;
}

function trimZeros(text: string): string {
  return text.includes('.') ? text.replace(/\.?0+$/, '') : text;
}

/** The text with its first letter in capitals (a clause used as a sentence or a label). */
export function capitalise(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}
