/**
 * Tagged PDF structure for the appendix, so that screen readers can follow headings and tables.
 *
 * pdfmake 0.3 passes `tagged: true` to its PDF library (pdfkit), which then writes MarkInfo and an
 * empty structure tree, but pdfmake draws every text line without marked content, so the tree
 * would stay empty. Two small pieces close that gap without touching how the appendix is laid out:
 *
 * 1. `markStructure(definition)` walks the finished document definition and gives nodes a
 *    structure role by what they are: heading styles (H1–H4), data tables (Table/TR/TH/TD),
 *    diagrams (Figure, with the caption as alternative text), text (P); header, footer, rules and
 *    table lines are artifacts (page furniture a reader skips).
 * 2. `installTagging()` wraps four methods of pdfmake's layout and rendering classes: while a node
 *    is laid out its role is stamped on the lines and drawings it produces, and when a page is
 *    drawn each stamped item is wrapped in marked content (BDC/EMC with an MCID) and added to its
 *    structure element, made in reading order through pdfkit's own structure API. Table header
 *    rows that pdfmake repeats on later pages are artifacts (read once, where they belong).
 *
 * The wrapped methods belong to pdfmake 0.3.11 (an exact version in package.json); tests read the
 * structure back with poppler's `pdfinfo -struct-text`, so a pdfmake upgrade that changes them fails
 * a test rather than silently dropping the tags. Links are not tagged as Link elements (PDF/UA
 * asks for that; this does not claim PDF/UA).
 */
import { createRequire } from 'node:module';

/** A structure role; the same object for every node that belongs to one structure element. */
export interface StructRole {
  type: string;
  parent?: StructRole;
  alt?: string;
  /** Table header cells: scope for the reader. */
  scope?: 'Column' | 'Row';
}

/** Page furniture: headers, footers, rules, table lines, repeated table headers, the watermark. */
export const ARTIFACT: StructRole = { type: 'Artifact' };

/** Roles whose content is text directly; any other role groups elements and gets a P per text node. */
const CONTENT_ROLES = new Set(['H1', 'H2', 'H3', 'H4', 'P', 'TH', 'TD', 'Caption', 'Code']);

const HEADINGS: Record<string, string> = { coverTitle: 'H1', h2: 'H2', h3: 'H3', mdHeading: 'H4', tocTitle: 'H2' };

type Node = Record<string, unknown> & { _struct?: StructRole };

function styles(node: Node): string[] {
  const s = node.style;
  return typeof s === 'string' ? [s] : Array.isArray(s) ? s.filter((x): x is string => typeof x === 'string') : [];
}

/** The text of a node (for alternative text), flattened. */
function plainText(node: unknown): string {
  if (typeof node === 'string') return node;
  if (Array.isArray(node)) return node.map(plainText).join('');
  if (node && typeof node === 'object' && 'text' in node) return plainText((node as Node).text);
  return '';
}

/**
 * Give every node of the definition its structure role (in place). `document` is the role of the
 * whole content; header and footer become artifacts.
 */
export function markStructure(definition: { content: unknown; header?: unknown; footer?: unknown }): void {
  const document: StructRole = { type: 'Document' };
  definition.content = walkList(definition.content, document);
  for (const key of ['header', 'footer'] as const) {
    const make = definition[key];
    if (typeof make === 'function') {
      definition[key] = (...args: unknown[]) => ({ stack: [(make as (...a: unknown[]) => unknown)(...args)], _struct: ARTIFACT });
    }
  }
}

function walkList(list: unknown, parent: StructRole): unknown {
  if (!Array.isArray(list)) return walk(list, parent);
  return list.map((item, i) => {
    const node = walk(item, parent);
    // A diagram takes the caption that follows it in the same stack as its alternative text.
    if (node && typeof node === 'object' && (node as Node).svg !== undefined) {
      const role = (node as Node)._struct;
      const caption = list.slice(i + 1).find((n) => n && typeof n === 'object' && styles(n as Node).includes('caption'));
      if (role && caption) role.alt = plainText(caption).trim();
    }
    return node;
  });
}

