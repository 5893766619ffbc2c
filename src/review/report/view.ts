/**
 * The comparison report as the appendix's view model (the same block kinds, so the appendix's HTML
 * and PDF renderers draw it with the same look): document control, summary, metadata side by side,
 * logic changes, data changes, result changes, what moved the answer, diagrams of the changed
 * subtrees, and the input files of both revisions.
 *
 * It formats `Comparison` and the two `Results`; it computes nothing.
 */
import type { Results } from '../../analysis/results.js';
import { callout, code, col, keyValues, listWords, para, row, strong, subheading, table, type Part } from '../../report/blocks.js';
import { capitalise, formatCount, formatNumber, formatProbability, formatQuantity, formatRatio, formatShare } from '../../report/format.js';
import type { Appendix, Block, Paper, Section, TableRow } from '../../report/view.js';
import type { Comparison } from '../compare.js';
import { gateChangeText, gateLogic, parameterValue, revisionName, uncertaintyText } from '../describe.js';
import type { ParameterChange, ParameterSide } from '../study-diff.js';
import { changedSubtreeFigures, MARK_MEANING, MAX_COMPARE_PARTS, type Mark } from './diagrams.js';

interface Counter {
  number: string;
  nextTable(): string;
  nextFigure(): string;
}

type Rule = (c: Comparison, ctx: Counter, input: ViewInput) => Section | null;

interface ViewInput {
  oldResults: Results;
  newResults: Results;
  paper: Paper;
}

const RULES: { rule: Rule; numbered: boolean }[] = [
  { rule: titleBlock, numbered: false },
  { rule: summary, numbered: true },
  { rule: metadata, numbered: true },
  { rule: logicChanges, numbered: true },
  { rule: dataChanges, numbered: true },
  { rule: resultChanges, numbered: true },
  { rule: whatMoved, numbered: true },
  { rule: diagrams, numbered: true },
  { rule: files, numbered: true },
];

export function buildComparisonView(c: Comparison, oldResults: Results, newResults: Results, paper: Paper): Appendix {
  const sections: Section[] = [];
  let n = 0;
  for (const { rule, numbered } of RULES) {
    const number = numbered ? String(n + 1) : '';
    let tables = 0;
    let figures = 0;
    const ctx: Counter = { number, nextTable: () => `Table ${number}.${++tables}`, nextFigure: () => `Figure ${number}.${++figures}` };
    const s = rule(c, ctx, { oldResults, newResults, paper });
    if (!s) continue;
    if (numbered) {
      n += 1;
      s.number = number;
    } else delete s.number;
    sections.push(s);
  }
  const o = c.old;
  const w = c.new;
  // Printed after "Rev." in the running header: the names, or old / new for a side without one.
  const revisions = `${o.revision.trim() || 'old'} to ${w.revision.trim() || 'new'}`;
  return {
    format: 'faultbook-appendix/1',
    paper,
    language: 'en',
    cover: {
      facility: w.facility,
      title: w.title,
      kind: `Comparison of ${revisionName(c, 'old')} with ${revisionName(c, 'new')}`,
      revision: revisions,
      status: w.status,
      date: w.issued ?? w.as_of,
      draft: w.status !== 'issued',
    },
    header: { title: `${w.title} — comparison`, revision: revisions, status: w.status },
    meta: {
      title: `${w.title} — comparison of ${revisionName(c, 'old').startsWith('revision ') ? `revisions ${o.revision} and ${w.revision}` : `${revisionName(c, 'old')} and ${revisionName(c, 'new')}`}`,
      author: newResults.study.prepared_by.join('; '),
      subject: `What changed from ${revisionName(c, 'old')} (as of ${o.as_of}) to ${revisionName(c, 'new')} (as of ${w.as_of}), and what moved the answer`,
      keywords: ['fault tree', 'failure probability', 'revision comparison', w.facility].join(', '),
      creator: `${c.tool.name} ${c.tool.version}`,
      date: w.issued ?? w.as_of,
    },
    toc: sections.map((s) => ({ id: s.id, ...(s.number ? { number: s.number } : {}), title: s.title })),
    sections,
  };
}

