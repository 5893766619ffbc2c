import { para } from '../blocks.js';
import type { SectionRule } from '../context.js';
import type { Block } from '../view.js';

/** The inputs annex: every study file verbatim, so the appendix stands on its own. */
export const annex: SectionRule = (_results, ctx) => {
  if (ctx.inputs.length === 0) return null;
  const files = [...ctx.inputs].sort((a, b) => (a.path < b.path ? -1 : a.path > b.path ? 1 : 0));
  const blocks: Block[] = [
    para('The study files exactly as read, with line numbers (the positions quoted in warnings and in the provenance register refer to them).'),
    ...files.map(
      (f): Block => ({
        kind: 'pre',
        label: f.path,
        detail: `SHA-256 ${f.sha256}`,
        lines: f.text.replace(/\r\n?/g, '\n').replace(/\n$/, '').split('\n'),
      }),
    ),
  ];
  return { id: 'sec-inputs', number: ctx.number, title: 'Annex: study inputs', blocks };
};
