import type { QuantityUncertainty, Results } from '../../analysis/results.js';
import { code, col, para, row, strong, subheading, table, xref, type Part } from '../blocks.js';
import type { SectionRule } from '../context.js';
import { formatAsWritten, formatCount, formatProbability, formatRatio } from '../format.js';
import type { Block, TableRow } from '../view.js';

/**
 * The warning codes a reviewer must see on the first page, and the section that discusses each
 * (by slot name). Other warnings stay in the results section's table.
 */
export const REVIEWER_WARNINGS: Record<string, string> = {
  unsourced: 'provenance',
  'age-beyond-fit-data': 'fits',
  'ccf-unequal-totals': 'common-cause',
  'uncertainty-not-sampled': 'uncertainty',
  'probability-capped': 'events',
  'sampled-probability-clipped': 'uncertainty',
  'cut-sets-capped': 'cut-sets',
};

/**
 * Words that mark a sentence of the scope as an exclusion, or a sentence of an assumption as a
 * common cause left out of the model. The key findings quote such sentences as written: the author
 * controls what appears by how the scope and assumptions are worded (README: "Key findings").
 */
const SCOPE_EXCLUSION = /\b(outside (its|the|this) scope|out of scope|not (covered|included|considered|studied|addressed)|excluded|excludes?)\b|\bare outside\b|\bis outside\b/i;
const UNMODELLED_CAUSE = /\b(not modell?ed|unmodell?ed|not included in the model|not in the model)\b/i;

/**
 * Key findings: one page a manager can read alone, placed after document control and before the
 * contents. Every number here is printed by the same formatter as in its own section, and each
 * line says where it is discussed.
 */
export const keyFindings: SectionRule = (results, ctx) => {
  if (results.tops.length === 0) return null;
  const blocks: Block[] = [];
  const see = (name: string) => ctx.sections.get(name)?.number ?? '';

  blocks.push(
    table({
      id: 'tab-key-tops',
      number: '',
      caption: `Top events at the snapshot date ${results.study.as_of}: point value and Monte Carlo spread`,
      columns: quantityColumns('Top event'),
      rows: results.tops.map((t) => {
        const u = results.uncertainty?.find((x) => x.top === t.id);
        return row([t.id, t.title, formatProbability(t.probability.exact), ...spread(u), see('results')]);
      }),
      ...(results.uncertainty?.length ? {} : { note: 'No Monte Carlo run: mean and percentiles are not available.' }),
    }),
  );

  const outcomes = outcomeRows(results, see);
  if (outcomes.length > 0) {
    blocks.push(
      table({
        id: 'tab-key-outcomes',
        number: '',
        caption: 'Event-tree outcomes, annual probability: point value and Monte Carlo spread',
        columns: quantityColumns('Outcome'),
        rows: outcomes,
        ...(results.outcome_uncertainty ? {} : { note: 'This run has no Monte Carlo of the outcomes: mean and percentiles are not available.' }),
      }),
    );
  }

  const drivers = driverParagraphs(results, see);
  if (drivers.length > 0) blocks.push(subheading('key-drivers', 'What drives the result'), ...drivers);

  const gaps = notCovered(results, see);
  if (gaps.length > 0) blocks.push(subheading('key-not-covered', 'What this study does not cover'), ...gaps);

  const warnings = reviewerWarnings(results, see);
  if (warnings.length > 0) {
    blocks.push(
      table({
        id: 'tab-key-warnings',
        number: '',
        caption: 'Warnings a reviewer must see',
        columns: [col('Warning', 'left', { code: true, width: 'auto' }), col('What it says', 'left', { width: 5 }), col('Section', 'left', { width: 'auto' })],
        rows: warnings,
      }),
    );
  }
  blocks.push(
    para(
      strong('Use with the cautions. '),
      'These figures are an aid to engineering judgement, resting on the data, sources and assumptions of this appendix; ',
      'local codes, the owner’s dam-safety guidelines and licensed professional review govern',
      xref('cautions', ' (section {})'),
      '.',
    ),
  );
  return { id: 'sec-key-findings', title: 'Key findings', newPage: true, blocks };
};