const rev = (c: Comparison, side: 'old' | 'new') => capitalise(revisionName(c, side));

function titleBlock(c: Comparison): Section {
  return {
    id: 'sec-title-block',
    title: 'Document control',
    blocks: [
      keyValues([
        ['Facility', c.new.facility],
        ['Study', c.new.title],
        ['Old revision', `${c.old.revision} (${c.old.status}${c.old.issued ? `, issued ${c.old.issued}` : ''}), snapshot ${c.old.as_of}`],
        ['New revision', `${c.new.revision} (${c.new.status}${c.new.issued ? `, issued ${c.new.issued}` : ''}), snapshot ${c.new.as_of}`],
        ['Old inputs (SHA-256)', c.old.inputs_sha256],
        ['New inputs (SHA-256)', c.new.inputs_sha256],
        ['Produced with', `${c.tool.name} ${c.tool.version}`],
      ]),
      callout(
        'caution',
        'How to use this comparison',
        [
          'This report lists what differs between the two study folders and recomputes both. It helps a reviewer find what to check; ',
          'it does not judge whether a change is right. Each revision’s own appendix remains the record of that revision, with its cautions.',
        ],
      ),
    ],
  };
}

function summary(c: Comparison, ctx: Counter): Section {
  const blocks: Block[] = [];
  if (c.change_count === 0) {
    blocks.push(para(strong('No changes. '), 'The two revisions have the same logic, data, settings and snapshot date; only their document metadata may differ.'));
  } else {
    const l = c.changes.logic;
    const p = c.changes.data.parameters;
    const logicCount = Object.values(l).reduce((n, x) => n + x.added.length + x.removed.length + x.changed.length, 0);
    const valueChanges = p.changed.filter((x) => x.aspects.includes('value')).length;
    blocks.push(
      para(
        `${formatCount(c.change_count)} change${c.change_count === 1 ? '' : 's'} of inputs: ${formatCount(logicCount)} in the logic (tops, gates, basic events, common-cause groups, counts, event trees, failure modes), `,
        `${formatCount(p.changed.length)} changed parameter${p.changed.length === 1 ? '' : 's'} (${formatCount(valueChanges)} of them in value), `,
        `${formatCount(p.added.length)} added and ${formatCount(p.removed.length)} removed, and the rest in sources, assumptions, settings, scenarios and the snapshot date.`,
      ),
    );
  }
  blocks.push(topsTable(c, ctx, 'tab-cmp-summary', 'Top-event probabilities, old and new'));
  const first = c.attribution.effects.find((e) => !e.error && e.tops.some((t) => t.value !== t.base));
  if (first) {
    blocks.push(
      para(
        strong('The change that moves the answer most on its own: '),
        first.label,
        ` (${first.tops.map((t) => `${t.id} ×${formatRatio(t.ratio)}`).join(', ')}). `,
        'Section “What moved the answer” gives the effect of every change applied alone.',
      ),
    );
  }
  return { id: 'sec-cmp-summary', number: ctx.number, title: 'Summary', blocks };
}

function topsTable(c: Comparison, ctx: Counter, id: string, caption: string): Block {
  return table({
    id,
    number: ctx.nextTable(),
    caption,
    columns: [
      col('Top event', 'left', { code: true, width: 'auto' }),
      col('What it means', 'left', { width: 3 }),
      col(rev(c, 'old'), 'right', { width: 'auto' }),
      col(rev(c, 'new'), 'right', { width: 'auto' }),
      col('New ÷ old', 'right', { width: 'auto' }),
    ],
    rows: c.results.tops.map((t) =>
      row([
        t.id,
        t.title + (t.old === undefined ? ' [NEW top event]' : t.new === undefined ? ' [REMOVED top event]' : ''),
        formatProbability(t.old) + (t.old_basis === 'bound' ? ' (bound)' : ''),
        formatProbability(t.new) + (t.new_basis === 'bound' ? ' (bound)' : ''),
        t.ratio === undefined ? '—' : `×${formatRatio(t.ratio)}`,
      ]),
    ),
  });
}

