import type { Results, SensitivityResult } from '../../analysis/results.js';
import { logAxis, withTicks } from '../charts/axes.js';
import { lineChart } from '../charts/line-chart.js';
import { tornadoChart } from '../charts/tornado.js';
import { anchor, type BuildContext, type SectionRule } from '../context.js';
import { code, col, counted, listWords, para, row, subheading, table, xref } from '../blocks.js';
import { formatAsWritten, formatCount, formatDuration, formatNumber, formatProbability, formatRatio } from '../format.js';
import { contentBox } from '../paper.js';
import type { Block } from '../view.js';

/** Rows in the tornado chart; the table lists every parameter that moves the top. */
const TORNADO_ROWS = 10;

/**
 * One-at-a-time sensitivity: per top event, a tornado chart and table of the parameters that move
 * it, and the top-event probability against the exercise interval.
 */
export const sensitivity: SectionRule = (results, ctx) => {
  const list = (results.sensitivity ?? []).filter((s) => s.tornado.length > 0 || s.exercise_curve.length > 0);
  if (list.length === 0) return null;
  const blocks: Block[] = [
    para(
      'Each parameter moved on its own to the low and the high end of its range, every other parameter at its value; each ',
      'row says where its range came from. The widest bars are the data the answer rests on most, and so the data most ',
      'worth checking. ',
      xref('methods', 'Method: {}.', 'method-sensitivity'),
    ),
  ];
  const firstCurve = list.find((x) => x.exercise_curve.length > 0);
  for (const s of list) blocks.push(...topBlocks(results, s, ctx, s === firstCurve));
  return { id: 'sec-sensitivity', number: ctx.number, title: 'Sensitivity', blocks };
};

function topBlocks(results: Results, s: SensitivityResult, ctx: BuildContext, explainCurve: boolean): Block[] {
  const top = results.tops.find((t) => t.id === s.top);
  const blocks: Block[] = [subheading(anchor('sensitivity', s.top), `${s.top}${top ? ` — ${top.title}` : ''}`)];
  const width = Math.min(contentBox(ctx.paper).width, 480);
  const moving = s.tornado.filter((t) => t.swing !== 0);
  const still = s.tornado.filter((t) => t.swing === 0);
  const asWritten = (key: string, value: number) => {
    const p = ctx.parametersByKey.get(key);
    return formatAsWritten(p?.quantity ?? 'number', value, p?.written);
  };
  if (moving.length > 0) {
    const lead = moving[0]!;
    blocks.push(
      para(
        'The widest swing comes from ',
        code(lead.key),
        `: the top-event probability is ${formatProbability(lead.low)} with it at ${asWritten(lead.key, lead.low_value)} `,
        `and ${formatProbability(lead.high)} with it at ${asWritten(lead.key, lead.high_value)}, against `,
        `${formatProbability(lead.base)} as studied. `,
        still.length > 0
          ? `${formatCount(still.length)} of the ${formatCount(s.tornado.length)} parameters do not move this top event at all and are left out of the table.`
          : '',
      ),
    );
    const shown = moving.slice(0, TORNADO_ROWS);
    const figure = ctx.nextFigure();
    const caption = `Tornado chart for ${s.top}: the ${formatCount(shown.length)} parameters with the widest swing`;
    blocks.push({
      kind: 'figure',
      id: anchor('fig-tornado', s.top),
      number: figure,
      caption,
      parts: [tornadoChart(shown.map((t) => ({ label: t.key, low: t.low, high: t.high })), lead.base, { width, label: `${figure}. ${caption}`, axisTitle: `Probability of ${s.top}` })],
    });
    blocks.push(
      table({
        id: anchor('tab-tornado', s.top),
        number: ctx.nextTable(),
        caption: `One-at-a-time sensitivity of ${s.top}: the ${counted(shown.length, 'widest swing')}`,
        columns: [
          col('Rank', 'right', { width: 'auto' }),
          col('Parameter', 'left', { code: true, width: 3 }),
          col('Low value', 'right', { width: 'auto' }),
          col('High value', 'right', { width: 'auto' }),
          col('Top, low', 'right', { width: 'auto' }),
          col('Top, high', 'right', { width: 'auto' }),
          col('Swing', 'right', { width: 'auto' }),
          col('Range from', 'left', { width: 2 }),
        ],
        rows: shown.map((t, n) =>
          row(
            [
              String(n + 1),
              t.key,
              asWritten(t.key, t.low_value),
              asWritten(t.key, t.high_value),
              formatProbability(t.low),
              formatProbability(t.high),
              formatProbability(t.swing),
              rangeBasis(t, results),
            ],
            { sortKeys: [n + 1, t.key, t.low_value, t.high_value, t.low, t.high, t.swing, rangeBasis(t, results)] },
          ),
        ),
        sortable: true,
        sortedBy: { column: 0, descending: false },
        ...(moving.length > shown.length ? { note: `${counted(moving.length - shown.length, 'parameter')} with smaller swings ${moving.length - shown.length === 1 ? 'is' : 'are'} in results.json (sensitivity).` } : {}),
      }),
    );
  } else if (s.tornado.length > 0) {
    blocks.push(para(`None of the ${formatCount(s.tornado.length)} parameters moves this top event.`));
  }
  if (s.skipped.length > 0) {
    blocks.push(
      para(
        `Not varied, because an end of the factor rule falls outside what the parameter can be: `,
        s.skipped.map((x) => `${x.key} — ${x.reason}`).join('; '),
        '. State a range for these parameters to include them.',
      ),
    );
  }
  if (s.exercise_curve.length > 0) blocks.push(...exerciseBlocks(results, s, ctx, width, explainCurve));
  return blocks;
}

