import pdfmake from 'pdfmake';
import type { Content, CustomTableLayout, TableCell } from 'pdfmake';
import { FONT_FILES } from '../assets.js';
import { PAGES, contentBox, pdfPageSize } from '../paper.js';
import type { Appendix, Block, CalloutBlock, FigureBlock, KeyValueBlock, PreBlock, Run, Section, TableBlock } from '../view.js';
import { markdownToPdf } from './markdown.js';
import { breakLongWordsIn } from './long-words.js';
import { installTagging, markStructure } from './tagging.js';

/**
 * The appendix as PDF through pdfmake: embedded Roboto, a bookmark (outline) entry per section and
 * subheading, a contents page with page numbers, running header (title, revision, status) and
 * footer (page x of y), a diagonal watermark while the study is not issued, and metadata dated
 * from the study, never from the clock, so the same view gives the same bytes.
 *
 * pdfmake may read nothing but the four font files: every URL and every other local path is refused.
 */

type TDocumentDefinitions = Parameters<typeof pdfmake.createPdf>[0];

const INK = '#1b1f24';
const MUTED = '#4a525c';
const RULE = '#c9d0d8';
const ACCENT = '#2b4c7e';
const HEAD = '#eef1f5';
const ZEBRA = '#f8f9fb';
const FLAG = '#fff3df';
const TONE: Record<CalloutBlock['tone'], { edge: string; fill: string }> = {
  caution: { edge: '#2b4c7e', fill: '#f6f8fb' },
  warning: { edge: '#b36b00', fill: '#fff8ec' },
  bound: { edge: '#a11d21', fill: '#fdf0f0' },
};

export async function renderPdf(view: Appendix): Promise<Buffer> {
  prepare();
  const definition = breakLongWordsIn(documentDefinition(view));
  markStructure(definition as Parameters<typeof markStructure>[0]);
  const doc = pdfmake.createPdf(definition);
  return doc.getBuffer();
}

/**
 * Fonts by their installed paths (the SVG converter opens them itself, so they must be real files);
 * the local-file policy admits exactly those four files, and no URL is admitted at all.
 */
function prepare(): void {
  const allowed = new Set<string>(Object.values(FONT_FILES));
  pdfmake.setFonts({ Roboto: { ...FONT_FILES } });
  pdfmake.setUrlAccessPolicy(() => false);
  pdfmake.setLocalAccessPolicy((path) => allowed.has(path));
  pdfmake.addTableLayouts(LAYOUTS);
  installTagging();
}

/**
 * PDF/A-2b (ISO 19005-2, level B: the pages look the same in decades). pdfmake hands these to its
 * PDF library, which then writes the XMP metadata with the pdfaid part/conformance declaration and
 * an sRGB output intent whose ICC profile (sRGB2014, International Color Consortium) ships inside
 * that library, so it is embedded byte for byte the same every run. Fonts are embedded already
 * (Roboto subsets). `tagged` asks for MarkInfo and a structure tree; tagging.ts fills the tree
 * (headings, tables, figures), which pdfmake alone would leave empty.
 */
const ARCHIVAL = { version: '1.7', subset: 'PDF/A-2b', tagged: true, displayTitle: true } as const;

/**
 * The PDF library copies metadata strings into the XMP packet without XML escaping, so an `&` or
 * `<` in a title would make the packet ill-formed XML; such characters are written as their
 * full-width look-alikes in the metadata only (the pages show the text as written).
 */
function xmpSafe(text: string): string {
  return text.replace(/&/g, '\uff06').replace(/</g, '\uff1c').replace(/>/g, '\uff1e');
}

/** The study's date as a fixed instant (midnight UTC), so metadata never depends on the clock or zone. */
export function studyDate(iso: string): Date {
  const m = /^(\d{4})(?:-(\d{2}))?(?:-(\d{2}))?/.exec(iso);
  if (!m) return new Date(Date.UTC(1970, 0, 1));
  return new Date(Date.UTC(Number(m[1]), Number(m[2] ?? '1') - 1, Number(m[3] ?? '1')));
}

