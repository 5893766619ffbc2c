// Life-record CSV reader (src/study/life-data.ts). Format rules are ours (see the file's header);
// the checks here are that each rule holds and each bad row is reported at its own line and column.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { StudyError } from '../../src/study/errors.js';
import { fitData, parseLifeData } from '../../src/study/life-data.js';
import { BALL_BEARINGS_PATH, BALL_BEARINGS_UNIT } from './helpers.js';

/** The StudyError a text raises, for checking its place and hint (bare lives in years unless options say otherwise). */
function errorOf(text: string, options: { lifeUnit?: string; unitOption?: string } = { lifeUnit: 'years' }): StudyError {
  try {
    parseLifeData(text, 'data/test.csv', options);
  } catch (err) {
    if (err instanceof StudyError) return err;
    throw err;
  }
  throw new Error('expected a StudyError');
}

describe('reading life records', () => {
  it('reads the reference file: comments skipped, lines counted', () => {
    const recs = parseLifeData(readFileSync(BALL_BEARINGS_PATH, 'utf8'), 'ball-bearings.csv', BALL_BEARINGS_UNIT);
    expect(recs.records).toHaveLength(23);
    expect(recs.records[0]).toEqual({ line: 6, life: 17.88, status: 'failed' }); // 4 comment lines, then the header
    expect(recs.records[22]).toEqual({ line: 28, life: 173.4, status: 'failed' });
    expect(recs.groups).toEqual([]);
  });

  it('handles CRLF, a byte-order mark, quotes, units, synonyms, groups and exclusions', () => {
    const text = [
      '\uFEFF# invented records for this test',
      'Life , Status,group,exclude,note',
      '12 years,failed,hoist,,"plain"',
      '8766 h,suspended,hoist,,"a ""quoted"" note, with a comma"',
      '3 years,running,brake,,',
      '4.5 years,In Service,brake,,"two',
      'lines"',
      '2 years,failed,brake,damaged in transport,',
      '6 months,failed,brake,,',
      '',
    ].join('\r\n');
    const recs = parseLifeData(text, 'data/x.csv');
    expect(recs.records.map((r) => [r.line, r.life, r.status])).toEqual([
      [3, 12, 'failed'],
      [4, 1, 'suspended'], // 8766 h = 365.25 days (DESIGN.md: 1 year = 365.25 days)
      [5, 3, 'suspended'],
      [6, 4.5, 'suspended'],
      [8, 2, 'failed'],
      [9, 0.5, 'failed'],
    ]);
    expect(recs.groups).toEqual(['hoist', 'brake']);
    expect(recs.records[4]!.exclude).toBe('damaged in transport');
    expect(fitData(recs)).toHaveLength(5);
    expect(fitData(recs, 'brake')).toEqual([
      { time: 3, failed: false },
      { time: 4.5, failed: false },
      { time: 0.5, failed: true },
    ]);
    expect(() => fitData(recs, 'motor')).toThrow(StudyError);
  });

  it('reads bare lives in the given unit', () => {
    const recs = parseLifeData('life,status\n876.6,failed\n17532,failed\n', 'd.csv', { lifeUnit: 'h' });
    expect(recs.records[0]!.life).toBeCloseTo(0.1, 14); // 876.6 h / 8766 h per year
    expect(recs.records[1]!.life).toBeCloseTo(2, 14);
    expect(recs.lifeUnit).toBe('h');
  });

  // Our format (issue 11): the header may name the unit of its bare lives.
  it.each([
    ['life_h', 'h'],
    ['Life_Hours', 'hours'],
    ['life (days)', 'days'],
    ['life [years]', 'years'],
    ['life years', 'years'],
  ])('header %j gives the unit of bare lives', (header, unit) => {
    const recs = parseLifeData(`${header},status\n876.6,failed\n`, 'd.csv');
    expect(recs.lifeUnit).toBe(unit);
    const perYear = { h: 8766, hours: 8766, days: 365.25, years: 1 }[unit]!;
    expect(recs.records[0]!.life).toBeCloseTo(876.6 / perYear, 12);
  });

  it('a header unit and the same unit given by the caller agree', () => {
    expect(parseLifeData('life_h,status\n8766,failed\n', 'd.csv', { lifeUnit: 'hours' }).records[0]!.life).toBeCloseTo(1, 14);
  });

  it('computes life from installation and end dates (days / 365.25)', () => {
    const recs = parseLifeData('installed,ended,status\n2000-01-01,2010-01-01,failed\n1994-05,1995-05,suspended\n', 'd.csv');
    expect(recs.records[0]!.life).toBeCloseTo(3653 / 365.25, 14); // 2000–2009 hold 3 leap days
    expect(recs.records[1]!.life).toBeCloseTo(365 / 365.25, 14);
  });
});