function metadata(c: Comparison, ctx: Counter): Section {
  const rows = c.changes.meta
    .filter((m) => m.field !== 'scope' && m.field !== 'description')
    .map((m) => row([m.field, m.old || '—', m.new || '—', m.changed ? 'CHANGED' : 'same'], m.changed ? { flag: true } : {}));
  const text = c.changes.meta.filter((m) => (m.field === 'scope' || m.field === 'description') && m.changed).map((m) => m.field);
  const blocks: Block[] = [
    table({
      id: 'tab-cmp-meta',
      number: ctx.nextTable(),
      caption: 'Study metadata side by side',
      columns: [col('Field', 'left', { code: true, width: 'auto' }), col(rev(c, 'old'), 'left', { width: 3 }), col(rev(c, 'new'), 'left', { width: 3 }), col('', 'left', { width: 'auto' })],
      rows,
    }),
  ];
  if (text.length) {
    blocks.push(para('The study’s ', ...joinCode(text), ` text changed; the two versions follow.`));
    for (const field of text) {
      const m = c.changes.meta.find((x) => x.field === field)!;
      blocks.push(
        { kind: 'pre', label: `${field} — ${rev(c, 'old').toLowerCase()}`, lines: m.old.split('\n') },
        { kind: 'pre', label: `${field} — ${rev(c, 'new').toLowerCase()}`, lines: m.new.split('\n') },
      );
    }
  }
  return { id: 'sec-cmp-meta', number: ctx.number, title: 'Study metadata', blocks };
}

