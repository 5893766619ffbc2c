/**
 * Field life records from a CSV file (the `data/*.csv` of a study, or the file given to
 * `faultbook fit`), read from text so the caller decides where the text comes from.
 *
 * Format (all decisions ours, written down here):
 * - The first row that is neither blank nor a comment is the header. Lines whose first non-blank
 *   character is `#` are comments. Column names are matched without regard to case or surrounding
 *   spaces. Columns we do not know (serial numbers, notes) are allowed and ignored.
 * - Life is given EITHER in a `life` column OR as two dates, `installed` and `ended` (ISO: `1994`,
 *   `1994-05`, `2026-06-30`; life = days between / 365.25). A header with both is refused, so one
 *   file has one way of stating life.
 * - Each `life` is a number with its own unit (`12 years`, `8000 h`), or a bare number whose unit is
 *   stated once: in the header (`life_h`, `life_years`, `life (hours)`, `life [h]`) or by the caller
 *   (`life_unit:` on a study's fit, `faultbook fit --life-unit`). A bare life with no stated unit is
 *   an error (it once meant years), as are two different stated units, and bare and united lives
 *   mixed in one column (one file, one way of writing life). Lives are returned in years, the
 *   project's canonical unit.
 * - `status` is `failed` or `suspended`. `running` and `in service` are accepted as suspended:
 *   a unit still running at the record date is exactly a suspension (right-censored life), and field
 *   sheets often say so in those words. Anything else is an error, so a typo is never guessed.
 * - Optional `group` (fits may be made per group) and `exclude` (a reason; the row is kept in the
 *   record, shown in reports, but left out of every fit).
 * - Fields may be quoted with `"` (a doubled `""` inside is one quote; quoted fields may hold commas
 *   and line breaks). Line ends may be LF, CRLF or CR. A leading byte-order mark is ignored.
 * Every problem is a StudyError at the file, line and column of the offending field.
 */
import type { LifeObservation } from '../reliability/fit/observations.js';
import { isBareNumber, parseDate, parseDuration, unitInYears, yearsBetween } from '../reliability/units.js';
import { StudyError } from './errors.js';
import type { Pos } from './types.js';

export type LifeStatus = 'failed' | 'suspended';

export interface LifeRecord {
  /** 1-based line of the row in the file. */
  line: number;
  /** Life in years. */
  life: number;
  status: LifeStatus;
  group?: string;
  /** Why the row is left out of fits; absent for rows that are fitted. */
  exclude?: string;
}

export interface LifeRecords {
  file: string;
  /** Unit that bare `life` numbers were read in; absent when every life carries its own unit (or life comes from dates). */
  lifeUnit?: string;
  /** Every data row, excluded ones too, in file order. */
  records: LifeRecord[];
  /** Distinct groups in order of first appearance (empty without a `group` column). */
  groups: string[];
  /** Position of the header row, for messages about the file as a whole. */
  at: Pos;
}

interface Cell {
  text: string;
  line: number;
  col: number;
}

interface Row {
  line: number;
  /** Column just past the last character of the row, for "field missing" messages. */
  endCol: number;
  cells: Cell[];
}

const HEADER_HINT = 'a header row such as "life,status" or "installed,ended,status" (optional: group, exclude)';
const STATUS_HINT = 'failed or suspended (running and in service also mean suspended)';
const SUSPENDED_WORDS = new Set(['suspended', 'running', 'in service', 'in-service']);

