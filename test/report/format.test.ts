import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { formatCount, formatNumber, formatProbability, formatRatio, formatScientific, formatShare } from '../../src/report/format.js';

describe('probabilities: 3 significant figures, E±NN exponent', () => {
  it('prints the usual cases as a reliability table would (common practice, no source)', () => {
    expect(formatProbability(1.234e-4)).toBe('1.23E-04');
    expect(formatProbability(1.235001e-4)).toBe('1.24E-04');
    expect(formatProbability(0.5)).toBe('5.00E-01');
    expect(formatProbability(1)).toBe('1.00E+00');
    expect(formatProbability(0.01078636648534054)).toBe('1.08E-02');
    expect(formatProbability(2.72e-5)).toBe('2.72E-05');
    expect(formatProbability(1e-100)).toBe('1.00E-100');
  });
  it('carries a rounded mantissa into the exponent (9.996e-5 is 1.00E-04, not 10.0E-05)', () => {
    expect(formatProbability(9.996e-5)).toBe('1.00E-04');
    expect(formatScientific(99960)).toBe('1.00E+05');
  });
  it('shows zero as 0 and a missing value as a dash', () => {
    expect(formatProbability(0)).toBe('0');
    expect(formatProbability(undefined)).toBe('—');
    expect(formatProbability(Number.NaN)).toBe('—');
  });
  it('reads back within half a unit of the third figure, mantissa in [1, 10) (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-300, max: 1, noNaN: true }), (p) => {
        const text = formatProbability(p);
        const m = /^(\d)\.(\d\d)E([+-])(\d{2,3})$/.exec(text);
        expect(m).not.toBeNull();
        const mantissa = Number(`${m![1]}.${m![2]}`);
        expect(mantissa).toBeGreaterThanOrEqual(1);
        expect(mantissa).toBeLessThan(10);
        const back = Number(text.replace('E', 'e'));
        // Half a unit in the last place of a 3-figure mantissa, relative to the value, plus float noise.
        expect(Math.abs(back - p) / p).toBeLessThanOrEqual(0.005 + 1e-12);
      }),
    );
  });
});

describe('shares as percentages', () => {
  it('keeps three significant figures, trailing zeros included', () => {
    expect(formatShare(0.6918585803957886)).toBe('69.2%');
    expect(formatShare(0.00452121901244678)).toBe('0.452%');
    expect(formatShare(0.0027047330176538345)).toBe('0.270%');
    expect(formatShare(1)).toBe('100%');
    expect(formatShare(0.9996)).toBe('100%');
  });
  it('groups the negligible ones', () => {
    expect(formatShare(6.2e-6)).toBe('<0.001%');
    expect(formatShare(0)).toBe('0%');
  });
});

describe('ratios and plain numbers', () => {
  it('RAW and RRW keep three figures; infinity is shown as such', () => {
    expect(formatRatio(92.70962574459824)).toBe('92.7');
    expect(formatRatio(1.0026828150745768)).toBe('1.00');
    expect(formatRatio(999.6)).toBe('1000');
    expect(formatRatio(Infinity)).toBe('∞');
  });
  it('plain numbers drop trailing zeros', () => {
    expect(formatNumber(3.1)).toBe('3.1');
    expect(formatNumber(3.58052307013901)).toBe('3.58');
    expect(formatNumber(75)).toBe('75');
    expect(formatNumber(2.5e-7)).toBe('2.50E-07');
  });
  it('counts carry thousands separators', () => {
    expect(formatCount(1234567)).toBe('1,234,567');
    expect(formatCount(19)).toBe('19');
  });
});
