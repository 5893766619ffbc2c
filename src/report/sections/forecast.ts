import type { ForecastResult } from '../../analysis/results.js';
import { linearAxis, withTicks } from '../charts/axes.js';
import { lineChart } from '../charts/line-chart.js';
import { anchor, type SectionRule } from '../context.js';
import { code, col, counted, para, row, subheading, table, xref, type Part } from '../blocks.js';
import { formatCount, formatProbability } from '../format.js';
import { contentBox } from '../paper.js';
import type { Block } from '../view.js';

/** Year ticks on the chart: every fifth year when the horizon is long. */
function tickStep(years: number): number {
  return years > 20 ? 5 : years > 8 ? 2 : 1;
}

/** The forecast: per top event, a line chart and a table of the probability year by year. */
export const forecast: SectionRule = (results, ctx) => {
  const list = results.forecast ?? [];
  const base = list.find((f) => f.scenario === undefined);
  if (!base || base.years.length === 0) return null;
  const last = base.years[base.years.length - 1]!;
  const scenarios = list.filter((f) => f.scenario !== undefined);
  const blocks: Block[] = [
    para(
      `The top-event probabilities year by year from ${results.study.as_of} to ${last.date} (${counted(last.year, 'year')} on) as the ageing components grow older`,
      scenarios.length > 0 ? ', beside each scenario that plans a renewal. ' : '; no scenario plans a renewal. ',
      xref('methods', 'Method: {}.', 'method-forecast'),
    ),
  ];
  const width = Math.min(contentBox(ctx.paper).width, 480);
  const series = [base, ...scenarios];
  const name = (f: ForecastResult) => (f.scenario === undefined ? 'base case' : f.scenario);
  for (const top of results.tops) {
    const at = (f: ForecastResult, k: number) => f.years[k]?.tops[top.id];
    const now = at(base, 0);
    const end = at(base, base.years.length - 1);
    const words: Part[] = [];
    if (now !== undefined && end !== undefined) {
      words.push('In the base case the probability of ', code(top.id), ` goes from ${formatProbability(now)} now to ${formatProbability(end)} in ${last.date.slice(0, 4)}. `);
    }
    for (const f of scenarios) {
      const e = at(f, f.years.length - 1);
      if (e === undefined || end === undefined) continue;
      const same = formatProbability(e) === formatProbability(end);
      words.push(
        'With ',
        code(f.scenario!),
        ` it is ${formatProbability(e)} in ${last.date.slice(0, 4)}`,
        same ? ', the same as the base case to three figures: the plan hardly changes this top event. ' : '. ',
      );
    }
    blocks.push(subheading(anchor('forecast', top.id), `${top.id} — ${top.title}`), para(...words));
    const figure = ctx.nextFigure();
    const caption = `Forecast probability of ${top.id}, ${results.study.as_of.slice(0, 4)}–${last.date.slice(0, 4)}`;
    const values = series.flatMap((f) => f.years.map((y) => y.tops[top.id]!).filter((v) => Number.isFinite(v)));
    const step = tickStep(last.year);
    const x = withTicks(
      linearAxis([0, last.year], 'Year'),
      base.years.filter((y) => y.year % step === 0).map((y) => ({ value: y.year, label: y.date.slice(0, 4) })),
    );
    const y = linearAxis(values, `Probability of ${top.id}`, { zero: true, format: formatProbability });
    blocks.push({
      kind: 'figure',
      id: anchor('fig-forecast', top.id),
      number: figure,
      caption,
      parts: [
        lineChart(
          series.map((f) => ({ name: f.scenario === undefined ? 'base case' : `${f.scenario} — ${f.title ?? ''}`, points: f.years.map((yr) => ({ x: yr.year, y: yr.tops[top.id]! })) })),
          { width, label: `${figure}. ${caption}`, x, y, legend: true, frameHeight: 105 },
        ),
      ],
    });
    blocks.push(
      table({
        id: anchor('tab-forecast', top.id),
        number: ctx.nextTable(),
        caption: step > 1 ? `Forecast probability of ${top.id}, every ${counted(step, 'year')} and the last` : `Forecast probability of ${top.id} by year`,
        columns: [col('Year', 'right', { width: 'auto' }), col('Date', 'left', { width: 'auto' }), ...series.map((f) => col(name(f), 'right', { width: 'auto' as const }))],
        rows: base.years
          .map((yr, k) => ({ yr, k }))
          .filter(({ yr, k }) => yr.year % step === 0 || k === base.years.length - 1)
          .map(({ yr, k }) => row([formatCount(yr.year), yr.date, ...series.map((f) => formatProbability(at(f, k)))])),
        ...(step > 1 ? { note: 'Every year is in results.json (forecast).' } : {}),
      }),
    );
  }
  return { id: 'sec-forecast', number: ctx.number, title: 'Forecast', blocks };
};