function documentDefinition(view: Appendix): TDocumentDefinitions {
  const page = PAGES[view.paper];
  const [left, top, right, bottom] = page.margins;
  const date = studyDate(view.meta.date);
  const statusText = view.header.status.toUpperCase();
  const content: Content[] = [cover(view)];
  // The contents follow the front matter: document control, then the key findings where present.
  const lastFront = view.sections.some((s) => s.id === 'sec-key-findings') ? 'sec-key-findings' : 'sec-title-block';
  let landscapeOpen = false;
  for (const section of view.sections) {
    content.push(sectionContent(section, view, landscapeOpen));
    landscapeOpen = endsLandscape(section);
    if (section.id === lastFront) content.push(contents(lastFront === 'sec-key-findings'));
  }
  return {
    pageSize: pdfPageSize(view.paper),
    pageMargins: [left, top, right, bottom],
    // No modDate: PDF/A wants every Info entry mirrored in the XMP metadata, and the PDF library
    // writes no xmp:ModifyDate. The creation date alone is the study's date.
    info: {
      title: xmpSafe(view.meta.title),
      author: xmpSafe(view.meta.author),
      subject: xmpSafe(view.meta.subject),
      keywords: xmpSafe(view.meta.keywords),
      creator: xmpSafe(view.meta.creator),
      producer: xmpSafe(view.meta.creator),
      creationDate: date,
    },
    language: view.language,
    compress: true,
    ...ARCHIVAL,
    ...(view.cover.draft
      ? { watermark: { text: statusText, color: '#a11d21', opacity: 0.07, bold: true, fontSize: 110 } }
      : {}),
    header: (currentPage: number, _pageCount: number, pageSize?: { width: number }) =>
      currentPage === 1
        ? ''
        : {
            margin: [left, 26, right, 0],
            stack: [
              {
                columns: [
                  { text: view.header.title, style: 'running', width: '*' },
                  { text: `Rev. ${view.header.revision} · ${statusText}`, style: 'running', alignment: 'right', width: 'auto' },
                ],
              },
              { canvas: [{ type: 'line', x1: 0, y1: 4, x2: (pageSize?.width ?? page.width) - left - right, y2: 4, lineWidth: 0.5, lineColor: RULE }] },
            ],
          },
    footer: (currentPage: number, pageCount: number) => ({
      margin: [left, 18, right, 0],
      columns: [
        { text: `${view.cover.facility} · ${view.cover.kind}`, style: 'running', width: '*' },
        { text: `Page ${currentPage} of ${pageCount}`, style: 'running', alignment: 'right', width: 'auto' },
      ],
    }),
    content,
    defaultStyle: { font: 'Roboto', fontSize: 8.2, lineHeight: 1.15, color: INK },
    styles: STYLES,
  };
}

const STYLES: TDocumentDefinitions['styles'] = {
  body: { margin: [0, 0, 0, 3] },
  coverFacility: { fontSize: 10, color: MUTED, characterSpacing: 1.2 },
  coverTitle: { fontSize: 22, bold: true, lineHeight: 1.15, margin: [0, 6, 0, 4] },
  coverKind: { fontSize: 12, color: ACCENT, margin: [0, 0, 0, 8] },
  coverMeta: { fontSize: 9.5, color: MUTED },
  h2: { fontSize: 12.5, bold: true, margin: [0, 8, 0, 1] },
  h3: { fontSize: 9.5, bold: true, margin: [0, 6, 0, 2] },
  mdHeading: { fontSize: 9.5, bold: true, margin: [0, 6, 0, 3] },
  tocTitle: { fontSize: 11, bold: true, margin: [0, 16, 0, 6] },
  tocNumber: { color: ACCENT, bold: true },
  caption: { fontSize: 8, color: MUTED, margin: [0, 3, 0, 2] },
  captionLabel: { bold: true, color: INK },
  note: { fontSize: 7.5, color: MUTED, margin: [0, 3, 0, 0] },
  tableHeader: { fontSize: 7, bold: true, fillColor: HEAD },
  tableCell: { fontSize: 7, lineHeight: 1.12 },
  id: { bold: true, color: '#263a5a' },
  muted: { color: MUTED },
  kvKey: { fontSize: 8, bold: true, color: MUTED, fillColor: ZEBRA },
  kvValue: { fontSize: 8 },
  calloutTitle: { bold: true, margin: [0, 0, 0, 3] },
  calloutText: { fontSize: 8, margin: [0, 0, 0, 3] },
  listingLabel: { fontSize: 8.5, bold: true, color: '#263a5a' },
  listingDetail: { fontSize: 7, color: MUTED },
  listing: { fontSize: 6.5, lineHeight: 1.0, preserveLeadingSpaces: true },
  lineNumber: { fontSize: 6.5, lineHeight: 1.0, color: '#9aa3ad', alignment: 'right' },
  codeBlock: { fontSize: 7.5, preserveLeadingSpaces: true, margin: [8, 2, 0, 6] },
  list: { margin: [0, 0, 0, 4] },
  quote: { margin: [12, 0, 0, 6], color: MUTED },
  running: { fontSize: 7.5, color: MUTED },
};

