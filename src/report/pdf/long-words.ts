/**
 * Break opportunities in very long words, for the PDF. pdfmake lays out a word longer than the
 * line by trying it piece by piece, which for a 20,000-character word took minutes and gigabytes;
 * a zero-width space (U+200B, a break opportunity in Unicode line breaking, UAX #14) every
 * BREAK_EVERY characters of such a word lets it wrap like text. Words up to LONG_WORD characters
 * (every identifier, number and ordinary address) are left exactly as they are.
 */

export const LONG_WORD = 60;
const BREAK_EVERY = 30;
const ZWSP = '\u200b';
const LONG_RUN = new RegExp(`[^\\s${ZWSP}]{${LONG_WORD + 1},}`, 'g');

export function breakLongWords(text: string): string {
  if (text.length <= LONG_WORD) return text;
  return text.replace(LONG_RUN, (word) => {
    const chars = Array.from(word);
    const parts: string[] = [];
    for (let i = 0; i < chars.length; i += BREAK_EVERY) parts.push(chars.slice(i, i + BREAK_EVERY).join(''));
    return parts.join(ZWSP);
  });
}

/** Keys whose values pdfmake lays out as text (a string, or a list of strings and nodes). */
const CONTENT_KEYS = new Set(['content', 'text', 'stack', 'ul', 'ol', 'columns', 'body', 'table']);

/** The same document content with breakLongWords applied to every text it lays out (in place). */
export function breakLongWordsIn<T>(node: T): T {
  walk(node as unknown, true);
  return node;
}

function walk(node: unknown, isText: boolean): unknown {
  if (typeof node === 'string') return isText ? breakLongWords(node) : node;
  if (Array.isArray(node)) {
    for (let i = 0; i < node.length; i++) node[i] = walk(node[i], isText);
    return node;
  }
  if (node && typeof node === 'object') {
    const obj = node as Record<string, unknown>;
    for (const key of Object.keys(obj)) if (CONTENT_KEYS.has(key)) obj[key] = walk(obj[key], true);
  }
  return node;
}