/** Splits CSV text into rows of cells with their positions, dropping blank and comment lines. */
function splitCsv(text: string, file: string): Row[] {
  const src = text.startsWith('\uFEFF') ? text.slice(1) : text;
  const rows: Row[] = [];
  let i = 0;
  let line = 1;
  let col = 1;
  const newlineAt = (k: number): number => (src[k] === '\r' ? (src[k + 1] === '\n' ? 2 : 1) : src[k] === '\n' ? 1 : 0);
  const advanceLine = (k: number): number => {
    const w = newlineAt(k);
    line += 1;
    col = 1;
    return k + w;
  };
  while (i < src.length) {
    // Blank or comment line: skip to the next line.
    let j = i;
    while (j < src.length && (src[j] === ' ' || src[j] === '\t')) j++;
    if (j >= src.length) break;
    if (newlineAt(j) > 0 || src[j] === '#') {
      while (j < src.length && newlineAt(j) === 0) j++;
      i = j < src.length ? advanceLine(j) : j;
      continue;
    }
    const row: Row = { line, endCol: 1, cells: [] };
    for (;;) {
      // One field, starting at i.
      let k = i;
      let c = col;
      while (k < src.length && (src[k] === ' ' || src[k] === '\t')) {
        k++;
        c++;
      }
      if (src[k] === '"') {
        const start: Cell = { text: '', line, col: c };
        k++;
        c++;
        let value = '';
        for (;;) {
          if (k >= src.length) throw new StudyError('a quoted field is not closed', { file, line: start.line, col: start.col }, 'a closing " for every opening "');
          if (src[k] === '"') {
            if (src[k + 1] === '"') {
              value += '"';
              k += 2;
              c += 2;
              continue;
            }
            k++;
            c++;
            break;
          }
          const w = newlineAt(k);
          if (w > 0) {
            value += '\n';
            k += w;
            line += 1;
            c = 1;
            continue;
          }
          value += src[k];
          k++;
          c++;
        }
        while (k < src.length && (src[k] === ' ' || src[k] === '\t')) {
          k++;
          c++;
        }
        if (k < src.length && src[k] !== ',' && newlineAt(k) === 0) {
          throw new StudyError('unexpected text after a closing quote', { file, line, col: c }, 'a comma or the end of the line after the closing "');
        }
        start.text = value;
        row.cells.push(start);
      } else {
        const cellCol = col;
        let value = '';
        while (k < src.length && src[k] !== ',' && newlineAt(k) === 0) {
          value += src[k];
          k++;
          c++;
        }
        row.cells.push({ text: value.trim(), line, col: cellCol + (value.length - value.trimStart().length) });
      }
      i = k;
      col = c;
      if (i < src.length && src[i] === ',') {
        i++;
        col++;
        continue;
      }
      row.endCol = col;
      if (i < src.length) i = advanceLine(i);
      break;
    }
    rows.push(row);
  }
  return rows;
}

function positionOf(file: string, cell: Cell): Pos {
  return { file, line: cell.line, col: cell.col };
}

/** `life_h`, `life_years`, `life (hours)`, `life [h]`: a life column that names the unit of its bare numbers. */
const LIFE_WITH_UNIT = /^life(?:[ _]+([a-z]+)|\s*[([]\s*([a-z]+)\s*[)\]])$/;

export interface LifeDataOptions {
  /** Unit of bare life numbers, from the caller (`life_unit:` of a fit, `--life-unit`). */
  lifeUnit?: string;
  /** The study's snapshot date: a record ending after it cannot have been observed. */
  asOf?: string;
  /** How the caller lets the user state the unit, for the message when none is stated (e.g. "`--life-unit h`"). */
  unitOption?: string;
}

