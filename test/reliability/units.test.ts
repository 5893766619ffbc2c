// Units of the study format (DESIGN.md "Values and units"): 1 year = 365.25 days (the Julian year,
// common practice, no source), 1 month = 1/12 year, 1 day = 24 h. Each expected value below is
// the hand arithmetic written beside it.
import { describe, expect, it } from 'vitest';
import {
  DAYS_PER_YEAR,
  HOURS_PER_YEAR,
  formatDuration,
  formatRate,
  parseDate,
  parseDuration,
  parseRate,
  yearsBetween,
} from '../../src/reliability/units.js';

function value(r: ReturnType<typeof parseDuration>): number {
  if (!r.ok) throw new Error(`expected ok, got: ${r.message}`);
  return r.value;
}

describe('parseDuration', () => {
  it.each([
    ['8 h', 8 / 8766], // 8 h / (365.25 × 24 = 8766 h per year)
    ['8 hours', 8 / 8766],
    ['1 hour', 1 / 8766],
    ['8h', 8 / 8766],
    ['3 days', 3 / 365.25],
    ['1 day', 1 / 365.25],
    ['3 d', 3 / 365.25],
    ['2 weeks', 14 / 365.25], // 2 × 7 days
    ['1 week', 7 / 365.25],
    ['1 month', 1 / 12],
    ['6 months', 0.5],
    ['0.25 year', 0.25],
    ['75 years', 75],
    ['2 y', 2],
    ['2 yr', 2],
    ['1e3 h', 1000 / 8766],
    ['30 min', 30 / (8766 * 60)],
    ['.5 year', 0.5],
  ])('%s', (text, years) => {
    const r = parseDuration(text);
    expect(r.ok).toBe(true);
    expect(value(r)).toBeCloseTo(years, 15);
    if (r.ok) expect(r.written).toBe(text);
  });

  // A bare number once meant years; a repair time meant in hours silently became years (issue 11).
  it('refuses a number without its unit, and says it is bare', () => {
    for (const input of [5, 0.25, '4', ' 2e-3 ', '-1']) {
      const r = parseDuration(input);
      expect(r.ok).toBe(false);
      if (!r.ok) {
        expect(r.bare).toBe(true);
        expect(r.message).toBe(`${String(input).trim()} has no unit`);
      }
    }
  });

  it('the constants are the Julian year', () => {
    expect(DAYS_PER_YEAR).toBe(365.25);
    expect(HOURS_PER_YEAR).toBe(8766);
  });

  it.each([
    ['', /empty/],
    ['abc', /not a number with a unit/],
    ['3 fortnights', /unknown unit "fortnights"/],
    ['3 m', /minutes or months/],
    ['2e-3 /year', /a rate, not a duration/],
    ['1,5 days', /not a number/],
    ['5 days ago', /not a number/],
  ])('rejects %j with a helpful message', (text, message) => {
    const r = parseDuration(text);
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.message).toMatch(message);
      expect(r.expected).toMatch(/"8 h"|min/);
    }
  });

  it('rejects non-finite numbers', () => {
    for (const bad of [NaN, Infinity]) {
      const r = parseDuration(bad);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.expected).toContain('a duration with its unit, such as "8 h", "3 days" or "0.5 year"');
    }
    expect(parseDuration('1e999 h').ok).toBe(false);
  });
});

describe('parseRate', () => {
  it.each([
    ['2e-3 /year', 2e-3],
    ['2e-3/year', 2e-3],
    ['1e-6 /h', 1e-6 * 8766], // per hour × 8766 h per year = 8.766e-3 per year
    ['1e-6 per hour', 1e-6 * 8766],
    ['0.5 per year', 0.5],
    ['3 /day', 3 * 365.25],
    ['0.1 /month', 1.2], // 0.1 per month × 12 months
    ['1 /week', 365.25 / 7],
    ['0.5 PER YEAR', 0.5],
  ])('%s', (text, perYear) => {
    const r = parseRate(text);
    expect(r.ok).toBe(true);
    if (r.ok) {
      expect(r.value).toBeCloseTo(perYear, 12);
      expect(Math.abs(r.value - perYear) / perYear).toBeLessThan(1e-15);
      expect(r.written).toBe(text);
    }
  });

  it('refuses a number without its unit, and says it is bare', () => {
    for (const input of [7, '2e-3']) {
      const r = parseRate(input);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.bare).toBe(true);
    }
  });

  it.each([
    ['', /empty/],
    ['3 days', /a duration, not a rate/],
    ['2e-3 /fortnight', /unknown unit/],
    ['x /h', /not a rate/],
    ['1e-3 /m', /per minute or per month/],
  ])('rejects %j with a helpful message', (text, message) => {
    const r = parseRate(text);
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.message).toMatch(message);
      expect(r.expected).toMatch(/\/year|\/min/);
    }
  });
});

