import type { Token } from 'markdown-it';
import type { Content } from 'pdfmake';
import { markdownRenderer } from '../html/markdown.js';

/**
 * Study Markdown → pdfmake content, from the same markdown-it parse the HTML uses (raw HTML off,
 * images off), so both outputs read the source the same way. Covers what a study's prose uses:
 * paragraphs, emphasis, inline code, links (text, then the address), lists, headings, quotes,
 * code blocks, rules and tables.
 */

type Inline = { text: string | Inline[]; bold?: boolean; italics?: boolean; style?: string; decoration?: 'lineThrough' };

const md = markdownRenderer();

/**
 * Lists nested deeper than this are printed at this depth (their items stay, the indent stops):
 * each pdfmake list level adds a listener per line, and a page is no wider past eight indents.
 */
export const MAX_LIST_DEPTH = 8;

export function markdownToPdf(source: string): Content[] {
  const tokens = md.parse(source, {});
  const [content] = blocks(tokens, 0, tokens.length, 0);
  return content;
}

/** Converts tokens[from, to) into block content; returns the content and the index reached. */
function blocks(tokens: Token[], from: number, to: number, depth: number): [Content[], number] {
  const out: Content[] = [];
  let i = from;
  while (i < to) {
    const t = tokens[i]!;
    switch (t.type) {
      case 'paragraph_open': {
        const inline = tokens[i + 1]!;
        out.push({ text: inlines(inline.children ?? []), style: 'body' } as Content);
        i = skipTo(tokens, i, 'paragraph_close') + 1;
        break;
      }
      case 'heading_open': {
        const inline = tokens[i + 1]!;
        out.push({ text: inlines(inline.children ?? []), style: 'mdHeading' } as Content);
        i = skipTo(tokens, i, 'heading_close') + 1;
        break;
      }
      case 'bullet_list_open':
      case 'ordered_list_open': {
        const close = matching(tokens, i);
        const items: Content[] = [];
        let j = i + 1;
        while (j < close) {
          const itemClose = matching(tokens, j);
          const [itemContent] = blocks(tokens, j + 1, itemClose, depth + 1);
          items.push(itemContent.length === 1 ? itemContent[0]! : ({ stack: itemContent } as Content));
          j = itemClose + 1;
        }
        const ordered = t.type === 'ordered_list_open';
        const start = Number(t.attrGet('start') ?? '1');
        if (depth >= MAX_LIST_DEPTH) out.push({ stack: items } as Content);
        else out.push((ordered ? { ol: items, start, style: 'list' } : { ul: items, style: 'list' }) as Content);
        i = close + 1;
        break;
      }
      case 'blockquote_open': {
        const close = matching(tokens, i);
        const [inner] = blocks(tokens, i + 1, close, depth + 1);
        out.push({ stack: inner, style: 'quote' } as Content);
        i = close + 1;
        break;
      }
      case 'fence':
      case 'code_block':
        out.push({ text: t.content.replace(/\n$/, ''), style: 'codeBlock', preserveLeadingSpaces: true } as Content);
        i += 1;
        break;
      case 'hr':
        out.push({ canvas: [{ type: 'line', x1: 0, y1: 4, x2: 200, y2: 4, lineWidth: 0.5, lineColor: '#9aa3ad' }], margin: [0, 2, 0, 6] } as Content);
        i += 1;
        break;
      case 'table_open': {
        const close = matching(tokens, i);
        out.push(table(tokens, i + 1, close));
        i = close + 1;
        break;
      }
      default:
        i += 1;
    }
  }
  return [out, i];
}

function table(tokens: Token[], from: number, to: number): Content {
  const body: Content[][] = [];
  let row: Content[] | null = null;
  let header = 0;
  let inHead = false;
  for (let i = from; i < to; i++) {
    const t = tokens[i]!;
    if (t.type === 'thead_open') inHead = true;
    if (t.type === 'thead_close') inHead = false;
    if (t.type === 'tr_open') row = [];
    if (t.type === 'tr_close' && row) {
      body.push(row);
      if (inHead) header += 1;
      row = null;
    }
    if ((t.type === 'th_open' || t.type === 'td_open') && row) {
      const inline = tokens[i + 1]!;
      const style = String(t.attrGet('style') ?? '');
      const alignment = style.includes('right') ? 'right' : style.includes('center') ? 'center' : 'left';
      row.push({ text: inlines(inline.children ?? []), style: t.type === 'th_open' ? 'tableHeader' : 'tableCell', alignment } as Content);
    }
  }
  const columns = body[0]?.length ?? 1;
  return {
    table: { headerRows: header, widths: Array.from({ length: columns }, () => '*'), body },
    layout: 'appendixTable',
    margin: [0, 2, 0, 8],
  } as Content;
}

/**
 * Styled pieces laid out per paragraph; past this the rest of the paragraph is one plain piece
 * (same words, no emphasis). pdfmake's layout slows sharply with tens of thousands of pieces in
 * one paragraph, and no honest paragraph has a thousand.
 */
export const MAX_INLINE_PIECES = 1000;

function inlines(children: Token[]): Inline[] {
  const out = styledInlines(children);
  if (out.length <= MAX_INLINE_PIECES) return out;
  const rest = out.splice(MAX_INLINE_PIECES - 1);
  out.push({ text: rest.map(plainText).join('') });
  return out;
}

function plainText(piece: Inline): string {
  return typeof piece.text === 'string' ? piece.text : piece.text.map(plainText).join('');
}

function styledInlines(children: Token[]): Inline[] {
  const out: Inline[] = [];
  let bold = 0;
  let italics = 0;
  let strike = 0;
  let href: string | null = null;
  const push = (text: string, extra: Partial<Inline> = {}) => {
    if (!text) return;
    out.push({
      text,
      ...(bold > 0 ? { bold: true } : {}),
      ...(italics > 0 ? { italics: true } : {}),
      ...(strike > 0 ? { decoration: 'lineThrough' as const } : {}),
      ...extra,
    });
  };
  for (const c of children) {
    switch (c.type) {
      case 'text':
        push(c.content);
        break;
      case 'softbreak':
        push(' ');
        break;
      case 'hardbreak':
        push('\n');
        break;
      case 'code_inline':
        push(c.content, { style: 'id' });
        break;
      case 'strong_open':
        bold += 1;
        break;
      case 'strong_close':
        bold -= 1;
        break;
      case 'em_open':
        italics += 1;
        break;
      case 'em_close':
        italics -= 1;
        break;
      case 's_open':
        strike += 1;
        break;
      case 's_close':
        strike -= 1;
        break;
      case 'link_open':
        href = c.attrGet('href') === null ? null : String(c.attrGet('href'));
        break;
      case 'link_close':
        // The address is printed, not linked: a PDF kept for decades should not depend on it resolving.
        if (href) push(` (${href})`, { style: 'muted' });
        href = null;
        break;
      default:
        // Anything else (e.g. raw HTML, shown as text because html is off) keeps its source text.
        push(c.content);
    }
  }
  return out;
}

function skipTo(tokens: Token[], from: number, type: string): number {
  let i = from;
  while (i < tokens.length && tokens[i]!.type !== type) i++;
  return i;
}

/** Index of the token closing the one at `open` (same level, nesting -1). */
function matching(tokens: Token[], open: number): number {
  const level = tokens[open]!.level;
  for (let i = open + 1; i < tokens.length; i++) {
    const t = tokens[i]!;
    if (t.nesting === -1 && t.level === level) return i;
  }
  return tokens.length - 1;
}
