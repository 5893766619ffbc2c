/**
 * XML text → a small element tree in which every element knows where it was written, so an import
 * error can point at line and column as the YAML reader does. The streaming parser (saxes) checks
 * well-formedness and gives positions; the tree keeps only what an MEF reader needs: names,
 * attributes, child elements and the text of leaf elements (labels).
 *
 * Entity declarations (a DOCTYPE with an internal subset) are refused: the standard's own way to
 * split a model is `include`, and external entities would make the import read files it was not
 * given.
 */
import { SaxesParser } from 'saxes';
import { StudyError } from '../study/errors.js';
import type { Pos } from '../study/types.js';

export interface XmlElement {
  name: string;
  attributes: Record<string, string>;
  children: XmlElement[];
  /** Character data directly inside the element (labels), whitespace kept as written. */
  text: string;
  at: Pos;
}

/**
 * The document's bytes as text: UTF-8 (with or without a byte-order mark) or UTF-16 with its mark,
 * the encodings fault_tree_layer.rst "Use Portable Identifiers" asks tools to read.
 */
export function decodeXml(bytes: Buffer): string {
  if (bytes[0] === 0xff && bytes[1] === 0xfe) return bytes.subarray(2).toString('utf16le');
  if (bytes[0] === 0xfe && bytes[1] === 0xff) {
    const swapped = Buffer.from(bytes.subarray(2));
    swapped.swap16();
    return swapped.toString('utf16le');
  }
  const text = bytes.toString('utf8');
  return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
}

/** Elements nested deeper than this are refused: no MEF model needs it, and the readers recurse. */
export const MAX_XML_DEPTH = 256;

export function parseXml(file: string, text: string): XmlElement {
  const parser = new SaxesParser({ position: true });
  const stack: XmlElement[] = [];
  let root: XmlElement | undefined;
  let failure: StudyError | undefined;
  // saxes counts columns from 0 at the character it will read next, so its column is the 1-based
  // column of the character it has just read: where a problem is found.
  const here = (): Pos => ({ file, line: parser.line, col: Math.max(1, parser.column) });

  parser.on('doctype', (doctype) => {
    if (doctype.includes('[')) {
      failure ??= new StudyError('the document declares entities in its DOCTYPE', here(), 'a single self-contained MEF file (no entity declarations)');
    }
  });
  parser.on('opentagstart', (tag) => {
    // The parser has read `<name` and the character that ended the name; the element starts at its `<`.
    const col = Math.max(1, parser.column - tag.name.length - 1);
    const element: XmlElement = { name: tag.name, attributes: {}, children: [], text: '', at: { file, line: parser.line, col } };
    if (stack.length >= MAX_XML_DEPTH) {
      failure ??= new StudyError(`elements are nested more than ${MAX_XML_DEPTH} deep`, element.at, `at most ${MAX_XML_DEPTH} levels (name the inner formulae as gates)`);
    }
    const parent = stack[stack.length - 1];
    if (parent) parent.children.push(element);
    else root = element;
    stack.push(element);
  });
  parser.on('attribute', (attr) => {
    const element = stack[stack.length - 1];
    // fault_tree_layer.rst "Use Portable Identifiers": tools should ignore whitespace around names.
    if (element) element.attributes[attr.name] = attr.name === 'name' ? attr.value.trim() : attr.value;
  });
  parser.on('text', (t) => {
    const element = stack[stack.length - 1];
    if (element) element.text += t;
  });
  parser.on('cdata', (t) => {
    const element = stack[stack.length - 1];
    if (element) element.text += t;
  });
  parser.on('closetag', () => {
    stack.pop();
  });
  parser.on('error', (err) => {
    // saxes prefixes messages with "line:col: "; the position goes into the StudyError instead.
    failure ??= new StudyError(`not well-formed XML: ${err.message.replace(/^[^:]*:\d+:\d+: /, '')}`, here(), 'a well-formed XML document');
  });
  try {
    parser.write(text).close();
  } catch (err) {
    if (!failure) throw err;
  }
  if (failure) throw failure;
  if (!root) throw new StudyError('the document has no root element', { file, line: 1, col: 1 }, 'an <opsa-mef> root element');
  return root;
}