const LAYOUTS: Record<string, CustomTableLayout> = {
  appendixTable: {
    hLineWidth: (i, node) => (i === 0 || i === node.table.body.length ? 0.6 : i === (node.table.headerRows ?? 0) ? 0.9 : 0.4),
    vLineWidth: () => 0,
    hLineColor: (i, node) => (i === (node.table.headerRows ?? 0) ? '#8a949f' : RULE),
    paddingLeft: () => 4,
    paddingRight: () => 4,
    paddingTop: () => 1.3,
    paddingBottom: () => 1.3,
  },
  keyValue: {
    hLineWidth: () => 0.4,
    vLineWidth: () => 0,
    hLineColor: () => RULE,
    paddingLeft: () => 5,
    paddingRight: () => 5,
    paddingTop: () => 2,
    paddingBottom: () => 2,
  },
  listing: {
    hLineWidth: (i, node) => (i === 0 || i === node.table.body.length ? 0.5 : 0),
    vLineWidth: (i, node) => (i === 0 || i === (node.table.widths?.length ?? 0) ? 0.5 : 0),
    hLineColor: () => RULE,
    vLineColor: () => RULE,
    paddingLeft: (i) => (i === 0 ? 4 : 6),
    paddingRight: () => 4,
    paddingTop: () => 0.2,
    paddingBottom: () => 0.2,
  },
};

function cover(view: Appendix): Content {
  const width = contentBox(view.paper).width;
  const c = view.cover;
  return {
    stack: [
      { canvas: [{ type: 'rect', x: 0, y: 0, w: width, h: 4, color: ACCENT }] },
      ...(c.logo ? [{ image: `data:${c.logo.media_type};base64,${c.logo.base64}`, fit: [160, 48], margin: [0, 14, 0, 0] } as Content] : []),
      { text: c.facility.toUpperCase(), style: 'coverFacility', margin: [0, 18, 0, 0] },
      { text: c.title, style: 'coverTitle' },
      { text: c.kind, style: 'coverKind' },
      {
        text: [
          `Revision ${c.revision}     `,
          { text: c.status.toUpperCase(), bold: true, color: c.draft ? '#a11d21' : INK },
          `     ${c.date}`,
        ],
        style: 'coverMeta',
      },
      ...(c.client || c.consultant
        ? [
            {
              text: [c.client ? `Client: ${c.client}` : '', c.client && c.consultant ? '     ' : '', c.consultant ? `Consultant: ${c.consultant}` : ''].join(''),
              style: 'coverMeta',
              margin: [0, 3, 0, 0],
            } as Content,
          ]
        : []),
      { canvas: [{ type: 'line', x1: 0, y1: 10, x2: width, y2: 10, lineWidth: 0.5, lineColor: RULE }], margin: [0, 0, 0, 4] },
    ],
  };
}

function contents(newPage: boolean): Content {
  return {
    ...(newPage ? { pageBreak: 'before' } : {}),
    toc: {
      title: { text: 'Contents', style: 'tocTitle' },
      numberStyle: { color: MUTED },
    },
  } as Content;
}