function quantityColumns(first: string) {
  return [
    col(first, 'left', { code: true, width: 'auto' }),
    col('What it means', 'left', { width: 3 }),
    col('Point value', 'right', { width: 'auto' }),
    col('Mean', 'right', { width: 'auto' }),
    col('5th pct.', 'right', { width: 'auto' }),
    col('95th pct.', 'right', { width: 'auto' }),
    col('Section', 'left', { width: 'auto' }),
  ];
}

function spread(u: { mean: number; p05: number; p95: number } | undefined): string[] {
  return u ? [formatProbability(u.mean), formatProbability(u.p05), formatProbability(u.p95)] : ['—', '—', '—'];
}

function outcomeRows(results: Results, see: (name: string) => string): TableRow[] {
  const rows: TableRow[] = [];
  for (const t of results.event_trees ?? []) {
    for (const o of t.outcomes) {
      const u = results.outcome_uncertainty?.find((x: QuantityUncertainty) => x.kind === 'event-tree-outcome' && x.owner === t.id && x.id === o.id);
      rows.push(row([o.id, `${o.title} (${t.id})`, formatProbability(o.probability), ...spread(u), see('event-trees')]));
    }
  }
  return rows;
}

/** The three largest contributors to each top (Fussell–Vesely), and the biggest lever the scenarios and sensitivity found. */
function driverParagraphs(results: Results, see: (name: string) => string): Block[] {
  const blocks: Block[] = [];
  for (const t of results.tops) {
    const ranked = [...(t.importance ?? [])].sort((a, b) => b.fussell_vesely - a.fussell_vesely || (a.event < b.event ? -1 : 1)).slice(0, 3);
    if (ranked.length === 0) continue;
    const parts: Part[] = [strong(`Largest contributors to ${t.id}${seeText(see('importance'))}: `)];
    ranked.forEach((i, n) => {
      if (n > 0) parts.push(n === ranked.length - 1 ? ' and ' : ', ');
      parts.push(code(i.event), ` (FV ${formatProbability(i.fussell_vesely)})`);
    });
    parts.push('.');
    blocks.push(para(...parts));
  }
  const lever = scenarioLever(results);
  if (lever) {
    const { s, t, top } = lever;
    blocks.push(
      para(
        strong(`Biggest scenario lever${seeText(see('scenarios'))}: `),
        code(s.id),
        ` (${s.title}) ${t.ratio >= 1 ? 'raises' : 'lowers'} `,
        code(top),
        ` to ${formatProbability(t.probability)}, ${formatRatio(t.ratio)} × the base case.`,
      ),
    );
  }
  const swing = sensitivityLever(results);
  if (swing) {
    const { s, row: r } = swing;
    const p = results.parameters.find((x) => x.key === r.key);
    const lo = Math.min(r.low, r.high);
    const hi = Math.max(r.low, r.high);
    blocks.push(
      para(
        strong(`Most sensitive parameter${seeText(see('sensitivity'))}: `),
        code(r.key),
        ` — between ${formatAsWritten(p?.quantity ?? 'number', r.low_value, p?.written)} and ${formatAsWritten(p?.quantity ?? 'number', r.high_value, p?.written)} it moves `,
        code(s.top),
        ` from ${formatProbability(r.low)} to ${formatProbability(r.high)}`,
        lo > 0 ? `, a factor of ${formatRatio(hi / lo)}` : '',
        '.',
      ),
    );
  }
  return blocks;
}

function seeText(number: string): string {
  return number ? ` (section ${number})` : '';
}