type TornadoRow = SensitivityResult['tornado'][number] & { range_source?: string; range_basis?: string };

/**
 * Where a tornado row's range came from, in words: the analysis says so (`range_basis`); results
 * from before it did are described from the parameter (a stated range, else the default factor).
 */
function rangeBasis(t: TornadoRow, results: Results): string {
  if (t.range_basis) return t.range_basis;
  if (results.parameters.find((p) => p.key === t.key)?.range) return 'stated range';
  const factor = results.settings['sensitivity_factor'];
  return typeof factor === 'number' ? `default factor ×/÷ ${formatNumber(factor)}` : 'default factor';
}

/** The curve's set-up and why it rises are said with the first top's curve only; later tops give their numbers. */
function exerciseBlocks(results: Results, s: SensitivityResult, ctx: BuildContext, width: number, explain: boolean): Block[] {
  const exercised = results.parameters.filter((p) => p.field === 'exercise' && p.used_by.length > 0);
  const base = s.exercise_curve.find((c) => c.base);
  const points = s.exercise_curve.filter((c) => !c.base && c.years !== undefined);
  const first = points[0];
  const last = points[points.length - 1];
  const blocks: Block[] = [
    para(
      explain
        ? `The exercise interval: every exercise field of the study (${listWords(exercised.map((p) => p.key))}) set together to ${listWords(points.map((p) => p.label))}, everything else as studied. `
        : '',
      first && last
        ? `Exercising ${first.label} gives ${formatProbability(first.probability)} (${formatRatio(first.ratio)} × as studied); ${last.label}, ${formatProbability(last.probability)} (${formatRatio(last.ratio)} ×). `
        : '',
      explain ? 'A component that waits longer between exercises has longer to fail unseen before the demand, so the curve rises with the interval.' : '',
    ),
  ];
  const figure = ctx.nextFigure();
  const caption = `Probability of ${s.top} against the exercise interval`;
  const xs = points.map((p) => p.years!);
  const x = withTicks(
    logAxis(xs, 'Exercise interval (every exercised component)', formatDuration),
    points.map((p) => ({ value: p.years!, label: p.label })),
  );
  const y = logAxis([...points.map((p) => p.probability), ...(base ? [base.probability] : [])], `Probability of ${s.top}`);
  blocks.push({
    kind: 'figure',
    id: anchor('fig-exercise', s.top),
    number: figure,
    caption,
    parts: [
      lineChart([{ name: s.top, points: points.map((p) => ({ x: p.years!, y: p.probability })), markers: true }], {
        width,
        label: `${figure}. ${caption}`,
        x,
        y,
        frameHeight: 105,
        ...(base ? { references: [{ axis: 'y' as const, value: base.probability, label: `as studied ${formatProbability(base.probability)}` }] } : {}),
      }),
    ],
  });
  blocks.push(
    table({
      id: anchor('tab-exercise', s.top),
      number: ctx.nextTable(),
      caption: `Probability of ${s.top} against the exercise interval`,
      columns: [col('Exercise', 'left', { width: 2 }), col('Interval', 'right', { width: 'auto' }), col('Probability', 'right', { width: 'auto' }), col('× as studied', 'right', { width: 'auto' })],
      rows: s.exercise_curve.map((c) => row([c.label, c.years !== undefined ? formatDuration(c.years) : 'as in each event', formatProbability(c.probability), formatRatio(c.ratio)])),
    }),
  );
  return blocks;
}
