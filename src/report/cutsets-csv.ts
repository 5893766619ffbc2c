/** cutsets.csv: every listed minimal cut set of every top, one row each, for spreadsheets and diff tools. */
import type { Results } from '../analysis/results.js';

const HEADER = ['top', 'rank', 'order', 'probability', 'share', 'events'];

function cell(text: string): string {
  return /[",\n\r]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export function cutSetsCsv(results: Results): string {
  const rows = [HEADER.join(',')];
  for (const top of results.tops) {
    top.cut_sets.forEach((c, i) => {
      rows.push([top.id, String(i + 1), String(c.events.length), c.probability.toExponential(6), c.share.toExponential(6), c.events.join(' ')].map(cell).join(','));
    });
  }
  return rows.join('\n') + '\n';
}