/** A section whose last block is printed on a landscape page leaves the next one to turn back. */
function endsLandscape(section: Section): boolean {
  const last = section.blocks[section.blocks.length - 1];
  return last?.kind === 'figure' && last.landscape === true;
}

function sectionContent(section: Section, view: Appendix, afterLandscape = false): Content {
  const heading: Content = {
    text: section.number ? [{ text: `${section.number}   `, color: ACCENT }, section.title] : section.title,
    style: 'h2',
    id: section.id,
    outline: true,
    outlineText: section.number ? `${section.number} ${section.title}` : section.title,
    ...(section.number ? { tocItem: true } : {}),
  } as Content;
  const rule: Content = {
    canvas: [{ type: 'line', x1: 0, y1: 2, x2: contentBox(view.paper).width, y2: 2, lineWidth: 1.2, lineColor: ACCENT }],
    margin: [0, 0, 0, 6],
  };
  // A wide logic diagram takes a landscape page (consecutive ones share landscape pages); the
  // first block after it starts a new portrait page.
  const body = section.blocks.map((b, i) => {
    const content = blockContent(b, section, view);
    const landscape = b.kind === 'figure' && b.landscape === true;
    const previous = section.blocks[i - 1];
    const wasLandscape = previous?.kind === 'figure' && previous.landscape === true;
    if (landscape && !wasLandscape) return { stack: [content], pageBreak: 'before', pageOrientation: 'landscape' } as Content;
    if (!landscape && wasLandscape) return { stack: [content], pageBreak: 'before', pageOrientation: 'portrait' } as Content;
    return content;
  });
  return {
    stack: [{ stack: [heading, rule], unbreakable: true }, ...body],
    ...(section.newPage || afterLandscape ? { pageBreak: 'before', pageOrientation: 'portrait' } : {}),
  } as Content;
}

function blockContent(block: Block, section: Section, view: Appendix): Content {
  switch (block.kind) {
    case 'markdown':
      return { stack: markdownToPdf(block.source) };
    case 'text':
      return { text: runs(block.runs), style: 'body' };
    case 'subheading':
      return {
        text: block.text,
        style: 'h3',
        id: block.id,
        outline: true,
        outlineParentId: section.id,
      } as Content;
    case 'table':
      return tableContent(block);
    case 'figure':
      return figureContent(block, view);
    case 'callout':
      return calloutContent(block);
    case 'keyvalue':
      return keyValueContent(block);
    case 'pre':
      return preContent(block);
  }
}

function runs(list: Run[]): Content[] {
  return list.map((r) => ({
    text: r.text,
    ...(r.link ? { linkToDestination: r.link, color: ACCENT } : {}),
    ...(r.strong ? { bold: true } : {}),
    ...(r.em ? { italics: true } : {}),
    ...(r.code ? { style: 'id' } : {}),
  })) as Content[];
}

/** Identifiers longer than this may wrap inside (at a hyphen); shorter ones stay whole. */
const WHOLE_ID = 28;
/** Right-aligned values (numbers with units) up to this length are never wrapped. */
const SHORT_VALUE = 18;

/**
 * A cell of identifiers (`a, b`, `a · b`): each identifier kept on one line where it is short
 * enough, so an id is never split across lines (readers copy them, and so does text extraction);
 * lines break at the separators instead.
 */
function identifiers(text: string): Content[] {
  return text
    .split(/(, | · )/)
    .filter((piece) => piece !== '')
    .map((piece) => ({ text: piece, ...(piece.length <= WHOLE_ID && !/^(, | · )$/.test(piece) ? { noWrap: true } : {}) })) as Content[];
}

function caption(number: string, text: string): Content {
  return {
    text: [...(number ? [{ text: `${number}   `, style: 'captionLabel' }] : []), text],
    style: 'caption',
  } as Content;
}

