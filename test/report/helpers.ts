import type { Appendix, Block, FigureBlock, TableBlock } from '../../src/report/view.js';

/** Every block of the appendix, in order. */
export function allBlocks(view: Appendix): Block[] {
  return view.sections.flatMap((s) => s.blocks);
}

export function figures(view: Appendix): FigureBlock[] {
  return allBlocks(view).filter((b): b is FigureBlock => b.kind === 'figure');
}

export function tables(view: Appendix): TableBlock[] {
  return allBlocks(view).filter((b): b is TableBlock => b.kind === 'table');
}

export function section(view: Appendix, id: string) {
  return view.sections.find((s) => s.id === id);
}

/** All the text a reader sees in the view model, for "does it say X" checks. */
export function viewText(view: Appendix): string {
  const parts: string[] = [view.cover.title, view.cover.facility];
  for (const s of view.sections) {
    parts.push(s.title);
    for (const b of s.blocks) {
      switch (b.kind) {
        case 'markdown':
          parts.push(b.source);
          break;
        case 'text':
          parts.push(b.runs.map((r) => r.text).join(''));
          break;
        case 'subheading':
          parts.push(b.text);
          break;
        case 'table':
          parts.push(b.caption, ...b.columns.map((c) => c.label), ...b.rows.flatMap((r) => r.cells), b.note ?? '');
          break;
        case 'figure':
          parts.push(b.caption, b.note ?? '');
          break;
        case 'callout':
          parts.push(b.title, ...b.paragraphs.map((p) => p.map((r) => r.text).join('')));
          break;
        case 'keyvalue':
          parts.push(...b.items.flatMap((i) => [i.key, i.value]));
          break;
        case 'pre':
          parts.push(b.label, b.detail ?? '', ...b.lines);
          break;
      }
    }
  }
  return parts.join('\n');
}

/** Attributes `name="value"` of every element of an SVG string that has `data-node`. */
export function svgNodes(svg: string): { node: string; kind: string; target?: string }[] {
  const out: { node: string; kind: string; target?: string }[] = [];
  for (const m of svg.matchAll(/<g\b([^>]*)>/g)) {
    const attrs = m[1]!;
    const node = /data-node="([^"]*)"/.exec(attrs)?.[1];
    const kind = /data-kind="([^"]*)"/.exec(attrs)?.[1];
    if (node === undefined || kind === undefined) continue;
    const target = /data-target="([^"]*)"/.exec(attrs)?.[1];
    out.push({ node, kind, ...(target ? { target } : {}) });
  }
  return out;
}

export { CHROMIUM, PDFTOTEXT } from '../tools.js';
