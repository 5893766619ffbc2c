import { D3Node, type D3Selection } from 'd3-node';

/**
 * A blank SVG drawing surface (d3-node: d3 on a server-side DOM) and its serialisation.
 *
 * Every figure of the appendix is drawn through here, so they share the conventions both outputs
 * need: sizes in points with a matching viewBox (1 unit = 1 pt), the embedded Roboto font, and
 * presentation attributes only (the PDF's SVG converter ignores CSS).
 */
export const FONT_FAMILY = 'Roboto, Helvetica, Arial, sans-serif';

export const INK = '#1b1f24';
export const MUTED = '#4a525c';
export const RULE = '#9aa3ad';
export const FILL_GATE = '#e8edf3';
export const FILL_TOP = '#f2f4f7';
export const ACCENT = '#2b4c7e';

export interface Canvas {
  svg: D3Selection;
  width: number;
  height: number;
}

/**
 * One server-side DOM for every drawing: building a DOM costs more than drawing a small figure,
 * and each drawing is detached from it as soon as it is serialised, so drawings never meet.
 */
let shared: D3Node | undefined;

export function createCanvas(width: number, height: number, label: string): Canvas {
  const w = round(width);
  const h = round(height);
  shared ??= new D3Node();
  const svg = shared.createSVG(undefined, undefined, {
    width: `${w}pt`,
    height: `${h}pt`,
    viewBox: `0 0 ${w} ${h}`,
    'font-family': FONT_FAMILY,
    role: 'img',
    'aria-label': label,
  });
  svg.append('title').text(label);
  return { svg, width: w, height: h };
}

/**
 * The SVG text, well-formed XML and valid inline HTML alike: the drawing's DOM is written out
 * here node by node, text escaped as text and attribute values as attribute values. (The DOM's own
 * HTML serialiser leaves `<` raw in attributes and writes entities XML does not define, and no
 * pattern over its output can tell markup from text a title happens to contain.) Characters XML
 * 1.0 forbids become U+FFFD. Serialising detaches the drawing from the shared DOM.
 */
export function serialize(canvas: Canvas): string {
  const element = canvas.svg.node();
  if (!element) throw new Error('canvas was already serialised');
  const out: string[] = [];
  // An explicit stack: a drawing is shallow, but nothing here should depend on that.
  const stack: (DomNode | string)[] = [element as unknown as DomNode];
  while (stack.length > 0) {
    const item = stack.pop()!;
    if (typeof item === 'string') {
      out.push(item);
      continue;
    }
    if (item.nodeType === TEXT_NODE) {
      out.push(escapeText(item.nodeValue ?? ''));
      continue;
    }
    if (item.nodeType !== ELEMENT_NODE) continue;
    const name = item.localName;
    let open = `<${name}`;
    for (const a of Array.from(item.attributes)) open += ` ${a.name}="${escapeAttribute(a.value)}"`;
    out.push(`${open}>`);
    stack.push(`</${name}>`);
    const children = Array.from(item.childNodes);
    for (let i = children.length - 1; i >= 0; i--) stack.push(children[i]!);
  }
  canvas.svg.remove();
  return out.join('');
}

/** The part of a DOM node the serialiser reads. */
interface DomNode {
  nodeType: number;
  nodeValue: string | null;
  localName: string;
  attributes: ArrayLike<{ name: string; value: string }>;
  childNodes: ArrayLike<DomNode>;
}

const ELEMENT_NODE = 1;
const TEXT_NODE = 3;

// XML 1.0 Char production: tab, newline, carriage return and U+0020 up, less surrogates (lone
// ones) and U+FFFE/U+FFFF.
const NOT_XML = /[^\t\n\r\u0020-\uD7FF\uE000-\uFFFD\u{10000}-\u{10FFFF}]/gu;

export function escapeText(s: string): string {
  return s.replace(NOT_XML, '\uFFFD').replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');
}

export function escapeAttribute(s: string): string {
  return escapeText(s).replace(/"/g, '&quot;');
}

export function round(x: number): number {
  return Math.round(x * 100) / 100;
}

/** Append a text element; the string is set as text content, so it is escaped, never parsed. */
export function text(
  parent: D3Selection,
  x: number,
  y: number,
  content: string,
  size: number,
  opts: { anchor?: 'start' | 'middle' | 'end'; weight?: 'medium'; italic?: boolean; fill?: string } = {},
): D3Selection {
  const t = parent
    .append('text')
    .attr('x', round(x))
    .attr('y', round(y))
    .attr('font-size', size)
    .attr('text-anchor', opts.anchor ?? 'middle')
    .attr('fill', opts.fill ?? INK);
  // Roboto Medium is the embedded "bold" face; font-weight 500 would miss it in the PDF converter.
  if (opts.weight === 'medium') t.attr('font-weight', 'bold');
  if (opts.italic) t.attr('font-style', 'italic');
  return t.text(content);
}
