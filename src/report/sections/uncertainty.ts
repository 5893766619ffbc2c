import type { Results, UncertaintyResult } from '../../analysis/results.js';
import { histogramChart } from '../charts/histogram.js';
import { anchor, type BuildContext, type SectionRule } from '../context.js';
import { callout, code, col, counted, para, row, subheading, table, xref, type Part } from '../blocks.js';
import { formatCount, formatProbability, formatShare } from '../format.js';
import { contentBox } from '../paper.js';
import type { Block } from '../view.js';

/** Above this relative change of the 95th percentile between half and all trials, more trials are advised (common practice, no source). */
const CONVERGED = 0.05;

/** The Monte Carlo propagation of the parameters' uncertainty: method, then per top a table and two charts. */
export const uncertainty: SectionRule = (results, ctx) => {
  const list = results.uncertainty ?? [];
  if (list.length === 0) return null;
  const u0 = list[0]!;
  const method = u0.method === 'latin-hypercube' ? 'Latin hypercube sampling (McKay, Beckman & Conover, 1979)' : 'plain Monte Carlo sampling';
  const blocks: Block[] = [
    para(
      `${formatCount(u0.samples)} trials of ${method} with the study’s seed ${String(u0.seed)}; like components share one draw per trial. `,
      xref('methods', 'Method and the mean against the point value: {}. ', 'method-uncertainty'),
      `The ${counted(u0.sampled_parameters.length, 'sampled parameter')}: `,
      ...joinCodes(u0.sampled_parameters),
      '.',
    ),
  ];
  if (u0.held_parameters.length > 0) {
    blocks.push(
      callout('warning', 'Uncertainty not sampled', [
        'These parameters state an uncertainty that was not sampled and were held at their values: ',
        u0.held_parameters.map((h) => `${h.key} (${h.reason})`).join('; '),
        '.',
      ]),
    );
  }
  if (u0.clipped_trials > 0) {
    blocks.push(
      para(
        `In ${formatCount(u0.clipped_trials)} of the trials a sampled probability exceeded 1 (the upper tail of its distribution) `,
        'and was set to 1.',
      ),
    );
  }
  for (const u of list) blocks.push(...topBlocks(results, u, ctx));
  return { id: 'sec-uncertainty', number: ctx.number, title: 'Uncertainty', blocks };
};

function joinCodes(keys: string[]): Part[] {
  const parts: Part[] = [];
  keys.forEach((k, i) => {
    if (i > 0) parts.push(i === keys.length - 1 ? ' and ' : ', ');
    parts.push(code(k));
  });
  return parts;
}

function topBlocks(results: Results, u: UncertaintyResult, ctx: BuildContext): Block[] {
  const top = results.tops.find((t) => t.id === u.top);
  const point = top?.probability.exact;
  const width = Math.min(contentBox(ctx.paper).width, 480);
  const c = u.convergence;
  const blocks: Block[] = [subheading(anchor('uncertainty', u.top), `${u.top}${top ? ` — ${top.title}` : ''}`)];
  const sentences: Part[] = [
    `Nine trials in ten gave a probability of `,
    code(u.top),
    ` between ${formatProbability(u.p05)} (5th percentile) and ${formatProbability(u.p95)} (95th); the median is `,
    `${formatProbability(u.median)} and the mean ${formatProbability(u.mean)}. `,
  ];
  if (point !== undefined) {
    sentences.push(
      `The point value, ${formatProbability(point)}, is the top event at the parameters’ stated values; `,
      u.mean > point ? 'the mean lies above it, as is usual with skewed inputs and shared draws. ' : 'the mean does not exceed it here. ',
    );
  }
  sentences.push(
    `Convergence: the 95th percentile of the first half of the trials was ${formatProbability(c.p95_half)}, of all of them `,
    `${formatProbability(c.p95_full)}, a change of ${formatShare(c.relative_change)}`,
    c.relative_change <= CONVERGED
      ? `, within the ${formatShare(CONVERGED)} taken here as settled.`
      : `, more than the ${formatShare(CONVERGED)} taken here as settled: more trials (settings.samples) are advised.`,
  );
  blocks.push(para(...sentences));
  blocks.push(
    table({
      id: anchor('tab-uncertainty', u.top),
      number: ctx.nextTable(),
      caption: `Uncertainty of ${u.top}: summary of ${formatCount(u.samples)} trials`,
      columns: [col('Statistic', 'left', { width: 3 }), col('Probability', 'right', { width: 'auto' })],
      rows: [
        ...(point !== undefined ? [row(['Point estimate (parameters at their values)', formatProbability(point)])] : []),
        row(['Mean', formatProbability(u.mean)]),
        row(['Standard error of the mean', formatProbability(u.standard_error)]),
        row(['Standard deviation', formatProbability(u.sd)]),
        row(['5th percentile', formatProbability(u.p05)]),
        row(['Median', formatProbability(u.median)]),
        row(['95th percentile', formatProbability(u.p95)]),
        row(['95th percentile, first half of the trials', formatProbability(c.p95_half)]),
        // The rest of the cumulative curve: every percentile the analysis gave beyond the three above.
        ...u.cdf.filter((p) => ![0.05, 0.5, 0.95].includes(p.p)).map((p) => row([`${formatShare(p.p)} of trials at or below`, formatProbability(p.value)])),
      ],
    }),
  );

  const hFigure = ctx.nextFigure();
  const hCaption = `Histogram of the probability of ${u.top} over ${formatCount(u.samples)} trials (logarithmic bins)`;
  const markers = [
    { value: u.p05, name: '5%' },
    { value: u.median, name: 'median' },
    { value: u.mean, name: 'mean' },
    { value: u.p95, name: '95%' },
    ...(point !== undefined ? [{ value: point, name: 'point estimate', strong: true }] : []),
  ];
  blocks.push({
    kind: 'figure',
    id: anchor('fig-histogram', u.top),
    number: hFigure,
    caption: hCaption,
    ...(u.histogram.zeros > 0 ? { note: `${formatCount(u.histogram.zeros)} trials gave exactly 0 and are not drawn on the logarithmic axis.` } : {}),
    parts: [histogramChart(u.histogram, { width, label: `${hFigure}. ${hCaption}`, xTitle: `Probability of ${u.top}`, markers })],
  });

  return blocks;
}