function tableContent(block: TableBlock): Content {
  const header: TableCell[] = block.columns.map((c) => ({ text: c.label, style: 'tableHeader', alignment: c.align }));
  const body: TableCell[][] = [header];
  block.rows.forEach((r, index) => {
    const fill = r.flag ? FLAG : index % 2 === 1 ? ZEBRA : undefined;
    body.push(
      r.cells.map((text, i) => {
        const c = block.columns[i];
        // Columns sized to their content keep identifiers and short numbers whole; shared-width
        // columns must be free to wrap, or they would run off the page.
        const sized = c?.width === undefined || c.width === 'auto';
        return {
          text: c?.code && sized ? identifiers(text) : text,
          ...(sized && c?.align === 'right' && text.length <= SHORT_VALUE ? { noWrap: true } : {}),
          style: c?.code ? ['tableCell', 'id'] : 'tableCell',
          alignment: c?.align ?? 'left',
          ...(fill ? { fillColor: fill } : {}),
        } as TableCell;
      }),
    );
  });
  if (block.rows.length === 0) {
    body.push([
      { text: block.empty ?? 'No entries.', italics: true, color: MUTED, colSpan: block.columns.length, style: 'tableCell' },
      ...block.columns.slice(1).map(() => ({ text: '' })),
    ]);
  }
  const table: Content = {
    table: {
      headerRows: 1,
      // Never leave a header row alone at the foot of a page.
      keepWithHeaderRows: 1,
      dontBreakRows: true,
      widths: block.columns.map((c) => (c.width === undefined || c.width === 'auto' ? 'auto' : '*')),
      body,
    },
    layout: 'appendixTable',
  };
  return {
    stack: [
      caption(block.number, block.caption),
      table,
      ...(block.note ? [{ text: block.note, style: 'note' } as Content] : []),
    ],
    margin: [0, 2, 0, 5],
  };
}

function figureContent(block: FigureBlock, view: Appendix): Content {
  const box = contentBox(view.paper, block.landscape ? 'landscape' : 'portrait');
  const maxHeight = box.height - 60;
  const parts = block.parts.map((p, i) => {
    // Scale only when a drawing would not fit (layout arithmetic on its size); diagrams are sized to fit already.
    const scale = Math.min(1, box.width / p.width, maxHeight / p.height);
    const last = i === block.parts.length - 1;
    return {
      stack: [
        ...(block.parts.length > 1 ? [{ text: `Part ${i + 1} of ${block.parts.length}`, style: 'note' } as Content] : []),
        { svg: p.svg, width: p.width * scale, height: p.height * scale, alignment: 'center' } as Content,
        ...(last ? [caption(block.number, block.caption)] : []),
        ...(last && block.note ? [{ text: block.note, style: 'note' } as Content] : []),
      ],
      unbreakable: true,
      margin: [0, 2, 0, 5],
      ...(i > 0 ? { pageBreak: 'before' } : {}),
    } as Content;
  });
  return { stack: parts, id: block.id } as Content;
}

function calloutContent(block: CalloutBlock): Content {
  const tone = TONE[block.tone];
  // One row per paragraph, the title with the first: a long box splits between paragraphs
  // instead of moving whole to the next page and leaving the heading above it behind.
  const [first, ...rest] = block.paragraphs;
  const paragraph = (p: Run[]) => ({ text: runs(p), style: 'calloutText' }) as Content;
  const body = [
    [{ stack: [{ text: block.title, style: 'calloutTitle', color: tone.edge }, ...(first ? [paragraph(first)] : [])], fillColor: tone.fill }],
    ...rest.map((p) => [{ stack: [paragraph(p)], fillColor: tone.fill }]),
  ];
  const rows = body.length;
  const edge = block.tone === 'bound' ? 1.2 : 0.5;
  return {
    table: { widths: ['*'], body, dontBreakRows: true },
    layout: {
      // Lines only around the box, not between its paragraphs.
      hLineWidth: (i: number) => (i === 0 || i === rows ? edge : 0),
      vLineWidth: (i: number) => (i === 0 ? 4 : edge),
      hLineColor: () => (block.tone === 'bound' ? tone.edge : RULE),
      vLineColor: (i: number) => (i === 0 || block.tone === 'bound' ? tone.edge : RULE),
      paddingLeft: () => 10,
      paddingRight: () => 8,
      paddingTop: (i: number) => (i === 0 ? 6 : 0),
      paddingBottom: (i: number) => (i === rows - 1 ? 3 : 0),
    },
    margin: [0, 2, 0, 5],
  } as Content;
}

