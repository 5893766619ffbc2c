/**
 * A small element tree → XML text, through fast-xml-parser's builder (which escapes text and
 * attribute values), indented two spaces, with the XML declaration. Same tree, same bytes.
 */
import { XMLBuilder } from 'fast-xml-parser';

export interface XmlNode {
  name: string;
  /** Attributes in the order they are written. */
  attributes?: Record<string, string>;
  children?: XmlNode[];
  /** Text content (labels); an element has either text or children. */
  text?: string;
}

/** fast-xml-parser's order-preserving form: `{ name: [children], ':@': attributes }`. */
type Ordered = Record<string, unknown>;

function toOrdered(node: XmlNode): Ordered {
  const body: Ordered[] = node.text !== undefined ? [{ '#text': node.text }] : (node.children ?? []).map(toOrdered);
  const out: Ordered = { [node.name]: body };
  if (node.attributes && Object.keys(node.attributes).length) out[':@'] = { ...node.attributes };
  return out;
}

export function writeXml(root: XmlNode): string {
  const builder = new XMLBuilder({
    preserveOrder: true,
    ignoreAttributes: false,
    attributeNamePrefix: '',
    format: true,
    indentBy: '  ',
    suppressEmptyNode: true,
  });
  const declaration: Ordered = { '?xml': [{ '#text': '' }], ':@': { version: '1.0', encoding: 'UTF-8' } };
  const text = builder.build([declaration, toOrdered(root)]) as string;
  return text.endsWith('\n') ? text : `${text}\n`;
}
