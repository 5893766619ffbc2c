import { formatCount } from './format.js';
import type { Block, CalloutBlock, CalloutTone, KeyValueBlock, Run, TableBlock, TableColumn, TableRow, TextBlock } from './view.js';

/** Small constructors so the section rules read as what they say, not as object literals. */

export type Part = string | Run;

export function run(part: Part): Run {
  return typeof part === 'string' ? { text: part } : part;
}

export const code = (text: string): Run => ({ text, code: true });
export const strong = (text: string): Run => ({ text, strong: true });
export const em = (text: string): Run => ({ text, em: true });

/**
 * A pointer to another section by its slot name: `{}` in the text becomes its number ("see {}" →
 * "see C.21"); the whole run disappears when that section is absent, so write it to read well
 * either way.
 */
export const xref = (section: string, text: string, anchor?: string): Run => ({ text, ref: { section, ...(anchor ? { anchor } : {}) } });

export function para(...parts: Part[]): TextBlock {
  return { kind: 'text', runs: parts.map(run) };
}

export function callout(tone: CalloutTone, title: string, ...paragraphs: Part[][]): CalloutBlock {
  return { kind: 'callout', tone, title, paragraphs: paragraphs.map((p) => p.map(run)) };
}

export function keyValues(items: [string, string][] | KeyValueBlock['items']): KeyValueBlock {
  return {
    kind: 'keyvalue',
    items: items.map((it) => (Array.isArray(it) ? { key: it[0], value: it[1] } : it)),
  };
}

export function col(label: string, align: TableColumn['align'] = 'left', extra: Omit<TableColumn, 'label' | 'align'> = {}): TableColumn {
  return { label, align, ...extra };
}

export function table(fields: Omit<TableBlock, 'kind'>): TableBlock {
  return { kind: 'table', ...fields };
}

export function row(cells: string[], extra: Omit<TableRow, 'cells'> = {}): TableRow {
  return { cells, ...extra };
}

export function subheading(id: string, text: string): Block {
  return { kind: 'subheading', id, text };
}

/** A count with its noun agreeing: `1 source`, `3 sources`, `1 analysis`/`2 analyses` with the plural given. */
export function counted(n: number, singular: string, plural = `${singular}s`): string {
  return `${formatCount(n)} ${n === 1 ? singular : plural}`;
}

/** `a, b and c`. */
export function listWords(items: string[]): string {
  if (items.length <= 1) return items.join('');
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}