function scenarioLever(results: Results) {
  let best: { s: NonNullable<Results['scenarios']>[number]; t: NonNullable<Results['scenarios']>[number]['tops'][number]; top: string; size: number } | undefined;
  for (const s of results.scenarios ?? []) {
    for (const t of s.tops) {
      if (!(t.ratio > 0) || !Number.isFinite(t.ratio)) continue;
      const size = Math.max(t.ratio, 1 / t.ratio);
      if (!best || size > best.size) best = { s, t, top: t.id, size };
    }
  }
  return best && best.size > 1 ? best : undefined;
}

function sensitivityLever(results: Results) {
  let best: { s: NonNullable<Results['sensitivity']>[number]; row: NonNullable<Results['sensitivity']>[number]['tornado'][number]; size: number } | undefined;
  for (const s of results.sensitivity ?? []) {
    for (const r of s.tornado) {
      const lo = Math.min(r.low, r.high);
      const hi = Math.max(r.low, r.high);
      const size = lo > 0 ? hi / lo : hi > 0 ? Infinity : 1;
      if (size > 1 && (!best || size > best.size)) best = { s, row: r, size };
    }
  }
  return best;
}

/** Load ranges the event trees leave out, scope exclusions and unmodelled common causes, in the author's words. */
function notCovered(results: Results, see: (name: string) => string): Block[] {
  const blocks: Block[] = [];
  for (const t of results.event_trees ?? []) {
    const aeps = t.load.ranges.filter((r) => r.aep).map((r) => r.aep!);
    if (aeps.length === 0) continue;
    const upper = Math.max(...aeps.map((a) => Math.max(a[0], a[1])));
    const lower = Math.min(...aeps.map((a) => Math.min(a[0], a[1])));
    blocks.push(
      para(
        strong(`Loads outside the ranges of ${t.id}${seeText(see('event-trees'))}: `),
        `${t.load.title} with an annual exceedance probability above ${formatProbability(upper)} or below ${formatProbability(lower)} `,
        '(rarer than the last range) is not counted in its outcomes.',
      ),
    );
  }
  const scope = sentences(results.study.scope ?? '').filter((s) => SCOPE_EXCLUSION.test(s));
  if (scope.length > 0) blocks.push(para(strong(`Outside the scope${seeText(see('scope'))}: `), scope.join(' ')));
  for (const a of results.assumptions) {
    const left = sentences(a.body).filter((s) => UNMODELLED_CAUSE.test(s));
    if (left.length > 0) {
      const where = see('assumptions');
      blocks.push(para(strong(`Common causes not modelled (assumption ${a.id}${where ? `, section ${where}` : ''}): `), left.join(' ')));
    }
  }
  return blocks;
}

/** Plain sentences of a Markdown text (emphasis marks and line breaks removed). */
export function sentences(markdown: string): string[] {
  const plain = markdown.replace(/[*_`]/g, '').replace(/\s+/g, ' ').trim();
  if (!plain) return [];
  return plain.split(/(?<=[.!?])\s+(?=[A-Z(])/).map((s) => s.trim()).filter(Boolean);
}

function reviewerWarnings(results: Results, see: (name: string) => string): TableRow[] {
  const byCode = new Map<string, Results['warnings']>();
  for (const w of results.warnings) {
    if (!(w.code in REVIEWER_WARNINGS)) continue;
    byCode.set(w.code, [...(byCode.get(w.code) ?? []), w]);
  }
  const rows: TableRow[] = [];
  for (const [code_, list] of byCode) {
    const first = oneLine(list[0]!.message);
    const more = list.length > 1 ? ` (and ${formatCount(list.length - 1)} more like it)` : '';
    rows.push(row([code_, `${first}${more}`, see(REVIEWER_WARNINGS[code_]!) || see('results')]));
  }
  return rows;
}

/** A warning's first sentence, so each warning takes one line; the results section has the full text. */
function oneLine(message: string): string {
  const first = message.split(/(?<=[.;])\s/)[0] ?? message;
  return first.replace(/[;.]$/, '');
}