function walk(item: unknown, parent: StructRole): unknown {
  if (item === null || item === undefined) return item;
  if (typeof item === 'string' || typeof item === 'number') {
    return { text: String(item), _struct: CONTENT_ROLES.has(parent.type) ? parent : { type: 'P', parent } };
  }
  if (Array.isArray(item)) return walkList(item, parent);
  if (typeof item !== 'object') return item;
  const node = item as Node;
  if (node._struct) return node;
  if (node.canvas !== undefined) {
    node._struct = ARTIFACT;
    return node;
  }
  if (node.svg !== undefined) {
    node._struct = { type: 'Figure', parent, alt: 'Diagram' };
    return node;
  }
  if (node.toc !== undefined) {
    const toc: StructRole = { type: 'TOC', parent };
    node._struct = toc;
    const t = node.toc as Node;
    if (t.title) t.title = walk(t.title, toc);
    return node;
  }
  if (node.table !== undefined) return walkTable(node, parent);
  if (node.stack !== undefined) {
    node.stack = walkList(node.stack, parent);
    return node;
  }
  if (node.columns !== undefined) {
    node.columns = walkList(node.columns, parent);
    return node;
  }
  if (node.ul !== undefined || node.ol !== undefined) {
    const list: StructRole = { type: 'L', parent };
    node._struct = list;
    const key = node.ul !== undefined ? 'ul' : 'ol';
    const items = node[key];
    if (Array.isArray(items)) node[key] = items.map((entry) => walk(entry, { type: 'LBody', parent: { type: 'LI', parent: list } }));
    return node;
  }
  if (node.text !== undefined) {
    const heading = styles(node).map((s) => HEADINGS[s]).find((h) => h !== undefined);
    if (heading) node._struct = { type: heading, parent };
    else if (styles(node).includes('caption')) node._struct = { type: 'Caption', parent };
    else node._struct = CONTENT_ROLES.has(parent.type) ? parent : { type: 'P', parent };
    return node;
  }
  return node;
}

/**
 * Data tables (the appendix's tables and key–value lists) become Table/TR/TH/TD; tables used only
 * to draw a box (callouts) or to number listing lines keep their cells' text as paragraphs.
 */
function walkTable(node: Node, parent: StructRole): Node {
  const table = node.table as Node & { body?: unknown[][]; headerRows?: number };
  const body = Array.isArray(table.body) ? table.body : [];
  const dataTable = node.layout === 'appendixTable' || node.layout === 'keyValue';
  if (!dataTable) {
    const box: StructRole = { type: 'Div', parent };
    node._struct = box;
    table.body = body.map((row) => (Array.isArray(row) ? row.map((cell) => walk(cell, box)) : row));
    return node;
  }
  const role: StructRole = { type: 'Table', parent };
  node._struct = role;
  const headerRows = typeof table.headerRows === 'number' ? table.headerRows : 0;
  table.body = body.map((row, r) => {
    if (!Array.isArray(row)) return row;
    const tr: StructRole = { type: 'TR', parent: role };
    return row.map((cell, c) => {
      const header = r < headerRows || (node.layout === 'keyValue' && c === 0);
      const cellRole: StructRole = header ? { type: 'TH', parent: tr, scope: r < headerRows ? 'Column' : 'Row' } : { type: 'TD', parent: tr };
      const walked = walk(cell, cellRole);
      if (walked && typeof walked === 'object' && !Array.isArray(walked)) {
        // A cell node is laid out as a node of its own: its role is the cell, its text the cell's content.
        const cellNode = walked as Node;
        if (cellNode.text !== undefined) cellNode._struct = cellRole;
        else if (!cellNode._struct) cellNode._struct = cellRole;
      }
      return walked;
    });
  });
  return node;
}

/* ------------------------------------------------------------------------------------------------
 * The hooks into pdfmake 0.3.11. Only the shapes used here are typed.
 */

interface StructElement {
  add(child: unknown): StructElement;
}
interface TaggedPdf {
  struct(type: string, options?: Record<string, unknown>): StructElement;
  addStructure(element: StructElement): void;
  markStructureContent(tag: string): unknown;
  markContent(tag: string, options?: Record<string, unknown>): void;
  endMarkedContent(): void;
  options: { tagged?: boolean };
  _faultbookTags?: StructureBuilder;
}
interface Stamped {
  _struct?: StructRole;
}
interface PageItem {
  type: string;
  item: Stamped;
}
type Method = (this: unknown, ...args: unknown[]) => unknown;
interface Prototype {
  [name: string]: unknown;
}

/** The structure elements made so far, one per role, attached to their parents in reading order. */
class StructureBuilder {
  private readonly elements = new Map<StructRole, StructElement>();

  constructor(private readonly doc: TaggedPdf) {}

  element(role: StructRole): StructElement {
    const made = this.elements.get(role);
    if (made) return made;
    const options: Record<string, unknown> = {};
    if (role.alt) options.alt = role.alt;
    if (role.scope) options.scope = role.scope;
    const element = this.doc.struct(role.type, options);
    this.elements.set(role, element);
    if (role.parent) this.element(role.parent).add(element);
    else this.doc.addStructure(element);
    return element;
  }

  /** The marked-content sequence still open: consecutive items of one element share it. */
  private open: { role: StructRole; element: StructElement; content: unknown } | undefined;

  /**
   * Draw with `draw` as content of `role`, or as an artifact. Lines of one element drawn one after
   * another stay in one marked-content sequence (pdfkit carries it over a page break with a new
   * MCID), so a paragraph is one piece of content, not one per line.
   */
  mark(role: StructRole | undefined, draw: () => void): void {
    if (!role || role === ARTIFACT) {
      this.close();
      this.doc.markContent('Artifact');
      draw();
      this.doc.endMarkedContent();
      return;
    }
    // Text straight under a grouping element (a line pdfmake generates, as in the contents) is a
    // paragraph of its own.
    const target = CONTENT_ROLES.has(role.type) || role.type === 'Figure' ? role : { type: 'P', parent: role };
    if (this.open?.role !== target) {
      this.close();
      const element = this.element(target);
      this.open = { role: target, element, content: this.doc.markStructureContent(target.type) };
    }
    draw();
  }

