import type { ParameterResult } from '../../analysis/results.js';
import { col, counted, para, row, strong, subheading, table } from '../blocks.js';
import type { SectionRule } from '../context.js';
import { formatAsWritten, formatCount, formatQuantity } from '../format.js';
import type { Block, TableRow } from '../view.js';

/**
 * The provenance register: every number of the study, as written, as used, where it comes from and
 * what uses it; then every source. Numbers without a source are flagged, not hidden.
 */
export const provenance: SectionRule = (results, ctx) => {
  if (results.parameters.length === 0 && results.sources.length === 0) return null;
  const unsourced = results.parameters.filter((p) => !p.source);
  const blocks: Block[] = [];
  blocks.push(
    para(
      `The study states ${counted(results.parameters.length, 'number')} and cites ${counted(results.sources.length, 'source')}. `,
      ...(unsourced.length > 0
        ? [strong(`${formatCount(unsourced.length)} ${unsourced.length === 1 ? 'number cites' : 'numbers cite'} no source`), ' and ', unsourced.length === 1 ? 'is' : 'are', ' flagged below; each needs a reference or an explicit engineering judgement before the study is issued.']
        : ['Every number cites a source.']),
    ),
    subheading('sub-parameters', 'Parameters'),
    table({
      id: 'tab-parameters',
      number: ctx.nextTable(),
      caption: 'Parameter provenance',
      columns: [
        col('Parameter', 'left', { code: true, width: 'auto' }),
        col('As written', 'right', { width: 'auto' }),
        col('Source', 'left', { code: true, width: 'auto' }),
        col('Where in the source', 'left', { width: 2 }),
        col('Range / uncertainty', 'left', { width: 2 }),
      ],
      rows: parameterRows(results.parameters),
      sortable: true,
    }),
  );
  if (results.sources.length > 0) {
    blocks.push(
      subheading('sub-sources', 'Sources'),
      table({
        id: 'tab-sources',
        number: ctx.nextTable(),
        caption: 'Sources cited',
        columns: [
          col('Source', 'left', { code: true, width: 'auto' }),
          col('Title', 'left', { width: 3 }),
          col('Reference', 'left', { width: 2 }),
          col('Note', 'left', { width: 2 }),
          col('Cited by', 'right', { width: 'auto' }),
        ],
        rows: results.sources.map((s) =>
          row([
            s.id,
            // A title that already says it is invented is not told so twice.
            s.invented && !/\binvented\b/i.test(s.title) ? `${s.title} (invented)` : s.title,
            s.reference ?? '—',
            s.note ?? '—',
            s.used_by.length > 0 ? counted(s.used_by.length, 'number') : 'not cited by any number',
          ]),
        ),
      }),
    );
  }
  return { id: 'sec-provenance', number: ctx.number, title: 'Parameter provenance register', blocks };
};

/** Runs of at least this many event-tree or failure-mode numbers with one source are one row. */
const GROUPED = 3;

/**
 * One row per parameter, except that the per-range numbers of an event tree or a failure-mode set
 * (one owner, one source, one note, one file) share a row: their values are tabulated range by
 * range in their own section, and forty near-identical rows would bury the register.
 */
function parameterRows(parameters: ParameterResult[]): TableRow[] {
  const rows: TableRow[] = [];
  for (let i = 0; i < parameters.length; ) {
    const p = parameters[i]!;
    let j = i + 1;
    const alike = (q: ParameterResult) =>
      (p.owner_kind === 'tree' || p.owner_kind === 'modes') && q.owner === p.owner && q.owner_kind === p.owner_kind && q.source === p.source && q.note === p.note && q.at.file === p.at.file && !q.range && !q.uncertainty && !p.range && !p.uncertainty;
    while (j < parameters.length && alike(parameters[j]!)) j++;
    if (j - i >= GROUPED) {
      const run = parameters.slice(i, j);
      const first = run[0]!.at.line;
      const last = run[run.length - 1]!.at.line;
      const fields = run.map((q) => q.key.slice(p.owner.length + 1));
      rows.push(
        row(
          [
            `${p.owner}: ${fields[0]} … ${fields[fields.length - 1]} (${run.length})`,
            run.map((q) => q.written).join(', '),
            p.source ?? 'UNSOURCED',
            [p.note, `${p.at.file}:${first === last ? first : `${first}–${last}`}`].filter(Boolean).join('; '),
            run.every((q) => q.used_by.length > 0) ? '—' : 'not all used by the model',
          ],
          p.source ? {} : { flag: true },
        ),
      );
    } else {
      for (const q of parameters.slice(i, j)) rows.push(parameterRow(q));
    }
    i = j;
  }
  return rows;
}

function parameterRow(p: ParameterResult): TableRow {
  return row(
    [
      p.key,
      p.written,
      p.source ?? 'UNSOURCED',
      // The reader's note already says "fitted from <data>"; name the fit only where it does not.
      [p.note, p.fit && !/\bfitted from\b/.test(p.note ?? '') ? `fitted (${p.fit})` : undefined, `${p.at.file}:${p.at.line}`].filter(Boolean).join('; '),
      p.used_by.length > 0 ? spreadText(p) : [spreadText(p), 'not used by any event'].filter((x) => x !== '—').join('; '),
    ],
    p.source ? {} : { flag: true },
  );
}

const IN_UNIT = ['median', 'mean', 'sd', 'min', 'max', 'mode', 'scale'];

/** Range for sensitivity and the uncertainty distribution, as the analysis recorded them. */
function spreadText(p: ParameterResult): string {
  const parts: string[] = [];
  if (p.range) parts.push(`range ${formatAsWritten(p.quantity, p.range[0], p.written)} – ${formatAsWritten(p.quantity, p.range[1], p.written)}`);
  if (p.uncertainty?.['kind'] === 'fit') {
    parts.push(`sampled with the other parameters of fit ${String(p.uncertainty['fit'])}`);
  } else if (p.uncertainty) {
    // Keys follow the study's distribution fields (DESIGN.md): location/spread values are in the
    // parameter's own unit, shape-like ones (error factor, a, b, shape) are plain numbers.
    const { kind, ...fields } = p.uncertainty;
    const described = Object.entries(fields).map(
      ([k, v]) => `${k} ${typeof v === 'number' ? (IN_UNIT.includes(k) ? formatAsWritten(p.quantity, v, p.written) : formatQuantity('number', v)) : v}`,
    );
    parts.push(`${kind !== undefined ? String(kind) : 'distribution'}: ${described.join(', ')}`);
  }
  return parts.join('; ') || '—';
}