describe('parseDate and yearsBetween', () => {
  it('reads the three ISO precisions; year-only and month-only mean the start of the period', () => {
    const y = parseDate('1994');
    const m = parseDate('1994-05');
    const d = parseDate('2026-06-30');
    expect(y.ok && y.value.iso).toBe('1994-01-01');
    expect(y.ok && y.value.precision).toBe('year');
    expect(m.ok && m.value.iso).toBe('1994-05-01');
    expect(m.ok && m.value.precision).toBe('month');
    expect(d.ok && d.value.iso).toBe('2026-06-30');
    expect(d.ok && d.value.precision).toBe('day');
    expect(d.ok && d.written).toBe('2026-06-30');
  });

  it('day numbers agree with the JavaScript Date (UTC) over leap years and centuries', () => {
    // Independent check: Date.UTC counts milliseconds from 1970-01-01 in the proleptic Gregorian calendar (ECMA-262).
    for (const iso of ['1970-01-01', '1900-03-01', '2000-02-29', '2100-03-01', '1600-12-31', '2026-06-30', '1971-01-01']) {
      const r = parseDate(iso);
      expect(r.ok).toBe(true);
      const [yy, mm, dd] = iso.split('-').map(Number) as [number, number, number];
      if (r.ok) expect(r.value.dayNumber).toBe(Date.UTC(yy, mm - 1, dd) / 86400000);
    }
  });

  it('yearsBetween is days/365.25', () => {
    // 2000-01-01 → 2001-01-01 is 366 days (2000 is a leap year): 366/365.25.
    expect(yearsBetween('2000', '2001')).toBe(366 / 365.25);
    // 1994-05-01 → 2026-06-30: Date.UTC difference in days / 365.25.
    const days = (Date.UTC(2026, 5, 30) - Date.UTC(1994, 4, 1)) / 86400000;
    expect(yearsBetween('1994-05', '2026-06-30')).toBe(days / 365.25);
    expect(yearsBetween('2026-06-30', '1994-05')).toBe(-days / 365.25);
    // Four Julian years of 365.25 days are four Gregorian years spanning one leap day: exactly 4.
    expect(yearsBetween('2021-03-01', '2025-03-01')).toBe(4);
    const a = parseDate('2010-01-01');
    const b = parseDate('2011-01-01');
    if (a.ok && b.ok) expect(yearsBetween(a.value, b.value)).toBe(365 / 365.25);
    expect(Number.isNaN(yearsBetween('nonsense', '2000'))).toBe(true);
  });

  it.each([
    ['1994-13', /month 13/],
    ['2023-02-29', /days 01–28/],
    ['2024-04-31', /days 01–30/],
    ['30/06/2026', /ambiguous/],
    ['94', /not an ISO date/],
    ['1994-5', /not an ISO date/],
    ['', /not an ISO date/],
  ])('rejects %j', (text, message) => {
    const r = parseDate(text);
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.message).toMatch(message);
      expect(r.expected).toBe('an ISO date: "1994", "1994-05" or "2026-06-30"');
    }
  });
});

describe('formatDuration and formatRate', () => {
  it.each([
    [8 / 8766, '8 h'],
    [3 / 365.25, '3 days'],
    [1 / 12, '1 month'],
    [0.25, '3 months'],
    [75, '75 years'],
    [1, '1 year'],
    [1.5, '1.5 years'],
    [1000 / 8766, '1000 h'],
    [14 / 365.25, '2 weeks'],
    [30 / 365.25, '30 days'],
    [81.8843, '81.88 years'],
    [1 / 24, '2.174 weeks'], // half a month: not round in any unit, so the largest unit ≥ 1
    [0, '0 years'],
  ])('%d years → %s', (years, text) => {
    expect(formatDuration(years)).toBe(text);
  });

  it('round-trips through parseDuration', () => {
    for (const text of ['8 h', '3 days', '1 month', '75 years', '2 weeks', '45 min']) {
      const years = value(parseDuration(text));
      expect(formatDuration(years)).toBe(text);
    }
  });

  it.each([
    [2e-3, 'year', '2e-3 /year'],
    [0.5, 'year', '0.5 /year'],
    [1e-6 * 8766, 'h', '1e-6 /h'],
    [1e-6 * 8766, 'year', '8.766e-3 /year'],
    [12, 'month', '1 /month'],
    [0, 'year', '0 /year'],
  ] as const)('%d per year in %s → %s', (perYear, unit, text) => {
    expect(formatRate(perYear, unit)).toBe(text);
  });
});
