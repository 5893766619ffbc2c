import type { FitBound, FitResult, Results } from '../../analysis/results.js';
import { callout, code, col, keyValues, listWords, para, row, strong, subheading, table, xref } from '../blocks.js';
import { METHOD_WORDS, levelText, weibullPlot } from '../charts/weibull-plot.js';
import { anchor, type BuildContext, type SectionRule } from '../context.js';
import { capitalise, formatCount, formatDuration, formatRatio } from '../format.js';
import { contentBox } from '../paper.js';
import type { Block } from '../view.js';

/** Widest plot: legible on A4 and on letter, both of which have about 500 pt of text width. */
const PLOT_WIDTH = 310;

const METHOD_DETAIL: Record<FitResult['method'], string> = {
  mle: 'maximum likelihood, each suspension counted as a life known only to exceed its age (right-censored)',
  rank: 'median-rank regression of life on rank (Benard’s median ranks, Johnson’s adjusted ranks where there are suspensions)',
};

/**
 * The life-data fits: per data set, what the records hold, the fitted shape, scale and B10 life
 * with their bounds, how well a Weibull describes them, where the numbers are used, and the
 * probability plot. Every number is one of `results.fits`; this only formats and lays out.
 */
export const fits: SectionRule = (results, ctx) => {
  const list = results.fits ?? [];
  if (list.length === 0) return null;
  const blocks: Block[] = [
    para(
      `${list.length === 1 ? 'One data set of field life records, fitted' : `${formatCount(list.length)} data sets of field life records, each fitted`} with a Weibull distribution; suspensions count as lives known only to exceed their age. `,
      ...(list.some((f) => f.location !== undefined)
        ? ['A three-parameter fit (with a failure-free life γ) is drawn against the lives as recorded, so its line curves down towards γ at short lives. ']
        : []),
      xref('methods', 'Method and how to read the plots: {}.', 'method-fits'),
    ),
  ];
  // Each fitting method is described in full at its first fit only.
  list.forEach((fit, i) => blocks.push(...fitBlocks(fit, results, ctx, list.findIndex((f) => f.method === fit.method) === i)));
  return { id: 'sec-fits', number: ctx.number, title: 'Life-data fits', blocks };
};

function fitBlocks(fit: FitResult, results: Results, ctx: BuildContext, explainMethod: boolean): Block[] {
  const blocks: Block[] = [subheading(anchor('fit', fit.id), `${fit.id} — ${fit.data}${fit.group ? `, group ${fit.group}` : ''}`)];
  blocks.push(keyValues(summaryItems(fit, results)));
  blocks.push(
    table({
      id: anchor('tab-fit', fit.id),
      number: ctx.nextTable(),
      caption: `Weibull fit of ${fit.id} by ${METHOD_WORDS[fit.method]}: estimates and one-sided ${levelText(fit.level)} normal-approximation (Fisher information) bounds`,
      columns: [
        col('Quantity', 'left', { width: 3 }),
        col('Estimate', 'right', { width: 'auto' }),
        col(`Lower ${levelText(fit.level)}`, 'right', { width: 'auto' }),
        col(`Upper ${levelText(fit.level)}`, 'right', { width: 'auto' }),
      ],
      rows: [
        row(['Shape β', formatRatio(fit.shape), ...boundCells(fit.bounds.shape, formatRatio)]),
        row(['Scale η (characteristic life: 63.2% failed)', formatDuration(fit.scale), ...boundCells(fit.bounds.scale, formatDuration)]),
        ...(fit.location !== undefined ? [row(['Location γ (failure-free life)', formatDuration(fit.location), '—', '—'])] : []),
        row(['B10 life (10% failed)', formatDuration(fit.b10), ...boundCells(fit.bounds.b10, formatDuration)]),
      ],
      note:
        `Each bound is one-sided at ${levelText(fit.level)}; together they form a two-sided ${levelText(2 * fit.level - 1)} interval. ` +
        'Numbers are rounded here; the parameter register gives the values the quantification uses.',
    }),
  );
  if (explainMethod) blocks.push(para(strong('Method: '), `${METHOD_DETAIL[fit.method]}.`));
  else blocks.push(para(strong('Method: '), `${METHOD_WORDS[fit.method]}, as above.`));
  blocks.push(para(strong('Goodness of fit: '), goodnessVerdict(fit)));
  blocks.push(para(strong('Provenance: '), fit.provenance, '.'));
  blocks.push(usedByPara(fit, ctx));
  if (fit.warnings.length > 0) {
    blocks.push(callout('warning', `Warnings of the fit ${fit.id}`, ...fit.warnings.map((w) => [sentence(w)])));
  }
  const number = ctx.nextFigure();
  const caption = `Weibull probability plot of ${fit.id} (${fit.data}${fit.group ? `, group ${fit.group}` : ''})`;
  blocks.push({
    kind: 'figure',
    id: anchor('fig-fit', fit.id),
    number,
    caption,
    parts: [weibullPlot(fit, { width: Math.min(contentBox(ctx.paper).width, PLOT_WIDTH), label: `${number}. ${caption}` })],
  });
  return blocks;
}

