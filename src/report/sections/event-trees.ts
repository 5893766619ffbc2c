import type { EventTreeResult, FailureModeResult, Results } from '../../analysis/results.js';
import { eventTreeDiagram } from '../charts/event-tree.js';
import { anchor, type BuildContext, type SectionRule } from '../context.js';
import { callout, code, col, para, row, strong, subheading, table, xref, type Part } from '../blocks.js';
import { formatProbability, formatRatio } from '../format.js';
import { contentBox } from '../paper.js';
import type { Block } from '../view.js';
import { quantityUncertaintyTable, uncertaintiesOf } from './quantity-uncertainty.js';

/**
 * The load-range event trees: the load, the headings, the diagram, every sequence and outcome per
 * year (and by load range), set against the product of branch numbers; then the dam's failure
 * modes combined under the shared load.
 */
export const eventTrees: SectionRule = (results, ctx) => {
  const trees = results.event_trees ?? [];
  if (trees.length === 0) return null;
  const blocks: Block[] = [
    para(
      'Each sequence, range by range, is quantified exactly on the fault trees’ decision diagram and set beside the product ',
      'of branch numbers a spreadsheet would use; outcomes are annual probabilities. Loads outside the ranges are not counted. ',
      xref('methods', 'Method: {}.', 'method-event-trees'),
    ),
  ];
  for (const t of trees) blocks.push(...treeBlocks(t, results, ctx));
  return { id: 'sec-event-trees', number: ctx.number, title: 'Event trees', blocks };
};

function aepText(r: EventTreeResult['load']['ranges'][number]): string {
  if (r.aep) return `${formatProbability(r.aep[0])} to ${formatProbability(r.aep[1])}`;
  return `frequency ${formatProbability(r.frequency)} per year`;
}

function pathText(t: EventTreeResult, path: ('works' | 'fails' | null)[]): string {
  return path.map((s, h) => (s ? `${t.headings[h]!.id} ${s}` : null)).filter(Boolean).join(' · ');
}