describe('errors point at the bad field', () => {
  const cases: [string, string, { line: number; col: number }, RegExp][] = [
    ['negative life', 'life,status\n5,failed\n-3,failed\n', { line: 3, col: 1 }, /not positive/],
    ['zero life', 'life,status\n5 h,failed\n0 h,failed\n', { line: 3, col: 1 }, /not positive/],
    ['bare after united', 'life,status\n5 years,failed\n6,failed\n', { line: 3, col: 1 }, /life 6 is a bare number, but line 2 gives 5 years with one/],
    ['united after bare', 'life,status\n5,failed\n6 h,failed\n', { line: 3, col: 1 }, /life 6 h is written with a unit, but line 2 gives 5 without one/],
    ['unknown unit in the header', 'life_parsecs,status\n5,failed\n', { line: 1, col: 1 }, /names unknown unit 'parsecs'/],
    ['header and caller disagree', 'unit,life (h),status\nA,5,failed\n', { line: 1, col: 6 }, /the header says lives are in 'h', but .* says 'years'/],
    ['unknown status', 'life,status\n5,failed\n6,broken\n', { line: 3, col: 3 }, /unknown status 'broken'/],
    ['empty status', 'life,status\n5,failed\n6,\n', { line: 3, col: 3 }, /status is empty/],
    ['end before install', 'installed,ended,status\n2000,2010,failed\n2012-03,2011-06-30,failed\n', { line: 3, col: 9 }, /before installed/],
    ['end equal to install', 'installed,ended,status\n2000,2010,failed\n2012,2012,failed\n', { line: 3, col: 6 }, /zero life/],
    ['bad date', 'installed,ended,status\n2000,2010,failed\n03/04/2001,2010,failed\n', { line: 3, col: 1 }, /not an ISO date/],
    ['too many fields', 'life,status\n5,failed\n6,failed,extra\n', { line: 3, col: 10 }, /3 fields where the header has 2/],
    ['too few fields', 'life,status\n5,failed\n6\n', { line: 3, col: 2 }, /1 field where the header has 2/],
    ['missing header', '# comment\n5,failed\n6,failed\n', { line: 2, col: 1 }, /header row is missing/],
    ['header without status', 'life,state\n5,failed\n', { line: 1, col: 1 }, /lacks a 'status' column/],
    ['empty file', '# only a comment\n\n', { line: 1, col: 1 }, /no header row/],
    ['no data rows', 'life,status\n', { line: 1, col: 1 }, /no data rows/],
    ['no failures', 'life,status\n5,suspended\n6,running\n', { line: 1, col: 6 }, /no failures/],
    ['only excluded failures', 'life,status,exclude\n5,failed,bad record\n6,running,\n', { line: 1, col: 6 }, /no failures/],
    ['unclosed quote', 'life,status\n5,"failed\n', { line: 2, col: 3 }, /not closed/],
    ['text after a quote', 'life,status\n5,"failed"x\n', { line: 2, col: 11 }, /after a closing quote/],
    ['unknown unit', 'life,status\n5 fortnights,failed\n', { line: 2, col: 1 }, /unknown unit/],
    ['empty life', 'life,status\n,failed\n', { line: 2, col: 1 }, /life is empty/],
    ['life and dates', 'life,installed,ended,status\n5,2000,2001,failed\n', { line: 1, col: 6 }, /both 'life' and dates/],
    ['duplicate column', 'life,status,life\n5,failed,5\n', { line: 1, col: 13 }, /appears twice/],
    ['line numbers after CRLF and comments', '# a\r\n# b\r\nlife,status\r\n5,failed\r\n\r\n-1,failed\r\n', { line: 6, col: 1 }, /not positive/],
  ];
  for (const [name, text, at, message] of cases) {
    it(name, () => {
      const e = errorOf(text);
      expect(e.message).toMatch(message);
      expect(e.at).toEqual({ file: 'data/test.csv', ...at });
      expect(e.hint).toBeTruthy();
      expect(e.describe()).toContain(`data/test.csv:${at.line}:${at.col}: `);
    });
  }

  it('a bare life with no unit stated anywhere is an error that says where to state it', () => {
    const e = errorOf('life,status\n12.5,failed\n', { unitOption: '`--life-unit h`' });
    expect(e.message).toBe('life 12.5 has no unit, and the file states none');
    expect(e.at).toEqual({ file: 'data/test.csv', line: 2, col: 1 });
    expect(e.hint).toMatch(/"life_h".*`--life-unit h`.*"12.5 years"/);
  });

  it('an unknown life unit option is refused', () => {
    expect(errorOf('life,status\n5,failed\n', { lifeUnit: 'parsecs' }).message).toMatch(/unknown life unit/);
  });

  it('the no-failure message says what a fit needs', () => {
    expect(errorOf('life,status\n5,suspended\n').hint).toMatch(/at least one row with status failed.*rank regression needs two/);
  });
});
