import type { GateCountResult } from '../../analysis/results.js';
import { linearAxis, logAxis, withTicks } from '../charts/axes.js';
import { lineChart } from '../charts/line-chart.js';
import { anchor, type BuildContext, type SectionRule } from '../context.js';
import { callout, col, para, row, strong, subheading, table, xref, type Part } from '../blocks.js';
import { formatCount, formatNumber, formatProbability, formatRatio } from '../format.js';
import { contentBox } from '../paper.js';
import type { Block } from '../view.js';
import { quantityUncertaintyTable, uncertaintiesOf } from './quantity-uncertainty.js';

/**
 * How many of a set of gates fail: the exact distribution beside the one that treats the gates as
 * independent, a chart of both, and a closing note on how far apart they are.
 */
export const gateCounts: SectionRule = (results, ctx) => {
  const counts = results.gate_counts ?? [];
  if (counts.length === 0) return null;
  const blocks: Block[] = [
    para(
      'How many of a set fail, computed exactly with every shared cause counted once, beside the answer for independent ',
      'items with the same probabilities; the gap is what sharing costs. ',
      xref('methods', 'Method: {}.', 'method-counts'),
    ),
  ];
  for (const c of counts) {
    blocks.push(...countBlocks(c, ctx));
    blocks.push(
      ...quantityUncertaintyTable(uncertaintiesOf(results, 'gate-count', c.id), {
        id: anchor('tab-count-uncertainty', c.id),
        number: ctx.nextTable,
        caption: `Uncertainty of P(at least j of ${formatCount(c.of.length)} fail) for ${c.id}`,
        label: 'Count',
        name: (q) => q.id.replace(/^at-least-/, 'at least '),
      }),
    );
  }
  return { id: 'sec-gate-counts', number: ctx.number, title: 'How many gates fail', blocks };
};

function countBlocks(c: GateCountResult, ctx: BuildContext): Block[] {
  const n = c.of.length;
  const method = c.independent_method === 'binomial' ? 'binomial' : 'Poisson-binomial';
  const blocks: Block[] = [
    subheading(anchor('count', c.id), `${c.id} — ${c.title}`),
    table({
      id: anchor('tab-count-members', c.id),
      number: ctx.nextTable(),
      caption: `What ${c.id} counts, with each one’s own probability of failing`,
      columns: [col('Counted', 'left', { code: true, width: 'auto' }), col('Kind', 'left', { width: 'auto' }), col('Description', 'left', { width: 4 }), col('Probability', 'right', { width: 'auto' })],
      rows: c.of.map((g) => row([g.id, g.kind, g.title ?? '—', formatProbability(g.probability)])),
    }),
    table({
      id: anchor('tab-count', c.id),
      number: ctx.nextTable(),
      caption: `Number of the ${formatCount(n)} that fail: exact against independent (${method})`,
      columns: [
        col('j', 'right', { width: 'auto' }),
        col('P(exactly j), exact', 'right', { width: 'auto' }),
        col(`P(exactly j), independent`, 'right', { width: 'auto' }),
        col('P(at least j), exact', 'right', { width: 'auto' }),
        col('P(at least j), independent', 'right', { width: 'auto' }),
        col('Exact ÷ independent (at least j)', 'right', { width: 'auto' }),
      ],
      rows: c.exact.map((x, j) =>
        row([
          String(j),
          formatProbability(x),
          formatProbability(c.independent[j]),
          formatProbability(c.at_least.exact[j]),
          formatProbability(c.at_least.independent[j]),
          j === 0 ? '—' : ratioText(c.at_least.exact[j]!, c.at_least.independent[j]!),
        ]),
      ),
      note: `Expected number failing: ${formatNumber(c.mean.exact)} exactly and ${formatNumber(c.mean.independent)} as independent — always equal, being the sum of the ${formatCount(n)} probabilities; sharing moves probability from the middle of the distribution to its ends. Decision-diagram nodes of the count: ${formatCount(c.bdd_nodes)}.`,
    }),
  ];
  const width = Math.min(contentBox(ctx.paper).width, 440);
  const figure = ctx.nextFigure();
  const caption = `P(exactly j of ${formatCount(n)} fail) for ${c.id}, exact and as if independent (logarithmic scale)`;
  const values = [...c.exact, ...c.independent].filter((v) => v > 0);
  const x = withTicks(
    linearAxis([0, n], 'Number of gates that fail, j'),
    c.exact.map((_, j) => ({ value: j, label: String(j) })),
  );
  const y = logAxis(values, 'Probability');
  blocks.push({
    kind: 'figure',
    id: anchor('fig-count', c.id),
    number: figure,
    caption,
    parts: [
      lineChart(
        [
          { name: 'exact (shared causes counted once)', points: c.exact.map((v, j) => ({ x: j, y: v })), markers: true },
          { name: `independent gates (${method})`, points: c.independent.map((v, j) => ({ x: j, y: v })), markers: true },
        ],
        { width, label: `${figure}. ${caption}`, x, y, legend: true, frameHeight: 105 },
      ),
    ],
    note: 'Points of probability zero are not plotted on the logarithmic scale.',
  });
  blocks.push(callout('caution', `What sharing costs: ${c.id}`, closing(c)));
  return blocks;
}

function ratioText(exact: number, independent: number): string {
  if (independent === 0) return exact === 0 ? '—' : '∞';
  return formatRatio(exact / independent);
}

/** The closing note: the figures a reader quotes, both ways, and how far apart they are. */
function closing(c: GateCountResult): Part[] {
  const n = c.of.length;
  const parts: Part[] = [];
  const all = (label: string, j: number) => {
    const e = c.at_least.exact[j]!;
    const i = c.at_least.independent[j]!;
    parts.push(
      strong(label),
      `: ${formatProbability(e)} exactly, against ${formatProbability(i)} if the ${formatCount(n)} failed independently`,
      i > 0 && e >= i ? ` — treating them as independent understates it by a factor of ${formatRatio(e / i)}` : '',
      i > 0 && e < i ? ` — treating them as independent overstates it by a factor of ${formatRatio(i / e)}` : '',
      '. ',
    );
  };
  // With two, "at least 2" and "all" are one figure: say it once.
  if (n > 2) all(`At least 2 of ${formatCount(n)} fail`, 2);
  all(`All ${formatCount(n)} fail`, n);
  // The j where the two differ most (ratio of tail probabilities), if it is neither of the above.
  let worst = 1;
  let worstRatio = 0;
  for (let j = 1; j <= n; j++) {
    const e = c.at_least.exact[j]!;
    const i = c.at_least.independent[j]!;
    if (e > 0 && i > 0) {
      const r = Math.max(e / i, i / e);
      if (r > worstRatio) {
        worstRatio = r;
        worst = j;
      }
    }
  }
  if (worst !== 2 && worst !== n) all(`At least ${formatCount(worst)} fail (where the two differ most)`, worst);
  parts.push(`The independent (${c.independent_method === 'binomial' ? 'binomial' : 'Poisson-binomial'}) answer misses every cause the gates share; quote the exact figures.`);
  return parts;
}
