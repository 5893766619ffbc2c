/** cutsets.csv: every listed minimal cut set of every top, one row each, for spreadsheets and diff tools. */
import type { Results } from '../analysis/results.js';

const HEADER = ['top', 'rank', 'order', 'probability', 'share', 'events'];

/**
 * A text cell. One that starts like a formula (=, +, -, @, or a tab or carriage return before one)
 * gets a leading apostrophe, so a spreadsheet shows it as text instead of evaluating it
 * (spreadsheet-injection defence, common practice, no source). Numbers we format are not text cells.
 */
export function csvTextCell(text: string): string {
  const safe = /^[=+\-@\t\r]/.test(text) ? `'${text}` : text;
  return csvCell(safe);
}

/** Quotes a cell that holds a quote, comma or line break (RFC 4180). */
function csvCell(text: string): string {
  return /[",\n\r]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export function cutSetsCsv(results: Results): string {
  const rows = [HEADER.join(',')];
  for (const top of results.tops) {
    top.cut_sets.forEach((c, i) => {
      const numbers = [String(i + 1), String(c.events.length), c.probability.toExponential(6), c.share.toExponential(6)].map(csvCell);
      rows.push([csvTextCell(top.id), ...numbers, csvTextCell(c.events.join(' '))].join(','));
    });
  }
  return rows.join('\n') + '\n';
}