function logicChanges(c: Comparison, ctx: Counter): Section {
  const l = c.changes.logic;
  const rows: TableRow[] = [];
  const add = (id: string, kind: string, change: string, o: string, n: string) => rows.push(row([id, kind, change, o, n]));
  for (const t of l.tops.added) add(t.id, 'top event', 'ADDED', '—', `gate ${t.side.gate}`);
  for (const t of l.tops.removed) add(t.id, 'top event', 'REMOVED', `gate ${t.side.gate}`, '—');
  for (const t of l.tops.changed) add(t.id, 'top event', t.aspects.includes('gate') ? 'MOVED to another gate' : 'title', t.aspects.includes('gate') ? t.old.gate : t.old.title, t.aspects.includes('gate') ? t.new.gate : t.new.title);
  for (const g of l.gates.added) add(g.id, 'gate', 'ADDED', '—', `${gateLogic(g.side)} of ${g.side.inputs.join(', ')}`);
  for (const g of l.gates.removed) add(g.id, 'gate', 'REMOVED', `${gateLogic(g.side)} of ${g.side.inputs.join(', ')}`, '—');
  for (const g of l.gates.changed) {
    const what = g.reordered_only ? 'inputs reordered (no effect)' : g.aspects.includes('inputs') ? 'RE-WIRED' : g.aspects.includes('k') ? 'k CHANGED' : g.aspects.includes('op') ? 'logic CHANGED' : 'title';
    add(g.id, 'gate', `${what}: ${gateChangeText(g)}`, `${gateLogic(g.old)} of ${g.old.inputs.join(', ')}`, `${gateLogic(g.new)} of ${g.new.inputs.join(', ')}`);
  }
  for (const e of l.events.added) add(e.id, 'basic event', 'ADDED', '—', `${e.side.model}${e.side.class ? ` (class ${e.side.class})` : ''}: ${e.side.title}`);
  for (const e of l.events.removed) add(e.id, 'basic event', 'REMOVED', `${e.side.model}${e.side.class ? ` (class ${e.side.class})` : ''}: ${e.side.title}`, '—');
  for (const e of l.events.changed) {
    const side = (s: typeof e.old) =>
      [
        `${s.model}${s.class ? `, class ${s.class}` : ''}`,
        s.installed ? `installed ${s.installed}` : '',
        s.renewed ? `renewed ${s.renewed}` : '',
        s.on !== undefined ? `switch ${s.on ? 'on' : 'off'}` : '',
        e.aspects.includes('fields') ? `uses ${Object.values(s.fields).join(', ')}` : '',
        e.aspects.includes('title') ? `“${s.title}”` : '',
        e.aspects.includes('assumptions') ? `assumptions ${s.assumptions.join(', ') || 'none'}` : '',
      ]
        .filter(Boolean)
        .join('; ');
    add(e.id, 'basic event', `CHANGED: ${e.aspects.join(', ')}`, side(e.old), side(e.new));
  }
  for (const g of l.common_cause.added) add(g.id, 'common-cause group', 'ADDED', '—', `${g.side.method}: ${g.side.members.join(', ')}`);
  for (const g of l.common_cause.removed) add(g.id, 'common-cause group', 'REMOVED', `${g.side.method}: ${g.side.members.join(', ')}`, '—');
  for (const g of l.common_cause.changed) add(g.id, 'common-cause group', `CHANGED: ${g.aspects.join(', ')}`, `${g.old.method}: ${g.old.members.join(', ')}`, `${g.new.method}: ${g.new.members.join(', ')}`);
  const structures: [string, typeof l.counts][] = [
    ['count set', l.counts],
    ['event tree', l.event_trees],
    ['failure-mode set', l.failure_modes],
  ];
  const titled = (x: Record<string, unknown>) => (typeof x.title === 'string' ? x.title : '');
  for (const [kind, d] of structures) {
    for (const x of d.added) add(x.id, kind, 'ADDED', '—', titled(x.side));
    for (const x of d.removed) add(x.id, kind, 'REMOVED', titled(x.side), '—');
    for (const x of d.changed) add(x.id, kind, `CHANGED: ${x.aspects.join(', ')}`, titled(x.old), titled(x.new));
  }
  return {
    id: 'sec-cmp-logic',
    number: ctx.number,
    title: 'Logic changes',
    blocks: [
      para('Tops, gates, basic events and common-cause groups that were added, removed, re-wired (inputs changed) or redefined. A removed node drops out through the re-wiring of the gates that used it.'),
      table({
        id: 'tab-cmp-logic',
        number: ctx.nextTable(),
        caption: 'Changes of the logic model',
        columns: [col('Node', 'left', { code: true, width: 'auto' }), col('Kind', 'left', { width: 'auto' }), col('Change', 'left', { width: 2 }), col(rev(c, 'old'), 'left', { width: 3 }), col(rev(c, 'new'), 'left', { width: 3 })],
        rows,
        empty: 'No changes of the logic.',
      }),
    ],
  };
}

function sourceText(s: ParameterSide): string {
  if (!s.source) return 'UNSOURCED';
  return s.source_title ? `${s.source} — ${s.source_title}` : s.source;
}

function parameterCell(s: ParameterSide, other: ParameterSide, aspects: ParameterChange['aspects']): string {
  const parts = [parameterValue(s, other), `source: ${sourceText(s)}`];
  if (s.note !== undefined || aspects.includes('note')) parts.push(`note: ${s.note ?? 'none'}`);
  if (aspects.includes('range')) parts.push(`range: ${s.range ? s.range.map((v) => formatQuantity(s.quantity, v)).join(' to ') : 'none'}`);
  if (aspects.includes('uncertainty') || s.uncertainty) parts.push(`uncertainty: ${uncertaintyText(s.uncertainty, s.quantity)}`);
  return parts.join('; ');
}

function usedBy(ids: string[]): string {
  if (ids.length === 0) return 'no event';
  if (ids.length <= 3) return ids.join(', ');
  return `${ids.slice(0, 2).join(', ')} and ${ids.length - 2} more`;
}

