import type { ScenarioResult } from '../../analysis/results.js';
import { type SectionRule } from '../context.js';
import { code, col, para, row, table, xref, type Part } from '../blocks.js';
import { formatProbability, formatQuantity, formatRatio } from '../format.js';
import type { Block } from '../view.js';

/** The study's scenarios side by side with the base case, at the snapshot date. */
export const scenarios: SectionRule = (results, ctx) => {
  const list = results.scenarios ?? [];
  if (list.length === 0 || results.tops.length === 0) return null;
  const headline = results.tops[0]!;
  const blocks: Block[] = [
    para(
      `Each scenario quantified again at the snapshot date ${results.study.as_of}; “× base” is its probability divided by the base case’s. `,
      xref('methods', 'Method: {}.', 'method-scenarios'),
    ),
  ];
  const ranked = list
    .map((s) => ({ s, t: s.tops.find((x) => x.id === headline.id)! }))
    .filter((x) => x.t !== undefined);
  const best = ranked.filter((x) => x.t.ratio < 1).sort((a, b) => a.t.ratio - b.t.ratio)[0];
  const worst = ranked.filter((x) => x.t.ratio > 1).sort((a, b) => b.t.ratio - a.t.ratio)[0];
  const summary: Part[] = [];
  if (best) summary.push('Of these, ', code(best.s.id), ` lowers `, code(headline.id), ` most, to ${formatProbability(best.t.probability)} (${formatRatio(best.t.ratio)} × base). `);
  if (worst) summary.push(code(worst.s.id), ' raises it most, to ', `${formatProbability(worst.t.probability)} (${formatRatio(worst.t.ratio)} × base). `);
  if (summary.length > 0) blocks.push(para(...summary));

  const columns = [col('Scenario', 'left', { code: true, width: 'auto' as const }), col('What it changes', 'left', { width: 3 })];
  for (const t of results.tops) columns.push(col(t.id, 'right', { width: 'auto' }), col('× base', 'right', { width: 'auto' }));
  const baseRow = row(['base case', 'as studied', ...results.tops.flatMap((t) => [formatProbability(t.probability.exact), formatRatio(1)])]);
  blocks.push(
    table({
      id: 'tab-scenarios',
      number: ctx.nextTable(),
      caption: `Scenarios against the base case at ${results.study.as_of}`,
      columns,
      rows: [
        baseRow,
        ...list.map((s) =>
          row([
            s.id,
            changes(s, (key) => ctx.parametersByKey.get(key)?.quantity ?? 'number'),
            ...results.tops.flatMap((t) => {
              const x = s.tops.find((y) => y.id === t.id);
              return x ? [formatProbability(x.probability), formatRatio(x.ratio)] : ['—', '—'];
            }),
          ]),
        ),
      ],
      note: list.map((s) => `${s.id}: ${s.title}`).join('. ') + '.',
    }),
  );
  return { id: 'sec-scenarios', number: ctx.number, title: 'Scenarios', blocks };
};

/** `hoist-motor.exercise 7 days; gate-4-out-of-service on; generator renewed 2028-07-01`. */
function changes(s: ScenarioResult, quantity: (key: string) => string): string {
  const parts = [
    ...s.set.map((x) => `${x.key} ${formatQuantity(quantity(x.key), x.value)}`),
    ...s.switches.map((x) => `${x.event} ${x.on ? 'on' : 'off'}`),
    ...s.renew.map((x) => `${x.event} renewed ${x.date}`),
  ];
  return parts.length > 0 ? parts.join('; ') : 'nothing';
}