  /** End the open sequence and hand it to its element (after it, so every page it spans is known). */
  close(): void {
    if (!this.open) return;
    this.doc.endMarkedContent();
    this.open.element.add(this.open.content);
    this.open = undefined;
  }
}

let installed = false;
/** Roles of the nodes being laid out, innermost last. */
const laying: StructRole[] = [];
/** True while pdfmake copies repeated table headers onto a new page. */
let repeating = false;

function wrap(proto: Prototype, name: string, make: (original: Method) => Method): void {
  const original = proto[name];
  if (typeof original !== 'function') throw new Error(`pdfmake has no ${name} to tag (not the pdfmake 0.3.11 this was written for)`);
  proto[name] = make(original as Method);
}

/** Install the hooks once. Documents made without `tagged: true` are drawn exactly as before. */
export function installTagging(): void {
  if (installed) return;
  installed = true;
  const require = createRequire(import.meta.url);
  const pdfmakeDir = require.resolve('pdfmake');
  const load = (name: string) => (require(require.resolve(`./${name}.js`, { paths: [pdfmakeDir.replace(/[\\/]index\.js$/, '')] })) as { default: { prototype: Prototype } }).default.prototype;
  const layout = load('LayoutBuilder');
  const elementWriter = load('ElementWriter');
  const pageWriter = load('PageElementWriter');
  const renderer = load('Renderer');

  wrap(layout, 'processNode', (original) =>
    function (this: unknown, ...args: unknown[]) {
      const role = (args[0] as Stamped | undefined)?._struct;
      if (role) laying.push(role);
      try {
        return original.apply(this, args);
      } finally {
        if (role) laying.pop();
      }
    },
  );
  // Every item a node adds to a page carries the role of the node being laid out.
  for (const name of ['addLine', 'addVector', 'addSVG', 'addImage', 'addCanvas']) {
    wrap(elementWriter, name, (original) =>
      function (this: unknown, ...args: unknown[]) {
        const item = args[0] as Stamped | undefined;
        if (item && typeof item === 'object' && item._struct === undefined) item._struct = laying[laying.length - 1];
        return original.apply(this, args);
      },
    );
  }
  wrap(pageWriter, 'moveToNextPage', (original) =>
    function (this: unknown, ...args: unknown[]) {
      repeating = true;
      try {
        return original.apply(this, args);
      } finally {
        repeating = false;
      }
    },
  );
  wrap(elementWriter, 'addFragment', (original) =>
    function (this: unknown, ...args: unknown[]) {
      if (!repeating) return original.apply(this, args);
      const ctx = (this as { context(): { getCurrentPage(): { items: PageItem[] } | undefined } }).context();
      const page = ctx.getCurrentPage();
      const before = new Set(page?.items ?? []);
      const result = original.apply(this, args);
      for (const it of page?.items ?? []) if (!before.has(it)) it.item._struct = ARTIFACT;
      return result;
    },
  );

  wrap(renderer, 'renderPages', (original) =>
    function (this: unknown, ...args: unknown[]) {
      const doc = (this as { pdfDocument: TaggedPdf }).pdfDocument;
      if (!doc.options.tagged) return original.apply(this, args);
      const tags = new StructureBuilder(doc);
      doc._faultbookTags = tags;
      const result = original.apply(this, args);
      tags.close();
      return result;
    },
  );
  const drawing = (roleOf: (args: unknown[]) => StructRole | undefined) => (original: Method) =>
    function (this: unknown, ...args: unknown[]) {
      const tags = (this as { pdfDocument: TaggedPdf }).pdfDocument._faultbookTags;
      if (!tags) return original.apply(this, args);
      let result: unknown;
      tags.mark(roleOf(args), () => {
        result = original.apply(this, args);
      });
      return result;
    };
  wrap(renderer, 'renderLine', drawing((args) => (args[0] as Stamped)._struct));
  wrap(renderer, 'renderSVG', drawing((args) => (args[0] as Stamped)._struct));
  wrap(renderer, 'renderImage', drawing((args) => (args[0] as Stamped)._struct));
  // Lines, boxes and fills are page furniture, whatever node drew them.
  wrap(renderer, 'renderVector', drawing(() => ARTIFACT));
  wrap(renderer, 'renderWatermark', drawing(() => ARTIFACT));
  // Clipping and alignment save and restore the graphics state: no marked-content sequence may be
  // left open across them.
  for (const name of ['beginClip', 'endClip', 'beginVerticalAlignment', 'endVerticalAlignment']) {
    wrap(renderer, name, (original) =>
      function (this: unknown, ...args: unknown[]) {
        (this as { pdfDocument: TaggedPdf }).pdfDocument._faultbookTags?.close();
        return original.apply(this, args);
      },
    );
  }
}