function dataChanges(c: Comparison, ctx: Counter): Section {
  const d = c.changes.data;
  const p = d.parameters;
  const blocks: Block[] = [
    para(
      'Every parameter whose value, unit, source, note, range or uncertainty changed, old and new side by side with their sources. ',
      'Values are shown as each revision wrote them (with the value in canonical units where the text alone would hide the change).',
    ),
    table({
      id: 'tab-cmp-parameters',
      number: ctx.nextTable(),
      caption: 'Changed parameters',
      columns: [
        col('Parameter', 'left', { code: true, width: 'auto' }),
        col('What changed', 'left', { width: 'auto' }),
        col(rev(c, 'old'), 'left', { width: 3 }),
        col(rev(c, 'new'), 'left', { width: 3 }),
        col('Used by', 'left', { width: 2 }),
      ],
      rows: p.changed.map((x) =>
        row([x.key, x.aspects.join(', '), parameterCell(x.old, x.new, x.aspects), parameterCell(x.new, x.old, x.aspects), usedBy(x.used_by)], x.aspects.includes('value') ? { flag: true } : {}),
      ),
      note: 'Only a change of value can move a probability; the other changes matter to the provenance and the uncertainty analysis.',
      empty: 'No parameter changed.',
    }),
  ];
  if (p.added.length || p.removed.length) {
    blocks.push(
      table({
        id: 'tab-cmp-parameters-added',
        number: ctx.nextTable(),
        caption: 'Parameters in one revision only',
        columns: [col('Parameter', 'left', { code: true, width: 'auto' }), col('', 'left', { width: 'auto' }), col('Value and source', 'left', { width: 4 }), col('Used by', 'left', { width: 2 })],
        rows: [
          ...p.added.map((x) => row([x.key, `NEW in ${c.new.revision}`, parameterCell(x.side, x.side, []), usedBy(x.used_by)])),
          ...p.removed.map((x) => row([x.key, `REMOVED (only in ${c.old.revision})`, parameterCell(x.side, x.side, []), usedBy(x.used_by)])),
        ],
      }),
    );
  }
  const s = d.sources;
  if (s.added.length + s.removed.length + s.changed.length > 0) {
    const text = (x: { title: string; reference?: string }) => `${x.title}${x.reference ? `; ${x.reference}` : ''}`;
    blocks.push(
      table({
        id: 'tab-cmp-sources',
        number: ctx.nextTable(),
        caption: 'Changed sources',
        columns: [col('Source', 'left', { code: true, width: 'auto' }), col('Change', 'left', { width: 'auto' }), col(rev(c, 'old'), 'left', { width: 3 }), col(rev(c, 'new'), 'left', { width: 3 })],
        rows: [
          ...s.added.map((x) => row([x.id, 'ADDED', '—', text(x.side)])),
          ...s.removed.map((x) => row([x.id, 'REMOVED', text(x.side), '—'])),
          ...s.changed.map((x) => row([x.id, 'CHANGED', text(x.old), text(x.new)])),
        ],
      }),
    );
  }
  const a = d.assumptions;
  if (a.added.length + a.removed.length + a.changed.length > 0) {
    blocks.push(
      table({
        id: 'tab-cmp-assumptions',
        number: ctx.nextTable(),
        caption: 'Changed assumptions',
        columns: [col('Assumption', 'left', { code: true, width: 'auto' }), col('Change', 'left', { width: 'auto' }), col(rev(c, 'old'), 'left', { width: 3 }), col(rev(c, 'new'), 'left', { width: 3 })],
        rows: [
          ...a.added.map((x) => row([x.id, 'ADDED', '—', assumptionText(x.side)])),
          ...a.removed.map((x) => row([x.id, 'REMOVED', assumptionText(x.side), '—'])),
          ...a.changed.map((x) => row([x.id, 'CHANGED', assumptionText(x.old), assumptionText(x.new)])),
        ],
      }),
    );
  }
  const other: TableRow[] = [
    ...d.settings.map((x) => row([`settings.${x.name}`, String(x.old), String(x.new)])),
    ...d.scenarios.added.map((id) => row([`scenario ${id}`, '—', 'ADDED'])),
    ...d.scenarios.removed.map((id) => row([`scenario ${id}`, 'REMOVED', '—'])),
    ...d.scenarios.changed.map((id) => row([`scenario ${id}`, 'as before', 'CHANGED'])),
  ];
  if (other.length) {
    blocks.push(
      table({
        id: 'tab-cmp-settings',
        number: ctx.nextTable(),
        caption: 'Changed settings and scenarios',
        columns: [col('What', 'left', { code: true, width: 'auto' }), col(rev(c, 'old'), 'left', { width: 2 }), col(rev(c, 'new'), 'left', { width: 2 })],
        rows: other,
      }),
    );
  }
  return { id: 'sec-cmp-data', number: ctx.number, title: 'Data changes', newPage: true, blocks };
}

