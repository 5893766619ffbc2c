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
 * The SVG text, well-formed XML as well as HTML. The DOM's HTML serialiser leaves `<` and `>` raw
 * inside attribute values (legal in HTML, not in XML, and the PDF's SVG reader is an XML parser),
 * and writes `&nbsp;`, which XML does not define; both are made numeric or escaped here. Text
 * content is already escaped by the serialiser, so the attribute pass cannot touch it.
 * Serialising detaches the drawing from the shared DOM.
 */
export function serialize(canvas: Canvas): string {
  const element = canvas.svg.node();
  if (!element) throw new Error('canvas was already serialised');
  const markup = element.outerHTML;
  canvas.svg.remove();
  return markup
    .replace(/="([^"]*)"/g, (_m, value: string) => `="${value.replace(/</g, '&lt;').replace(/>/g, '&gt;')}"`)
    .replace(/&nbsp;/g, '&#160;');
}

/**
 * The same drawing seen through a window: a new root tag with another viewBox and size. Used to
 * slice a figure too wide for a page into parts that each print at full size.
 */
export function windowed(svg: string, x: number, width: number, height: number): string {
  const w = round(width);
  const h = round(height);
  return svg.replace(/^<svg\b[^>]*>/, (tag) =>
    tag
      .replace(/\bwidth="[^"]*"/, `width="${w}pt"`)
      .replace(/\bheight="[^"]*"/, `height="${h}pt"`)
      .replace(/\bviewBox="[^"]*"/, `viewBox="${round(x)} 0 ${w} ${h}"`),
  );
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