function treeBlocks(t: EventTreeResult, results: Results, ctx: BuildContext): Block[] {
  const modes = results.failure_modes ?? [];
  const ranges = t.load.ranges;
  const perYear = t.load.basis === 'aep' ? 'annual probability' : 'per year';
  const blocks: Block[] = [subheading(anchor('tree', t.id), `${t.id} — ${t.title}`)];
  blocks.push(
    table({
      id: anchor('tab-tree-load', t.id),
      number: ctx.nextTable(),
      caption: `${t.load.title}: load ranges of ${t.id}`,
      columns: [col('Range', 'left', { code: true, width: 'auto' }), col('Description', 'left', { width: 3 }), col('AEP from – to', 'right', { width: 'auto' }), col(perYear, 'right', { width: 'auto' })],
      rows: ranges.map((r) => row([r.id, r.title, aepText(r), formatProbability(r.probability)])),
      note: [t.load.source ? `Source: ${t.load.source}${t.load.note ? `, ${t.load.note}` : ''}.` : 'The load cites no source.', `Total over the ranges: ${formatProbability(t.load.total)}.`].join(' '),
    }),
    table({
      id: anchor('tab-tree-headings', t.id),
      number: ctx.nextTable(),
      caption: `Headings of ${t.id}: probability that each fails on its own, by load range`,
      columns: [
        col('Heading', 'left', { code: true, width: 'auto' }),
        col('Question', 'left', { width: 3 }),
        col('Fails when', 'left', { width: 3 }),
        ...ranges.map((r) => col(r.id, 'right', { width: 'auto' })),
      ],
      rows: t.headings.map((h) => row([h.id, h.title, h.condition, ...h.fails.map((f) => formatProbability(f))])),
    }),
  );
  const figure = ctx.nextFigure();
  const caption = `Event tree ${t.id}: sequences and their ${perYear}`;
  const width = contentBox(ctx.paper).width;
  blocks.push({
    kind: 'figure',
    id: anchor('fig-tree', t.id),
    number: figure,
    caption,
    parts: [
      eventTreeDiagram(
        {
          label: `${figure}. ${caption}`,
          load: { title: t.load.title, detail: `${formatProbability(t.load.total)} per year` },
          headings: t.headings.map((h) => ({ id: h.id, title: h.title })),
          sequences: t.sequences.map((s) => ({ id: s.id, path: s.path, outcome: s.outcome, probability: formatProbability(s.probability) })),
        },
        width,
      ),
    ],
  });
  blocks.push(
    table({
      id: anchor('tab-tree-sequences', t.id),
      number: ctx.nextTable(),
      caption: `Sequences of ${t.id}: exact against a product of branch numbers (${perYear})`,
      columns: [
        col('Sequence', 'left', { width: 'auto' }),
        col('Path', 'left', { code: true, width: 4 }),
        col('Outcome', 'left', { code: true, width: 'auto' }),
        col('Exact', 'right', { width: 'auto' }),
        col('Product of branches', 'right', { width: 'auto' }),
        col('Exact ÷ product', 'right', { width: 'auto' }),
      ],
      rows: t.sequences.map((s) => row([s.id, pathText(t, s.path), s.outcome, formatProbability(s.probability), formatProbability(s.product_of_branches), ratio(s.probability, s.product_of_branches)])),
    }),
    table({
      id: anchor('tab-tree-by-range', t.id),
      number: ctx.nextTable(),
      caption: `Sequences of ${t.id} by load range (${perYear})`,
      columns: [col('Sequence', 'left', { width: 'auto' }), col('Outcome', 'left', { code: true, width: 'auto' }), ...ranges.map((r) => col(r.id, 'right', { width: 'auto' }))],
      rows: t.sequences.map((s) => row([s.id, s.outcome, ...s.by_range.map((x) => formatProbability(x))])),
    }),
    table({
      id: anchor('tab-tree-outcomes', t.id),
      number: ctx.nextTable(),
      caption: `Outcomes of ${t.id} (${perYear})`,
      columns: [
        col('Outcome', 'left', { code: true, width: 'auto' }),
        col('Description', 'left', { width: 3 }),
        col('Exact', 'right', { width: 'auto' }),
        ...ranges.map((r) => col(r.id, 'right', { width: 'auto' })),
        col('Product of branches', 'right', { width: 'auto' }),
      ],
      rows: t.outcomes.map((o) => row([o.id, o.title, formatProbability(o.probability), ...o.by_range.map((x) => formatProbability(x)), formatProbability(o.product_of_branches)])),
      note: `The outcomes add up to ${formatProbability(t.check.sum_of_outcomes)}, the total of the load ranges ${formatProbability(t.check.initiating)}: the sequences cover every combination of branches once.`,
    }),
  );
  blocks.push(
    ...quantityUncertaintyTable(uncertaintiesOf(results, 'event-tree-outcome', t.id), {
      id: anchor('tab-tree-outcome-uncertainty', t.id),
      number: ctx.nextTable,
      caption: `Uncertainty of the outcomes of ${t.id} (${perYear})`,
      label: 'Outcome',
    }),
    ...quantityUncertaintyTable(uncertaintiesOf(results, 'event-tree-sequence', t.id), {
      id: anchor('tab-tree-sequence-uncertainty', t.id),
      number: ctx.nextTable,
      caption: `Uncertainty of the sequences of ${t.id} (${perYear})`,
      label: 'Sequence',
    }),
  );
  blocks.push(callout('caution', `Exact against a product of branch numbers: ${t.id}`, treeClosing(t)));
  for (const f of modes.filter((x) => x.tree === t.id)) blocks.push(...modeBlocks(f, results, ctx));
  return blocks;
}

function ratio(a: number, b: number): string {
  if (b === 0) return a === 0 ? '—' : '∞';
  return formatRatio(a / b);
}