/** An assumption as one paragraph: its title, then its Markdown body with the line breaks of the file removed. */
function assumptionText(a: { title: string; body: string }): string {
  return `${a.title}: ${a.body.trim().replace(/\s*\n\s*/g, ' ')}`;
}

function resultChanges(c: Comparison, ctx: Counter): Section {
  const blocks: Block[] = [topsTable(c, ctx, 'tab-cmp-tops', 'Exact top-event probabilities')];
  const depth = c.results.depth;
  for (const cs of c.results.cut_sets) {
    blocks.push(subheading(`sub-cmp-cutsets-${cs.top}`, `Cut sets of ${cs.top}`));
    blocks.push(
      para(
        `Listed: ${formatCount(cs.old_listed)} in ${c.old.revision}, ${formatCount(cs.new_listed)} in ${c.new.revision}; `,
        `${formatCount(cs.appeared_total)} appeared and ${formatCount(cs.vanished_total)} vanished in all. `,
        `The table shows those among the leading ${depth} of either revision.`,
      ),
    );
    const rows: TableRow[] = [
      ...cs.appeared.map((x) => row([x.events.join(' & '), 'APPEARED', '—', String(x.new_rank), '—', formatProbability(x.new_probability)])),
      ...cs.vanished.map((x) => row([x.events.join(' & '), 'VANISHED', String(x.old_rank), '—', formatProbability(x.old_probability), '—'])),
      ...cs.moved.map((x) => row([x.events.join(' & '), x.new_rank! < x.old_rank! ? 'moved UP' : 'moved down', String(x.old_rank), String(x.new_rank), formatProbability(x.old_probability), formatProbability(x.new_probability)])),
    ];
    blocks.push(
      table({
        id: `tab-cmp-cutsets-${cs.top}`,
        number: ctx.nextTable(),
        caption: `Cut sets of ${cs.top} that appeared, vanished or moved rank`,
        columns: [
          col('Cut set', 'left', { code: true, width: 4 }),
          col('Change', 'left', { width: 'auto' }),
          col(`Rank ${c.old.revision}`, 'right', { width: 'auto' }),
          col(`Rank ${c.new.revision}`, 'right', { width: 'auto' }),
          col(`P ${c.old.revision}`, 'right', { width: 'auto' }),
          col(`P ${c.new.revision}`, 'right', { width: 'auto' }),
        ],
        rows,
        empty: 'The leading cut sets are the same, in the same order.',
      }),
    );
  }
  for (const imp of c.results.importance) {
    blocks.push(
      table({
        id: `tab-cmp-importance-${imp.top}`,
        number: ctx.nextTable(),
        caption: `Basic events of ${imp.top} whose Fussell–Vesely rank changed (leading ${depth} of either revision)`,
        columns: [
          col('Basic event', 'left', { code: true, width: 3 }),
          col(`Rank ${c.old.revision}`, 'right', { width: 'auto' }),
          col(`Rank ${c.new.revision}`, 'right', { width: 'auto' }),
          col(`FV ${c.old.revision}`, 'right', { width: 'auto' }),
          col(`FV ${c.new.revision}`, 'right', { width: 'auto' }),
        ],
        rows: imp.changes.map((x) =>
          row([x.event, x.old_rank === undefined ? '—' : String(x.old_rank), x.new_rank === undefined ? '—' : String(x.new_rank), formatProbability(x.old_fussell_vesely), formatProbability(x.new_fussell_vesely)]),
        ),
        empty: 'No change of rank among the leading events.',
      }),
    );
  }
  return { id: 'sec-cmp-results', number: ctx.number, title: 'Result changes', newPage: true, blocks };
}