function keyValueContent(block: KeyValueBlock): Content {
  return {
    table: {
      widths: ['auto', '*'],
      dontBreakRows: true,
      body: block.items.map((it) => [
        { text: it.key, style: 'kvKey' },
        { text: it.code ? identifiers(it.value) : it.value, style: it.code ? ['kvValue', 'id'] : 'kvValue' },
      ]),
    },
    layout: 'keyValue',
    margin: [0, 2, 0, 5],
  } as Content;
}

/**
 * Listings whose lines mostly fit a half (third) of the page are set in two (three) columns:
 * life-record CSVs, and the YAML and Markdown inputs, whose long lines are mostly comments, prose
 * and descriptions. At 6.5 pt a half column holds about 64 characters, a third about 40. The longer
 * lines wrap inside their numbered row, so every line stays whole and is still found by its number.
 */
const COLUMN_CHARS: Record<number, number> = { 2: 64, 3: 40 };
/** At most this share of a listing's lines may wrap for it to be set in two columns (three: a tenth). */
const WRAPPED_SHARE: Record<number, number> = { 2: 0.5, 3: 0.1 };

/** Columns a listing is set in: the most whose width its lines fit (see COLUMN_CHARS). */
function listingColumns(lines: string[]): number {
  if (lines.length <= 24) return 1;
  for (const n of [3, 2]) {
    const wrapped = lines.filter((l) => l.length > COLUMN_CHARS[n]!).length;
    if (wrapped <= Math.max(3, WRAPPED_SHARE[n]! * lines.length)) return n;
  }
  return 1;
}

function preContent(block: PreBlock): Content {
  const width = String(block.lines.length).length * 4.5 + 6;
  const listing = (from: number, lines: string[]): Content => ({
    table: {
      widths: [width, '*'],
      dontBreakRows: true,
      body: lines.map((line, i) => [
        { text: String(from + i + 1), style: 'lineNumber' },
        // An empty string would collapse the row; a space keeps the blank line.
        { text: line === '' ? ' ' : line, style: 'listing' },
      ]),
    },
    layout: 'listing',
  });
  const label: Content = {
    columns: [
      { text: block.label, style: 'listingLabel', width: 'auto' },
      ...(block.detail ? [{ text: block.detail, style: 'listingDetail', alignment: 'right', width: '*' } as Content] : []),
    ],
    margin: [0, 6, 0, 2],
  };
  const columns = listingColumns(block.lines);
  if (columns === 1) return { stack: [label, listing(0, block.lines)] } as Content;
  // The file's name stays with its first lines.
  const [first, ...rest] = columnChunks(block.lines, columns, listing);
  return { stack: [{ stack: [label, first!], unbreakable: true }, ...rest] } as Content;
}

/** Lines per column of one chunk of a listing set in columns. */
const CHUNK_ROWS = 10;

/**
 * A listing in columns as short chunks read column by column (two columns: lines 1–10 | 11–20,
 * then 21–30 | 31–40 …), each chunk kept on one page: columns running over several pages would
 * put line 200 beside line 20. The last chunk shares its lines evenly between the columns.
 */
function columnChunks(lines: string[], columns: number, listing: (from: number, lines: string[]) => Content): Content[] {
  const chunks: Content[] = [];
  for (let start = 0; start < lines.length; start += columns * CHUNK_ROWS) {
    const count = Math.min(columns * CHUNK_ROWS, lines.length - start);
    const per = Math.ceil(count / columns);
    const parts: Content[] = [];
    for (let from = start; from < start + count; from += per) parts.push(listing(from, lines.slice(from, Math.min(from + per, start + count))));
    // Keep the column widths of a short last chunk the same as the others.
    while (parts.length < columns) parts.push({ text: '' });
    chunks.push({ columns: parts, columnGap: 8, unbreakable: true, margin: [0, 0, 0, 2] } as Content);
  }
  return chunks;
}