function treeClosing(t: EventTreeResult): Part[] {
  const parts: Part[] = [];
  for (const o of t.outcomes) {
    parts.push(strong(o.id), `: ${formatProbability(o.probability)} per year exactly, ${formatProbability(o.product_of_branches)} as a product of branch numbers`);
    if (o.product_of_branches > 0 && o.probability > 0) {
      const r = o.probability / o.product_of_branches;
      if (formatRatio(r) === '1.00') parts.push(' (the same to three figures)');
      else parts.push(r > 1 ? ` (the product understates it by a factor of ${formatRatio(r)})` : ` (the product overstates it by a factor of ${formatRatio(1 / r)})`);
    }
    parts.push('. ');
  }
  const far = [...t.sequences].filter((s) => s.probability > 0 && s.product_of_branches > 0).sort((a, b) => Math.abs(Math.log(b.probability / b.product_of_branches)) - Math.abs(Math.log(a.probability / a.product_of_branches)))[0];
  // Name the sequence only when the two figures differ as printed: "X exactly against X" says nothing.
  if (far && formatProbability(far.probability) !== formatProbability(far.product_of_branches)) {
    parts.push(
      'The largest difference is in sequence ',
      strong(far.id),
      ` (${pathText(t, far.path)}): ${formatProbability(far.probability)} exactly against ${formatProbability(far.product_of_branches)}, because its headings depend on the same basic events.`,
    );
  }
  return parts;
}

function modeBlocks(f: FailureModeResult, results: Results, ctx: BuildContext): Block[] {
  const ranges = f.ranges;
  return [
    subheading(anchor('modes', f.id), `${f.id} — ${f.title}`),
    para(
      'These failure modes share the load of ',
      code(f.tree),
      ': they are combined within each load range and then weighted by the ranges’ annual probabilities. ',
      xref('methods', 'Method: {}.', 'method-failure-modes'),
    ),
    table({
      id: anchor('tab-modes', f.id),
      number: ctx.nextTable(),
      caption: `Failure modes of ${f.id}: probability given each load range, and per year`,
      columns: [
        col('Mode', 'left', { code: true, width: 'auto' }),
        col('Description', 'left', { width: 3 }),
        ...ranges.map((r) => col(r.id, 'right', { width: 'auto' })),
        col('Per year', 'right', { width: 'auto' }),
        col('Adjusted, per year', 'right', { width: 'auto' }),
      ],
      rows: [
        ...f.modes.map((m) => row([m.id, m.title + (m.outcome ? ` (outcome ${m.outcome})` : ''), ...m.conditional.map((x) => formatProbability(x)), formatProbability(m.annual), formatProbability(m.adjusted_annual)])),
        row(['sum', 'Plain sum of the modes', ...f.by_range.map((b) => formatProbability(b.sum)), formatProbability(f.annual.sum), '—']),
        row(['lower', 'Uni-modal lower bound, max P_i', ...f.by_range.map((b) => formatProbability(b.lower)), formatProbability(f.annual.lower), '—']),
        row(['upper', 'Uni-modal upper bound, 1 − Π(1 − P_i)', ...f.by_range.map((b) => formatProbability(b.upper)), formatProbability(f.annual.upper), formatProbability(f.modes.reduce((s, m) => s + m.adjusted_annual, 0))]),
      ],
      note: 'Range columns are conditional on the flood being in that range; per-year figures weight them by the ranges’ annual probabilities.',
    }),
    para(
      strong('Overall annual probability of failure: '),
      `between ${formatProbability(f.annual.lower)} and ${formatProbability(f.annual.upper)} (uni-modal bounds), `,
      `against ${formatProbability(f.annual.sum)} for the plain sum.`,
    ),
    ...quantityUncertaintyTable(
      [...uncertaintiesOf(results, 'failure-mode', f.id), ...uncertaintiesOf(results, 'failure-modes-combined', f.id)],
      {
        id: anchor('tab-modes-uncertainty', f.id),
        number: ctx.nextTable,
        caption: `Uncertainty of the failure modes of ${f.id}, per year (modes adjusted; combined: sum and uni-modal bounds)`,
        label: 'Mode',
      },
    ),
  ];
}