function whatMoved(c: Comparison, ctx: Counter): Section {
  const a = c.attribution;
  const blocks: Block[] = [
    para(
      `Each change was applied alone to revision ${c.old.revision}, and every top event recomputed exactly; then all changes together, which is revision ${c.new.revision}. `,
      'Changes that move no number (titles, sources, notes, uncertainty alone) are not listed here. The largest single effect comes first.',
    ),
    callout(
      'caution',
      'The parts need not add up',
      [
        'Changes interact: a change to one component matters more or less depending on what else changed in the same cut sets. ',
        'The ratios of the single changes therefore need not multiply, nor their differences add, to the change of all of them together.',
      ],
    ),
  ];
  const topCols = a.tops.flatMap((t) => [col(t, 'right', { width: 'auto' }), col('change', 'right', { width: 'auto' })]);
  const rows: TableRow[] = [
    row([`${rev(c, 'old')} as it was`, ...a.together.flatMap((t) => [formatProbability(t.old), '—'])]),
    ...a.effects.map((e) =>
      e.error ? row([e.label, ...a.tops.flatMap(() => ['cannot be applied alone', '—'])]) : row([e.label, ...e.tops.flatMap((t) => [formatProbability(t.value), relativeChange(t.base, t.value)])]),
    ),
    row([`All changes together (revision ${c.new.revision})`, ...a.together.flatMap((t) => [formatProbability(t.new), relativeChange(t.old, t.new)])], { flag: true }),
  ];
  blocks.push(
    table({
      id: 'tab-cmp-effects',
      number: ctx.nextTable(),
      caption: 'Effect of each change alone on each top event (probability with the change, and its change from the old revision)',
      columns: [col('Change', 'left', { width: 4 }), ...topCols],
      rows,
    }),
  );
  const errors = a.effects.filter((e) => e.error);
  if (errors.length) blocks.push(para(strong('Not applicable alone: '), errors.map((e) => `${e.label} (${e.error})`).join('; '), '.'));
  if (!a.reproduces_new) {
    blocks.push(
      callout('warning', 'The listed changes do not account for the whole difference', [
        `Applying all the listed changes to revision ${c.old.revision} at once does not reproduce revision ${c.new.revision} (largest relative gap ${formatProbability(a.reproduction_gap)}). `,
        'Some difference between the two studies is not among the changes this comparison can apply one at a time (for example data files of a life-data fit).',
      ]),
    );
  }
  if (!a.consistent) {
    blocks.push(
      callout('warning', 'Recomputation differs from the analysis', [
        'The point estimate recomputed for this section does not equal the analysis’s own numbers for one of the revisions. The effects above may be off; report this to the maintainers of the tool.',
      ]),
    );
  }
  return { id: 'sec-cmp-effects', number: ctx.number, title: 'What moved the answer', newPage: true, blocks };
}

