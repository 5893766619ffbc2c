import type { D3Selection } from 'd3-node';

/**
 * A blank SVG drawing surface and its serialisation.
 *
 * Every figure of the appendix is drawn through here, so they share the conventions both outputs
 * need: sizes in points with a matching viewBox (1 unit = 1 pt), the embedded Roboto font, and
 * presentation attributes only (the PDF's SVG converter ignores CSS).
 *
 * The drawing is a plain element tree with d3's chainable `append`/`attr`/`text` (the part of a
 * d3 selection the figures use), written out by `serialize` with text and attribute values
 * escaped. It replaced a server-side DOM (d3-node): building that DOM cost about a millisecond an
 * element, which made a large study's diagrams take minutes, and its HTML serialiser could not
 * produce XML.
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

/** One element of a drawing. */
class SvgElement implements D3Selection {
  readonly attributes: [string, string][] = [];
  children: (SvgElement | string)[] = [];
  parent: SvgElement | null = null;

  constructor(readonly name: string) {}

  append(name: string): SvgElement {
    const child = new SvgElement(name);
    child.parent = this;
    this.children.push(child);
    return child;
  }

  attr(name: string, value: string | number): SvgElement {
    const text = String(value);
    const at = this.attributes.findIndex((a) => a[0] === name);
    if (at >= 0) this.attributes[at]![1] = text;
    else this.attributes.push([name, text]);
    return this;
  }

  text(value: string): SvgElement {
    this.children = [String(value)];
    return this;
  }

  remove(): SvgElement {
    if (this.parent) this.parent.children = this.parent.children.filter((c) => c !== this);
    this.parent = null;
    return this;
  }

  node(): { outerHTML: string } {
    return { outerHTML: write(this) };
  }
}

export function createCanvas(width: number, height: number, label: string): Canvas {
  const w = round(width);
  const h = round(height);
  const svg = new SvgElement('svg')
    .attr('xmlns', 'http://www.w3.org/2000/svg')
    .attr('width', `${w}pt`)
    .attr('height', `${h}pt`)
    .attr('viewBox', `0 0 ${w} ${h}`)
    .attr('font-family', FONT_FAMILY)
    .attr('role', 'img')
    .attr('aria-label', label);
  svg.append('title').text(label);
  return { svg, width: w, height: h };
}

/**
 * The SVG text, well-formed XML and valid inline HTML alike: every element written out with its
 * text escaped as text and its attribute values as attribute values, so no title can be read as
 * markup (a title with `mode="automatic standby"` wrapped over two lines once broke the old
 * pattern-based fix-up of the DOM's HTML). Characters XML 1.0 forbids become U+FFFD. A canvas is
 * serialised once.
 */
export function serialize(canvas: Canvas): string {
  const root = canvas.svg;
  if (!(root instanceof SvgElement)) throw new Error('not a canvas of ours');
  if (serialised.has(root)) throw new Error('canvas was already serialised');
  serialised.add(root);
  return write(root);
}

const serialised = new WeakSet<SvgElement>();

/** The element and everything under it as text; an explicit stack, so no depth is too deep. */
function write(element: SvgElement): string {
  const out: string[] = [];
  const stack: (SvgElement | { raw: string })[] = [element];
  while (stack.length > 0) {
    const item = stack.pop()!;
    if (!(item instanceof SvgElement)) {
      out.push(item.raw);
      continue;
    }
    let open = `<${item.name}`;
    for (const [name, value] of item.attributes) open += ` ${name}="${escapeAttribute(value)}"`;
    out.push(`${open}>`);
    stack.push({ raw: `</${item.name}>` });
    for (let i = item.children.length - 1; i >= 0; i--) {
      const c = item.children[i]!;
      stack.push(typeof c === 'string' ? { raw: escapeText(c) } : c);
    }
  }
  return out.join('');
}

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