export function parseLifeData(text: string, file: string, options: LifeDataOptions = {}): LifeRecords {
  const rows = splitCsv(text, file);
  const headerRow = rows[0];
  if (!headerRow) throw new StudyError('the file has no header row and no data', { file, line: 1, col: 1 }, HEADER_HINT);
  const headerAt: Pos = { file, line: headerRow.line, col: 1 };
  const names = headerRow.cells.map((c) => c.text.trim().toLowerCase());
  // A life column may carry the unit of its bare numbers in its name.
  let headerUnit: { unit: string; at: Pos } | undefined;
  names.forEach((name, k) => {
    const m = LIFE_WITH_UNIT.exec(name);
    if (!m) return;
    const unit = (m[1] ?? m[2])!;
    const at = positionOf(file, headerRow.cells[k]!);
    if (unitInYears(unit) === undefined) throw new StudyError(`the life column '${headerRow.cells[k]!.text.trim()}' names unknown unit '${unit}'`, at, "a life column such as 'life_h', 'life_years' or 'life (days)' (units: min, h, day, week, month, year)");
    headerUnit = { unit, at };
    names[k] = 'life';
  });
  const column = new Map<string, number>();
  names.forEach((name, k) => {
    if (name === '') return;
    if (column.has(name)) throw new StudyError(`column '${name}' appears twice in the header`, positionOf(file, headerRow.cells[k]!), 'each column name once');
    column.set(name, k);
  });
  const hasLife = column.has('life');
  const hasDates = column.has('installed') || column.has('ended');
  if (!column.has('status') || (!hasLife && !hasDates)) {
    const looksLikeData = headerRow.cells.some((c) => /^[+-]?\d/.test(c.text));
    throw new StudyError(
      looksLikeData ? 'the header row is missing (the first row holds data)' : `the header lacks ${!column.has('status') ? "a 'status'" : "a 'life'"} column`,
      headerAt,
      HEADER_HINT,
    );
  }
  if (hasLife && hasDates) {
    const k = column.get('installed') ?? column.get('ended')!;
    throw new StudyError("the header has both 'life' and dates", positionOf(file, headerRow.cells[k]!), "either a 'life' column or 'installed' and 'ended' columns, not both");
  }
  if (hasDates && !(column.has('installed') && column.has('ended'))) {
    throw new StudyError(`the header has '${column.has('installed') ? 'installed' : 'ended'}' without '${column.has('installed') ? 'ended' : 'installed'}'`, headerAt, "both 'installed' and 'ended' columns (life runs from one to the other)");
  }
  if (options.lifeUnit !== undefined && unitInYears(options.lifeUnit.trim()) === undefined) {
    throw new StudyError(`unknown life unit '${options.lifeUnit}'`, headerAt, 'one of min, h, day, week, month, year');
  }
  if (headerUnit && options.lifeUnit !== undefined && unitInYears(headerUnit.unit) !== unitInYears(options.lifeUnit.trim())) {
    throw new StudyError(`the header says lives are in '${headerUnit.unit}', but ${options.unitOption ? 'the life unit given' : 'the caller'} says '${options.lifeUnit}'`, headerUnit.at, 'one unit for the bare lives: in the header or given by the caller, not two different ones');
  }
  const lifeUnit = headerUnit?.unit ?? options.lifeUnit?.trim();
  const lifeColumn: LifeColumn = { unit: lifeUnit, how: options.unitOption };

  const records: LifeRecord[] = [];
  const groups: string[] = [];
  for (const row of rows.slice(1)) {
    if (row.cells.length !== names.length) {
      const extra = row.cells[names.length];
      throw new StudyError(
        `${row.cells.length} field${row.cells.length === 1 ? '' : 's'} where the header has ${names.length}`,
        extra ? positionOf(file, extra) : { file, line: row.line, col: row.endCol },
        `${names.length} fields: ${headerRow.cells.map((c) => c.text).join(',')}`,
      );
    }
    const cell = (name: string): Cell | undefined => {
      const k = column.get(name);
      return k === undefined ? undefined : row.cells[k];
    };
    const life = hasLife ? readLife(cell('life')!, file, lifeColumn) : readDates(cell('installed')!, cell('ended')!, file, options.asOf);
    const statusCell = cell('status')!;
    const word = statusCell.text.trim().toLowerCase().replace(/\s+/g, ' ');
    let status: LifeStatus;
    if (word === 'failed') status = 'failed';
    else if (SUSPENDED_WORDS.has(word)) status = 'suspended';
    else throw new StudyError(statusCell.text === '' ? 'the status is empty' : `unknown status '${statusCell.text}'`, positionOf(file, statusCell), STATUS_HINT);
    const record: LifeRecord = { line: row.line, life, status };
    const group = cell('group')?.text.trim();
    if (group) {
      record.group = group;
      if (!groups.includes(group)) groups.push(group);
    }
    const exclude = cell('exclude')?.text.trim();
    if (exclude) record.exclude = exclude;
    records.push(record);
  }
  if (records.length === 0) throw new StudyError('the file has a header but no data rows', headerAt, 'one row per unit under the header');
  if (!records.some((r) => r.status === 'failed' && r.exclude === undefined)) {
    const statusHeader = headerRow.cells[column.get('status')!]!;
    throw new StudyError(
      'no failures among the rows that are fitted: a fit needs at least one failure',
      positionOf(file, statusHeader),
      'at least one row with status failed and no exclude reason (rank regression needs two)',
    );
  }
  return { file, ...(hasLife && lifeUnit !== undefined ? { lifeUnit } : {}), records, groups, at: headerAt };
}

