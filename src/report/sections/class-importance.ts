import type { ClassImportance, TopResult } from '../../analysis/results.js';
import { anchor, type SectionRule } from '../context.js';
import { code, col, para, row, subheading, table, xref } from '../blocks.js';
import { formatCount, formatProbability, formatRatio, formatShare } from '../format.js';
import type { Block } from '../view.js';

/**
 * Importance of each component class, all its events taken together: a bar chart of the share of
 * the top-event probability each class carries and the full table of group measures.
 */
export const classImportance: SectionRule = (results, ctx) => {
  const tops = results.tops.filter((t): t is TopResult & { class_importance: ClassImportance[] } => (t.class_importance?.length ?? 0) > 0);
  if (tops.length === 0) return null;
  const blocks: Block[] = [
    para(
      'Each component class’s events taken together (all failed: P1; all working: P0), so a class’s FV is the reach of a ',
      'change to the data its events share. ',
      xref('methods', 'Method: {}.', 'method-class-importance'),
    ),
  ];
  for (const top of tops) {
    const ranked = top.class_importance;
    const lead = ranked[0]!;
    blocks.push(
      subheading(anchor('class-importance', top.id), `${top.id} — ${top.title}`),
      para(
        'The class that carries the largest share of ',
        code(top.id),
        ' is ',
        code(lead.class),
        ` (${formatCount(lead.events.length)} ${lead.events.length === 1 ? 'event' : 'events'}): `,
        `${formatShare(lead.fussell_vesely)} of its probability would go if that class never failed. `,
        'With every event of the class failed the top-event probability would be ',
        formatProbability(lead.p_failed),
        `, ${formatRatio(lead.raw)} times the value as studied.`,
      ),
      table({
        id: anchor('tab-class-importance', top.id),
        number: ctx.nextTable(),
        caption: `Importance of the component classes for ${top.id}, ranked by Fussell–Vesely`,
        columns: [
          col('Rank', 'right', { width: 'auto' }),
          col('Class', 'left', { code: true, width: 2 }),
          col('Events', 'right', { width: 'auto' }),
          col('P1 (all failed)', 'right', { width: 'auto' }),
          col('P0 (all working)', 'right', { width: 'auto' }),
          col('FV', 'right', { width: 'auto' }),
          col('Birnbaum', 'right', { width: 'auto' }),
          col('RAW', 'right', { width: 'auto' }),
          col('RRW', 'right', { width: 'auto' }),
        ],
        rows: ranked.map((c, n) =>
          row(
            [
              String(n + 1),
              c.class,
              formatCount(c.events.length),
              formatProbability(c.p_failed),
              formatProbability(c.p_working),
              formatProbability(c.fussell_vesely),
              formatProbability(c.birnbaum),
              formatRatio(c.raw),
              formatRatio(c.rrw),
            ],
            { sortKeys: [n + 1, c.class, c.events.length, c.p_failed, c.p_working, c.fussell_vesely, c.birnbaum, finite(c.raw), finite(c.rrw)] },
          ),
        ),
        sortable: true,
        sortedBy: { column: 0, descending: false },
      }),
    );
  }
  return { id: 'sec-class-importance', number: ctx.number, title: 'Importance of component classes', blocks };
};

/** Infinity cannot be a sort key; it sorts above every finite value. */
function finite(x: number): number {
  return Number.isFinite(x) ? x : Number.MAX_VALUE;
}
