import type { Importance, TopResult } from '../../analysis/results.js';
import { barChart } from '../charts/bars.js';
import { anchor, type SectionRule } from '../context.js';
import { col, para, row, subheading, table } from '../blocks.js';
import { formatProbability, formatRatio } from '../format.js';
import { contentBox } from '../paper.js';
import type { Block } from '../view.js';
import { compareText } from './cut-sets.js';

/** Events shown in the bar chart; the table lists them all. */
const CHART_BARS = 15;

/** Importance measures per top event, where the analysis computed them: a bar chart and a ranked table. */
export const importance: SectionRule = (results, ctx) => {
  const tops = results.tops.filter((t): t is TopResult & { importance: Importance[] } => (t.importance?.length ?? 0) > 0);
  if (tops.length === 0) return null;
  const blocks: Block[] = [
    para(
      'Fussell–Vesely (FV): the fraction of the top-event probability that involves the event. Birnbaum: how much the ',
      'top-event probability changes between the event certainly failed and certainly working. Criticality: Birnbaum ',
      'weighted by the event’s probability over the top’s. Risk achievement worth (RAW): the factor by which the top-event ',
      'probability rises if the event is certain. Risk reduction worth (RRW): the factor by which it falls if the event ',
      'never occurs. Measures as defined by Vesely et al., NUREG/CR-3385 (1983). Events are ranked by FV.',
    ),
  ];
  const width = Math.min(contentBox(ctx.paper).width, 480);
  for (const top of tops) {
    const ranked = [...top.importance].sort((a, b) => b.fussell_vesely - a.fussell_vesely || compareText(a.event, b.event));
    const number = ctx.nextFigure();
    const caption = `Fussell–Vesely importance of the ${Math.min(CHART_BARS, ranked.length)} leading events of ${top.id}`;
    blocks.push(subheading(anchor('importance', top.id), `${top.id} — ${top.title}`), {
      kind: 'figure',
      id: anchor('fig-importance', top.id),
      number,
      caption,
      parts: [
        barChart(
          ranked.slice(0, CHART_BARS).map((i) => ({ label: i.event, value: i.fussell_vesely, text: formatProbability(i.fussell_vesely) })),
          { width, caption: `${number}. ${caption}`, axis: 'Fussell–Vesely importance (fraction of the top-event probability)' },
        ),
      ],
    });
    blocks.push(
      table({
        id: anchor('tab-importance', top.id),
        number: ctx.nextTable(),
        caption: `Importance measures for ${top.id}, ranked by Fussell–Vesely`,
        columns: [
          col('Rank', 'right', { width: 'auto' }),
          col('Basic event', 'left', { code: true, width: 3 }),
          col('FV', 'right', { width: 'auto' }),
          col('Birnbaum', 'right', { width: 'auto' }),
          col('Criticality', 'right', { width: 'auto' }),
          col('RAW', 'right', { width: 'auto' }),
          col('RRW', 'right', { width: 'auto' }),
        ],
        rows: ranked.map((i, n) =>
          row(
            [
              String(n + 1),
              i.event,
              formatProbability(i.fussell_vesely),
              formatProbability(i.birnbaum),
              formatProbability(i.criticality),
              formatRatio(i.raw),
              formatRatio(i.rrw),
            ],
            { sortKeys: [n + 1, i.event, i.fussell_vesely, i.birnbaum, i.criticality, i.raw, sortable(i.rrw)] },
          ),
        ),
        sortable: true,
        sortedBy: { column: 0, descending: false },
      }),
    );
    if (top.no_effect) blocks.push(para(`Not listed (${top.no_effect.events.join(', ')}): ${top.no_effect.note}.`));
  }
  return { id: 'sec-importance', number: ctx.number, title: 'Importance measures', newPage: true, blocks };
};

/** Infinity is not valid in a data attribute's number; sort it above every finite value. */
function sortable(x: number): number {
  return Number.isFinite(x) ? x : Number.MAX_VALUE;
}