/** What the life column has shown so far: its stated unit, and whether its first life was bare (for the mixing rule). */
interface LifeColumn {
  unit: string | undefined;
  how: string | undefined;
  first?: { bare: boolean; line: number; text: string };
}

function readLife(cell: Cell, file: string, column: LifeColumn): number {
  const at = positionOf(file, cell);
  const text = cell.text.trim();
  if (text === '') throw new StudyError('the life is empty', at, 'a positive life such as "12 years" or "8000 h"');
  const bare = isBareNumber(text);
  if (column.first === undefined) column.first = { bare, line: cell.line, text };
  else if (column.first.bare !== bare) {
    throw new StudyError(
      `life ${text} is ${bare ? 'a bare number' : 'written with a unit'}, but line ${column.first.line} gives ${column.first.text} ${column.first.bare ? 'without' : 'with'} one`,
      at,
      'every life of the column written the same way: all with their unit ("12 years"), or all bare with the unit stated once (a header such as "life_years")',
    );
  }
  let years: number;
  if (bare) {
    const amount = Number(text);
    if (column.unit === undefined) {
      throw new StudyError(
        `life ${text} has no unit, and the file states none`,
        at,
        `the unit once for the whole column: a header such as "life_h" or "life (years)"${column.how ? `, or ${column.how}` : ''}; or a unit on each life ("${text} years")`,
      );
    }
    years = amount * unitInYears(column.unit)!;
  } else {
    const parsed = parseDuration(text);
    if (!parsed.ok) throw new StudyError(`life: ${parsed.message}`, at, 'a positive life such as "12 years" or "8000 h"');
    years = parsed.value;
  }
  if (!(years > 0)) throw new StudyError(`life ${text} is not positive`, at, 'a life greater than zero');
  return years;
}

function readDates(installedCell: Cell, endedCell: Cell, file: string, asOf?: string): number {
  const from = parseDate(installedCell.text);
  if (!from.ok) throw new StudyError(`installed: ${from.message}`, positionOf(file, installedCell), from.expected);
  const to = parseDate(endedCell.text);
  if (!to.ok) throw new StudyError(`ended: ${to.message}`, positionOf(file, endedCell), to.expected);
  if (asOf !== undefined && yearsBetween(asOf, to.value) > 0) {
    throw new StudyError(`ended ${endedCell.text} is after the study's as_of date ${asOf}`, positionOf(file, endedCell), `an end date on or before ${asOf} (a unit still running then is suspended at ${asOf})`);
  }
  const years = yearsBetween(from.value, to.value);
  if (!(years > 0)) {
    throw new StudyError(
      years === 0 ? `ended ${endedCell.text} is the installation date: zero life` : `ended ${endedCell.text} is before installed ${installedCell.text}`,
      positionOf(file, endedCell),
      'an end date after the installation date',
    );
  }
  return years;
}

/**
 * The lives to fit: rows without an exclude reason, of one group when given, as unit-free
 * observations (years).
 */
export function fitData(records: LifeRecords, group?: string): LifeObservation[] {
  if (group !== undefined && !records.groups.includes(group)) {
    throw new StudyError(`no group '${group}' in the life records`, records.at, records.groups.length ? `one of: ${records.groups.join(', ')}` : "a 'group' column in the file");
  }
  return records.records
    .filter((r) => r.exclude === undefined && (group === undefined || r.group === group))
    .map((r) => ({ time: r.life, failed: r.status === 'failed' }));
}
