import type { TopResult } from '../../analysis/results.js';
import { anchor, type SectionRule } from '../context.js';
import { col, para, row, subheading, table } from '../blocks.js';
import { formatCount, formatProbability, formatShare } from '../format.js';
import type { Block } from '../view.js';

/** How many cut sets the appendix lists per top event; the rest are in the CSV output. */
export const CUT_SETS_SHOWN = 50;

/** The most probable minimal cut sets of each top event, with what was left out and why. */
export const cutSets: SectionRule = (results, ctx) => {
  const tops = results.tops.filter((t) => t.cut_sets.length > 0 || t.cut_set_summary.listed > 0);
  if (tops.length === 0) return null;
  const blocks: Block[] = [
    para(
      'A minimal cut set is a smallest combination of basic events whose joint occurrence causes the top event. ',
      'Share is the cut set’s probability as a fraction of the exact top-event probability; shares can add up to more than ',
      '100% because cut sets overlap. Each table is printed in order of decreasing probability; in the HTML version a ',
      'click on a column heading re-sorts it (with scripts enabled).',
    ),
  ];
  for (const top of tops) blocks.push(...topBlocks(top, ctx.nextTable));
  return { id: 'sec-cut-sets', number: ctx.number, title: 'Minimal cut sets', newPage: true, blocks };
};

function topBlocks(top: TopResult, nextTable: () => string): Block[] {
  // Ranked by probability (ties by the event list, so the order is the same on every run).
  const ranked = [...top.cut_sets].sort(
    (a, b) => b.probability - a.probability || compareText(a.events.join(' '), b.events.join(' ')),
  );
  const shown = ranked.slice(0, CUT_SETS_SHOWN);
  const s = top.cut_set_summary;
  const notShown = ranked.length - shown.length;
  const counts: string[] = [
    `The analysis listed ${formatCount(s.listed)} minimal cut ${s.listed === 1 ? 'set' : 'sets'} of at most ${formatCount(s.max_order)} events `,
    `with probability at or above the cutoff ${formatProbability(s.cutoff)}. `,
    notShown > 0
      ? `The ${formatCount(shown.length)} most probable are shown; ${formatCount(notShown)} more are in the cut-set CSV file. `
      : `All ${formatCount(shown.length)} are shown. `,
    s.truncated > 0
      ? `${formatCount(s.truncated)} ${s.truncated === 1 ? 'cut set was' : 'cut sets were'} dropped by the cutoff or the order limit` +
        (s.truncated_probability !== undefined ? `, with a total probability of ${formatProbability(s.truncated_probability)}.` : '.')
      : 'None was dropped by the cutoff or the order limit.',
  ];
  if (s.capped) {
    // The cap (settings.max_cut_sets) keeps memory bounded; the rest are counted and summed, or bounded.
    const atMost = s.capped_exact ? '' : 'at most ';
    counts.push(
      ` Only the ${formatCount(s.listed)} most probable were kept (settings.max_cut_sets = ${formatCount(s.max_cut_sets ?? s.listed)}): ` +
        `${atMost}${formatCount(s.capped)} more at or above the cutoff were left out, with a total probability of ${atMost}${formatProbability(s.capped_probability ?? 0)}; ` +
        'the rare-event and MCUB values cover the kept sets only, the exact value all of them.',
    );
  }
  return [
    subheading(anchor('cuts', top.id), `${top.id} — ${top.title}`),
    para(...counts),
    table({
      id: anchor('tab-cuts', top.id),
      number: nextTable(),
      caption: `Most probable minimal cut sets of ${top.id}`,
      columns: [
        col('Rank', 'right', { width: 'auto' }),
        col('Basic events', 'left', { code: true, width: 5 }),
        col('Order', 'right', { width: 'auto' }),
        col('Probability', 'right', { width: 'auto' }),
        col('Share', 'right', { width: 'auto' }),
      ],
      rows: shown.map((c, i) =>
        row([String(i + 1), c.events.join(' · '), String(c.events.length), formatProbability(c.probability), formatShare(c.share)], {
          sortKeys: [i + 1, c.events.join(' '), c.events.length, c.probability, c.share],
        }),
      ),
      sortable: true,
      sortedBy: { column: 0, descending: false },
      empty: 'No cut set above the cutoff.',
    }),
  ];
}

/** Code-unit order: the same on every machine, unlike locale collation. */
export function compareText(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}