function diagrams(c: Comparison, ctx: Counter, input: ViewInput): Section | null {
  const { figures, listed, drawnRoots } = changedSubtreeFigures(c, input.oldResults, input.newResults, input.paper, ctx.nextFigure);
  if (figures.length === 0 && listed.length === 0) return null;
  const marks = Object.entries(MARK_MEANING) as [Mark, string][];
  const notDrawn: Block[] = [];
  if (listed.length > 0) {
    notDrawn.push(
      table({
        id: 'tab-cmp-not-drawn',
        number: ctx.nextTable(),
        caption: 'Changed subtrees listed instead of drawn',
        columns: [col('Subtree (gate)', 'left', { code: true }), col('Title', 'left', { width: 2 }), col('Marked nodes in it', 'left', { width: 5 })],
        rows: listed.map((l) => row([l.root, l.title, l.marked.map(([id, m]) => `[${m}] ${id}`).join(', ')])),
        note:
          `The rule: the changed subtrees are drawn until they fill ${MAX_COMPARE_PARTS} figure parts (about a page each), those with an added, ` +
          're-wired or removed node first, then those whose only change is in basic-event data, each group in study order; the first subtree ' +
          'that does not fit and every one after it are listed here. The tables of logic and data changes above are complete.',
      }),
    );
  }
  return {
    id: 'sec-cmp-diagrams',
    number: ctx.number,
    title: 'Diagrams of the changed subtrees',
    newPage: true,
    blocks: [
      para(
        'Each gate that was re-wired, or that has a changed basic event among its inputs, is drawn with its subtree, with the appendix’s symbols (first figure) and the probabilities of the revision drawn. ',
        'Changed nodes carry a mark in front of their title: ',
        ...marks.flatMap(([m, meaning], i) => [code(`[${m}]`), ` ${meaning}${i < marks.length - 1 ? '; ' : '.'}`] as Part[]),
        ' A subtree that lost nodes is also drawn as it was in the old revision.',
        c.changes.meta.some((m) => m.field === 'as_of' && m.changed) ? ' The snapshot date changed too, so every age-dependent probability differs; those nodes are not marked.' : '',
        listed.length > 0 ? ` ${formatCount(listed.length)} of the ${formatCount(listed.length + drawnRoots.length)} changed subtrees are past the drawing budget and listed in a table after the figures.` : '',
      ),
      ...figures,
      ...notDrawn,
    ],
  };
}

function files(c: Comparison, ctx: Counter, input: ViewInput): Section {
  const oldFiles = new Map(input.oldResults.inputs.files.map((f) => [f.path, f.sha256]));
  const newFiles = new Map(input.newResults.inputs.files.map((f) => [f.path, f.sha256]));
  const paths = [...new Set([...newFiles.keys(), ...oldFiles.keys()])].sort();
  return {
    id: 'sec-cmp-files',
    number: ctx.number,
    title: 'Input files of both revisions',
    blocks: [
      table({
        id: 'tab-cmp-files',
        number: ctx.nextTable(),
        caption: 'Input files and their SHA-256 digests',
        columns: [col('File', 'left', { code: true, width: 'auto' }), col('', 'left', { width: 'auto' }), col(rev(c, 'old'), 'left', { code: true, width: 2 }), col(rev(c, 'new'), 'left', { code: true, width: 2 })],
        rows: paths.map((p) => {
          const o = oldFiles.get(p);
          const n = newFiles.get(p);
          const status = o === undefined ? 'ADDED' : n === undefined ? 'REMOVED' : o === n ? 'same' : 'CHANGED';
          return row([p, status, o ? groupedHash(o) : '—', n ? groupedHash(n) : '—']);
        }),
      }),
    ],
  };
}

/** The change from `base` to `value` in percent, signed: `−24.3%`, `+0.00262%`, `none`. */
function relativeChange(base: number, value: number): string {
  if (value === base) return 'none';
  if (base === 0) return 'from 0';
  const r = Math.abs((value - base) / base);
  // Below 0.001 % the share format would say "<0.001%"; a small effect still deserves its size.
  return `${value < base ? '−' : '+'}${r < 1e-5 ? `${formatNumber(r * 100)}%` : formatShare(r)}`;
}

/** A SHA-256 in groups of 16 hex digits, so a table cell can wrap it. */
function groupedHash(h: string): string {
  return h.replace(/(.{16})(?=.)/g, '$1 ');
}

function joinCode(items: string[]): Part[] {
  const words = listWords(items.map((_, i) => `\u0000${i}`));
  return words.split(/(\u0000\d+)/).filter(Boolean).map((w) => (w.startsWith('\u0000') ? code(items[Number(w.slice(1))]!) : w));
}
