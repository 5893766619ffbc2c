import type { QuantityUncertainty, Results } from '../../analysis/results.js';
import { col, row, table } from '../blocks.js';
import { formatProbability } from '../format.js';
import type { Block } from '../view.js';

/** The Monte Carlo summaries of one owner's quantities of one kind, in the order the analysis gave them. */
export function uncertaintiesOf(results: Results, kind: QuantityUncertainty['kind'], owner: string): QuantityUncertainty[] {
  return (results.outcome_uncertainty ?? []).filter((q) => q.kind === kind && q.owner === owner);
}

/**
 * A table of point value, mean, median and 5th/95th percentiles for derived quantities (event-tree
 * outcomes and sequences, failure modes, gate counts), or nothing when the run has none (then no
 * table number is used).
 */
export function quantityUncertaintyTable(
  list: QuantityUncertainty[],
  fields: { id: string; number: () => string; caption: string; label: string; name?: (q: QuantityUncertainty) => string },
): Block[] {
  if (list.length === 0) return [];
  return [
    table({
      id: fields.id,
      number: fields.number(),
      caption: fields.caption,
      columns: [
        col(fields.label, 'left', { code: true, width: 'auto' }),
        col('Point value', 'right', { width: 'auto' }),
        col('Mean', 'right', { width: 'auto' }),
        col('Median', 'right', { width: 'auto' }),
        col('5th percentile', 'right', { width: 'auto' }),
        col('95th percentile', 'right', { width: 'auto' }),
      ],
      rows: list.map((q) =>
        row([fields.name ? fields.name(q) : q.id, formatProbability(q.point), formatProbability(q.mean), formatProbability(q.median), formatProbability(q.p05), formatProbability(q.p95)]),
      ),
      note: 'Point value: every parameter at its stated value. Mean and percentiles: over the Monte Carlo trials of the uncertainty section.',
    }),
  ];
}