function summaryItems(fit: FitResult, results: Results): [string, string][] {
  const items: [string, string][] = [['Data file', fit.data]];
  if (fit.group) items.push(['Group fitted', fit.group]);
  items.push([fit.group ? 'Rows in the file (all groups)' : 'Rows in the file', formatCount(fit.rows)]);
  items.push(['Lives fitted', formatCount(fit.n)]);
  items.push(['Failures', formatCount(fit.failures)]);
  items.push(['Suspensions', formatCount(fit.suspensions)]);
  // Without a group every row not fitted was excluded for a stated reason; with one, the other
  // groups' rows are among them too and the results do not say how many, so no count is shown.
  if (!fit.group) items.push(['Rows excluded', formatCount(fit.rows - fit.n)]);
  if (fit.source) {
    const source = results.sources.find((s) => s.id === fit.source);
    const invented = source?.invented && !/\binvented\b/i.test(source.title) ? ' (invented)' : '';
    items.push(['Source', source ? `${fit.source}: ${source.title}${invented}` : fit.source]);
  }
  if (fit.note) items.push(['Note', fit.note]);
  return items;
}

function boundCells(b: FitBound, format: (x: number) => string): [string, string] {
  return [format(b.lower), format(b.upper)];
}

function numberOf(fit: FitResult, key: string): number | undefined {
  const v = fit.goodness_of_fit[key];
  return typeof v === 'number' ? v : undefined;
}

/**
 * The goodness-of-fit numbers and one sentence on what they mean for this data set. A verdict is
 * given only where the analysis supplied a critical value (complete samples fitted by maximum
 * likelihood); otherwise the statistic is for comparing fits and the sentence says so.
 */
export function goodnessVerdict(fit: FitResult): string {
  const ad = numberOf(fit, 'anderson_darling');
  const adjusted = numberOf(fit, 'adjusted');
  const critical = numberOf(fit, 'critical_05');
  const r2 = numberOf(fit, 'r_squared');
  const rejected = fit.goodness_of_fit.rejected_05;
  // r² keeps four decimals: three significant figures would show most good fits alike (0.97–0.99).
  const plot = r2 !== undefined ? `; r² of the probability plot ${r2.toFixed(4)}` : '';
  const statistic = `Anderson–Darling A² = ${ad !== undefined ? formatRatio(ad) : '—'}`;
  if (typeof rejected === 'boolean' && adjusted !== undefined && critical !== undefined) {
    const head = `${statistic}, modified A*² = ${formatRatio(adjusted)} against the 5% critical value ${formatRatio(critical)}${plot}. `;
    return rejected
      ? `${head}The statistic exceeds the critical value, so the Weibull law is rejected at the 5% level for these records and the fitted numbers should not be used without a closer look at the data.`
      : `${head}The statistic is below the critical value, so the records give no reason at the 5% level to reject the Weibull law.`;
  }
  // One sentence with this fit's numbers in it, so two fits never repeat each other word for word.
  return `${statistic}${plot}: no published critical value applies to records with suspensions, a location or rank estimates, so the statistic gives no verdict and serves to compare fits of the same records; judge the fit from the plot.`;
}

function usedByPara(fit: FitResult, ctx: BuildContext): Block {
  if (fit.used_by.length === 0) {
    return para(strong('Used by: '), 'no parameter of the study takes its value from this fit (it is shown for the record).');
  }
  const events = new Set<string>();
  for (const key of fit.used_by) for (const e of ctx.parametersByKey.get(key)?.used_by ?? []) events.add(e);
  const keys = fit.used_by.flatMap((k, i) => [...(i === 0 ? [] : [i === fit.used_by.length - 1 ? ' and ' : ', ']), code(k)]);
  const eventList = [...events];
  return para(
    strong('Used by: '),
    ...keys,
    eventList.length > 0 ? `, for ${eventList.length === 1 ? 'the basic event' : `${formatCount(eventList.length)} basic events:`} ${listWords(eventList)}.` : '.',
  );
}

/** Warnings come as lower-case clauses; the callout shows each as a sentence. */
function sentence(text: string): string {
  const t = capitalise(text);
  return /[.!?]$/.test(t) ? t : `${t}.`;
}
