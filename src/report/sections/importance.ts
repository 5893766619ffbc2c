import type { Importance, TopResult } from '../../analysis/results.js';
import { anchor, type SectionRule } from '../context.js';
import { col, counted, para, row, subheading, table, xref } from '../blocks.js';
import { formatProbability, formatRatio } from '../format.js';
import type { Block } from '../view.js';
import { compareText } from './cut-sets.js';

/** Importance measures per top event, where the analysis computed them: a bar chart and a ranked table. */
/** Shown: events with at least this FV, or at least this RAW (common practice for screening, no source). */
const SHOWN_FV = 1e-3;
const SHOWN_RAW = 10;

export const importance: SectionRule = (results, ctx) => {
  const tops = results.tops.filter((t): t is TopResult & { importance: Importance[] } => (t.importance?.length ?? 0) > 0);
  if (tops.length === 0) return null;
  const blocks: Block[] = [
    para(
      'Basic events ranked by Fussell–Vesely (FV), the fraction of the top-event probability that involves the event; ',
      'Birnbaum, criticality, RAW and RRW beside it (NUREG/CR-3385). ',
      xref('methods', 'Method: {}.', 'method-importance'),
    ),
  ];
  for (const top of tops) {
    const all = [...top.importance].sort((a, b) => b.fussell_vesely - a.fussell_vesely || compareText(a.event, b.event));
    // Events that neither carry a noticeable share nor would raise the top much if certain add nothing a reviewer acts on.
    const ranked = all.filter((i) => i.fussell_vesely >= SHOWN_FV || i.raw >= SHOWN_RAW);
    blocks.push(subheading(anchor('importance', top.id), `${top.id} — ${top.title}`));
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
        rows: ranked.map((i) =>
          row(
            [
              String(all.indexOf(i) + 1),
              i.event,
              formatProbability(i.fussell_vesely),
              formatProbability(i.birnbaum),
              formatProbability(i.criticality),
              formatRatio(i.raw),
              formatRatio(i.rrw),
            ],
            { sortKeys: [all.indexOf(i) + 1, i.event, i.fussell_vesely, i.birnbaum, i.criticality, i.raw, sortable(i.rrw)] },
          ),
        ),
        sortable: true,
        sortedBy: { column: 0, descending: false },
        ...(all.length > ranked.length
          ? { note: `${counted(all.length - ranked.length, 'event')} with FV below ${formatProbability(SHOWN_FV)} and RAW below ${formatRatio(SHOWN_RAW)} ${all.length - ranked.length === 1 ? 'is' : 'are'} left out here; results.json lists every event.` }
          : {}),
      }),
    );
    if (top.no_effect) blocks.push(para(`Not listed (${top.no_effect.events.join(', ')}): ${top.no_effect.note}.`));
  }
  return { id: 'sec-importance', number: ctx.number, title: 'Importance measures', blocks };
};

/** Infinity is not valid in a data attribute's number; sort it above every finite value. */
function sortable(x: number): number {
  return Number.isFinite(x) ? x : Number.MAX_VALUE;
}
