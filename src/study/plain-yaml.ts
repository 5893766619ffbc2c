/**
 * A quick reader for the plain YAML that studies are written in: block mappings and sequences,
 * flow mappings and sequences, plain and simply quoted scalars, comments, LF or CRLF line ends.
 * It gives the same data and the same positions as the full parser (yaml.ts), about ten times
 * faster, and declines (returns undefined) on anything else: anchors, aliases, tags, block
 * scalars, multi-line plain scalars, escapes, tabs, empty values, duplicate keys, unusual keys,
 * document markers, a text over the limits — and on anything that could be an error. A declined
 * file goes through the full parser, so every message about a file stays the full parser's and
 * our checks'.
 *
 * Positions follow the full parser's ranges: a mapping starts at its first key, a block sequence at
 * its first '-', a flow collection at its bracket, a scalar at its first character (a quote for a
 * quoted one). test/study/plain-yaml.test.ts compares data and every position with the full
 * parser on generated and real study files.
 */
import type { Pos } from './types.js';

/**
 * What the reader keeps of each value to locate it: where it starts, where a scalar ends, where the
 * key that names it starts (-1 in a sequence), and its entries or items. One shape for all three
 * kinds keeps the look-ups monomorphic.
 */
interface Shadow {
  kind: 0 | 1 | 2; // scalar, mapping, sequence
  start: number;
  end: number;
  keyStart: number;
  entries: Map<string, Shadow> | undefined;
  items: Shadow[] | undefined;
}

function shadowOf(kind: 0 | 1 | 2, start: number, end: number, entries?: Map<string, Shadow>, items?: Shadow[]): Shadow {
  return { kind, start, end, keyStart: -1, entries, items };
}

export interface PlainYaml {
  data: Record<string, unknown>;
  /** Position of the value at `path` (or of its key), or of the nearest parent that exists. */
  at(path: readonly (string | number)[], wantKey: boolean): Pos;
  sourceAt(path: readonly (string | number)[]): string | undefined;
}

export interface PlainLimits {
  maxDepth: number;
  maxTextChars: number;
  maxExpandedChars: number;
}

/** Thrown inside the reader when the text leaves the plain subset; caught in readPlainYaml. */
class Decline {}
const DECLINE = new Decline();

/** Every core-schema pattern starts with one of these characters; other scalars are strings. */
const MAY_RESOLVE = /^[-+.0-9~nNtTfF]/;

/**
 * A plain scalar by the YAML 1.2 core schema (YAML 1.2.2 section 10.3.2; the patterns and their
 * order are the full parser's): null, bool, int (decimal, 0o octal, 0x hex), float (.inf, .nan,
 * exponent, decimal point); anything else is a string. Written here rather than taken from the
 * `yaml` package so a study of plain files never loads the full parser; test/study/plain-yaml.test.ts
 * holds the two to the same values.
 */
function resolvePlain(text: string): unknown {
  if (!MAY_RESOLVE.test(text)) return text;
  if (/^(?:~|[Nn]ull|NULL)?$/.test(text)) return null;
  if (/^(?:[Tt]rue|TRUE|[Ff]alse|FALSE)$/.test(text)) return text[0] === 't' || text[0] === 'T';
  if (/^0o[0-7]+$/.test(text)) return parseInt(text.substring(2), 8);
  if (/^[-+]?[0-9]+$/.test(text)) return parseInt(text, 10);
  if (/^0x[0-9a-fA-F]+$/.test(text)) return parseInt(text.substring(2), 16);
  if (/^(?:[-+]?\.(?:inf|Inf|INF)|\.nan|\.NaN|\.NAN)$/.test(text)) return text.slice(-3).toLowerCase() === 'nan' ? NaN : text[0] === '-' ? -Infinity : Infinity;
  if (/^[-+]?(?:\.[0-9]+|[0-9]+(?:\.[0-9]*)?)[eE][-+]?[0-9]+$/.test(text) || /^[-+]?(?:\.[0-9]+|[0-9]+\.[0-9]*)$/.test(text)) return parseFloat(text);
  return text;
}
/** Characters the reader leaves to the full parser: tabs, a CR not before LF, other controls, BOM, NEL, Unicode line breaks. */
const UNUSUAL_CHARACTER = /[\x00-\x09\x0b\x0c\x0e-\x1f\x7f-\x9f\u2028\u2029\ufeff]|\r(?!\n)/;
/** Directives, document markers. */
const DOCUMENT_MARKER = /^(?:---|\.\.\.|%)/m;
/** Keys as studies write them: ids, `owner.field`. Others go to the full parser. */
const KEY = /[A-Za-z0-9_][A-Za-z0-9_.\-]*/y;
const MAX_KEY_CHARS = 1000;
/** The run of characters a plain scalar may take before what ends or stops it (see Reader.plain). */
const BLOCK_PLAIN = /[^\r\n:#]*/y;
const FLOW_PLAIN = /[^\r\n:#,[\]{}]*/y;

export function readPlainYaml(file: string, text: string, limits: PlainLimits): PlainYaml | undefined {
  if (UNUSUAL_CHARACTER.test(text) || DOCUMENT_MARKER.test(text)) return undefined;
  let shadow: Shadow;
  let data: Record<string, unknown>;
  try {
    const reader = new Reader(text, limits);
    data = reader.document();
    shadow = reader.shadow;
  } catch (err) {
    if (err === DECLINE) return undefined;
    throw err;
  }
  let lineStarts: number[] | undefined;
  // Line and column (1-based, in UTF-16 units) as the full parser's LineCounter gives them.
  const posOf = (offset: number): Pos => {
    if (!lineStarts) {
      lineStarts = [0];
      for (let i = text.indexOf('\n'); i >= 0; i = text.indexOf('\n', i + 1)) lineStarts.push(i + 1);
    }
    let low = 0;
    let high = lineStarts.length - 1;
    while (low < high) {
      const mid = (low + high + 1) >> 1;
      if (lineStarts[mid]! <= offset) low = mid;
      else high = mid - 1;
    }
    return { file, line: low + 1, col: offset - lineStarts[low]! + 1 };
  };
  const at = (path: readonly (string | number)[], wantKey: boolean): Pos => {
    let node: Shadow = shadow;
    let best = node.start;
    for (const seg of path) {
      if (node.kind === 1) {
        const entry = node.entries!.get(String(seg));
        if (!entry) break;
        if (wantKey) best = entry.keyStart;
        node = entry;
        // The same test as the full parser's look-up (by value, not by index).
        if (!wantKey || seg !== path[path.length - 1]) best = node.start;
      } else if (node.kind === 2 && typeof seg === 'number') {
        const item: Shadow | undefined = node.items![seg];
        if (!item) break;
        node = item;
        best = node.start;
      } else {
        break;
      }
    }
    return posOf(best);
  };
  const sourceAt = (path: readonly (string | number)[]): string | undefined => {
    let node: Shadow | undefined = shadow;
    for (const seg of path) {
      if (node.kind === 1) node = node.entries!.get(String(seg));
      else if (node.kind === 2 && typeof seg === 'number') node = node.items![seg];
      else return undefined;
      if (!node) return undefined;
    }
    if (node.kind !== 0) return undefined;
    const raw = text.slice(node.start, node.end).trim();
    return /^["']/.test(raw) ? raw.slice(1, -1) : raw;
  };
  return { data, at, sourceAt };
}

/** A line break: LF, or the CR of a CRLF (a CR on its own is declined before reading). */
function isBreak(c: string | undefined): boolean {
  return c === '\n' || c === '\r';
}

class Reader {
  private i = 0;
  /** The shadow of the value the last read returned. */
  shadow: Shadow = shadowOf(0, 0, 0);
  /** Characters once expanded, counted as yaml.ts counts them (no aliases here, so once). */
  private size = 0;

  constructor(
    private readonly text: string,
    private readonly limits: PlainLimits,
  ) {}

  document(): Record<string, unknown> {
    const first = this.skipBlankLines(0);
    if (first < 0) throw DECLINE;
    const col = this.column(first);
    if (!this.startsKey(first)) throw DECLINE;
    const data = this.blockMap(col, first, 0);
    if (this.nextLine() >= 0) throw DECLINE;
    if (this.size > this.limits.maxExpandedChars) throw DECLINE;
    return data;
  }

  /** Column (0-based) of an offset: no tabs are allowed, so it is the distance from the line start. */
  private column(offset: number): number {
    return offset - (this.text.lastIndexOf('\n', offset - 1) + 1);
  }

  /**
   * Whether this.i already stands on the first content character of the next line (a nested block
   * ended there) or at the end; set by skipBlankLines, cleared by anything that reads content.
   */
  private ready = false;

  /** The offset of the next content line's first character (this.i set there), or -1 at the end. */
  private nextLine(): number {
    if (this.ready) return this.i < this.text.length ? this.i : -1;
    return this.nextContentLine();
  }

  /** From this.i, skips the rest of the current line (spaces and a comment only), then blank and comment lines. */
  private nextContentLine(): number {
    const t = this.text;
    let i = this.i;
    while (t[i] === ' ') i++;
    if (t[i] === '#') {
      if (i > 0 && t[i - 1] !== ' ' && t[i - 1] !== '\n') throw DECLINE;
      i = t.indexOf('\n', i);
      if (i < 0) i = t.length;
    }
    if (i < t.length && !isBreak(t[i])) throw DECLINE;
    return this.skipBlankLines(i + 1);
  }

  /** From a line start, skips blank and comment lines; returns the first content character's offset, or -1. */
  private skipBlankLines(from: number): number {
    const t = this.text;
    let i = from;
    this.ready = true;
    while (i < t.length) {
      while (t[i] === ' ') i++;
      const c = t[i];
      if (c === undefined) break;
      if (c === '#') {
        i = t.indexOf('\n', i);
        if (i < 0) break;
        i++;
        continue;
      }
      if (isBreak(c)) {
        i++;
        continue;
      }
      this.i = i;
      return i;
    }
    this.i = t.length;
    return -1;
  }

  /** Whether a key (`name:` then a space or the line's end) starts at `offset`. */
  private startsKey(offset: number): boolean {
    KEY.lastIndex = offset;
    if (!KEY.test(this.text)) return false;
    const end = KEY.lastIndex;
    const next = this.text[end + 1];
    return this.text[end] === ':' && (next === ' ' || next === undefined || isBreak(next));
  }

  private checkDepth(depth: number): void {
    if (depth >= this.limits.maxDepth) throw DECLINE;
  }

  /** A block mapping whose keys sit at column `col`, the first at `start` (this.i). */
  private blockMap(col: number, start: number, depth: number): Record<string, unknown> {
    this.checkDepth(depth);
    const t = this.text;
    const data: Record<string, unknown> = {};
    const entries = new Map<string, Shadow>();
    this.size += 1;
    for (;;) {
      const keyStart = this.i;
      this.ready = false;
      KEY.lastIndex = keyStart;
      if (!KEY.test(t)) throw DECLINE;
      const keyEnd = KEY.lastIndex;
      if (t[keyEnd] !== ':') throw DECLINE;
      const key = t.slice(keyStart, keyEnd);
      if (key.length > MAX_KEY_CHARS || key === '__proto__' || entries.has(key)) throw DECLINE;
      this.size += key.length + 1;
      this.i = keyEnd + 1;
      const after = t[this.i];
      let value: unknown;
      if (after === ' ') {
        while (t[this.i] === ' ') this.i++;
        const c = t[this.i];
        value = c === undefined || isBreak(c) || c === '#' ? this.blockValue(col, depth + 1) : this.inlineValue(col, depth + 1, false);
      } else if (after === undefined || isBreak(after)) {
        value = this.blockValue(col, depth + 1);
      } else {
        throw DECLINE;
      }
      data[key] = value;
      this.shadow.keyStart = keyStart;
      entries.set(key, this.shadow);
      const next = this.nextLine();
      if (next < 0) break;
      const nextCol = this.column(next);
      if (nextCol < col) break;
      if (nextCol > col) throw DECLINE;
      if (t[next] === '-' && (t[next + 1] === ' ' || isBreak(t[next + 1]))) break; // a sequence item at this column ends the mapping (its owner decides)
    }
    this.shadow = shadowOf(1, start, start, entries);
    return data;
  }

  /**
   * The value of `key:` with nothing after it on the line: a block mapping indented further, or a
   * block sequence indented further or at the key's column. Anything else (an empty value) declines.
   */
  private blockValue(parentCol: number, depth: number): unknown {
    const next = this.nextContentLine();
    if (next < 0) throw DECLINE;
    const col = this.column(next);
    const t = this.text;
    const dash = t[next] === '-' && (t[next + 1] === ' ' || isBreak(t[next + 1]));
    if (dash && col >= parentCol) return this.blockSeq(col, next, depth);
    if (col > parentCol && this.startsKey(next)) return this.blockMap(col, next, depth);
    throw DECLINE;
  }

  /** A block sequence whose dashes sit at column `col`, the first at `start` (this.i). */
  private blockSeq(col: number, start: number, depth: number): unknown[] {
    this.checkDepth(depth);
    const t = this.text;
    const data: unknown[] = [];
    const items: Shadow[] = [];
    this.size += 1;
    for (;;) {
      this.ready = false;
      if (t[this.i] !== '-' || t[this.i + 1] !== ' ') throw DECLINE;
      this.i += 1;
      while (t[this.i] === ' ') this.i++;
      const c = t[this.i];
      if (c === undefined || isBreak(c) || c === '#') throw DECLINE;
      data.push(this.startsKey(this.i) ? this.blockMap(this.column(this.i), this.i, depth + 1) : this.inlineValue(col, depth + 1, true));
      items.push(this.shadow);
      const next = this.nextLine();
      if (next < 0) break;
      const nextCol = this.column(next);
      if (nextCol < col) break;
      if (nextCol > col) throw DECLINE;
      if (t[next] !== '-') break; // the owner mapping's next key, at the same column
    }
    this.shadow = shadowOf(2, start, start, undefined, items);
    return data;
  }

  /** A value that starts on the current line after `key: ` or `- `: a flow collection or a scalar. */
  private inlineValue(blockCol: number, depth: number, inSeq: boolean): unknown {
    const c = this.text[this.i];
    if (c === '{' || c === '[') return this.flow(blockCol, depth);
    if (c === '"' || c === "'") return this.quoted();
    if (inSeq && c === '-' && this.text[this.i + 1] === ' ') throw DECLINE;
    return this.plain(false);
  }

  /** A plain scalar on one line; in a flow collection it also ends at `,`, `]`, `}`. */
  private plain(inFlow: boolean): unknown {
    const t = this.text;
    const start = this.i;
    const c = t[start]!;
    // Indicators that start something other than a plain scalar, or that the full parser should judge.
    if ('?:,[]{}#&*!|>\'"%@`'.includes(c)) throw DECLINE;
    // '-' starts a plain scalar only when a character that could continue one follows (`-5`, not `- ` or `-]`).
    if (c === '-' && ' \r\n,[]{}#'.includes(t[start + 1] ?? ' ')) throw DECLINE;
    // Up to the line's end, a ':' (declined: the full parser decides what it means) or, in a flow
    // collection, a flow indicator; a ' #' before that starts a comment.
    const stop = inFlow ? FLOW_PLAIN : BLOCK_PLAIN;
    let end = start;
    for (;;) {
      stop.lastIndex = end;
      stop.test(t);
      end = stop.lastIndex;
      if (t[end] !== '#') break;
      if (t[end - 1] === ' ') break; // a comment
      end++; // '#' inside a word belongs to the scalar
    }
    const ch = t[end];
    if (ch === ':' || ch === '[' || ch === '{') throw DECLINE;
    while (end > start && t.charCodeAt(end - 1) === 32) end--;
    this.i = end;
    const written = t.slice(start, end);
    const value = resolvePlain(written);
    this.sizeOfScalar(value);
    this.shadow = shadowOf(0, start, end);
    return value;
  }

  /** A quoted scalar on one line: double quotes without escapes, single quotes with '' for a quote. */
  private quoted(): string {
    const t = this.text;
    const start = this.i;
    const q = t[start];
    let value: string;
    let end: number;
    if (q === '"') {
      const close = t.indexOf('"', start + 1);
      if (close < 0) throw DECLINE;
      value = t.slice(start + 1, close);
      if (value.includes('\\') || value.includes('\n')) throw DECLINE;
      end = close + 1;
    } else {
      let j = start + 1;
      let out = '';
      for (;;) {
        const close = t.indexOf("'", j);
        if (close < 0) throw DECLINE;
        out += t.slice(j, close);
        if (t[close + 1] === "'") {
          out += "'";
          j = close + 2;
          continue;
        }
        end = close + 1;
        break;
      }
      if (out.includes('\n')) throw DECLINE;
      value = out;
    }
    this.i = end;
    this.sizeOfScalar(value);
    this.shadow = shadowOf(0, start, end);
    return value;
  }

  private sizeOfScalar(value: unknown): void {
    if (typeof value === 'string') {
      if (value.length > this.limits.maxTextChars) throw DECLINE;
      this.size += value.length + 1;
    } else this.size += 8;
  }

  /**
   * Skips spaces, line breaks and comments inside a flow collection. A line inside one must be
   * indented past the block it belongs to (`blockCol`), as the full parser requires.
   */
  private flowSpace(blockCol: number): void {
    const t = this.text;
    for (;;) {
      const c = t[this.i];
      if (c === ' ') this.i++;
      else if (c === '\r') this.i++;
      else if (c === '\n') {
        this.i++;
        let j = this.i;
        while (t[j] === ' ') j++;
        if (!isBreak(t[j]) && t[j] !== '#' && j - this.i <= blockCol) throw DECLINE;
        this.i = j;
      } else if (c === '#') {
        if (t[this.i - 1] !== ' ' && t[this.i - 1] !== '\n') throw DECLINE;
        const nl = t.indexOf('\n', this.i);
        if (nl < 0) throw DECLINE;
        this.i = nl;
      } else return;
    }
  }

  private flow(blockCol: number, depth: number): unknown {
    this.checkDepth(depth);
    const t = this.text;
    const start = this.i;
    const isMap = t[start] === '{';
    const close = isMap ? '}' : ']';
    this.i++;
    this.size += 1;
    const data: unknown = isMap ? {} : [];
    const entries = isMap ? new Map<string, Shadow>() : undefined;
    const items: Shadow[] | undefined = isMap ? undefined : [];
    this.flowSpace(blockCol);
    while (t[this.i] !== close) {
      let keyStart = -1;
      let key = '';
      if (isMap) {
        keyStart = this.i;
        KEY.lastIndex = keyStart;
        if (!KEY.test(t)) throw DECLINE;
        const keyEnd = KEY.lastIndex;
        key = t.slice(keyStart, keyEnd);
        if (t[keyEnd] !== ':' || (t[keyEnd + 1] !== ' ' && !isBreak(t[keyEnd + 1]))) throw DECLINE;
        if (key.length > MAX_KEY_CHARS || key === '__proto__' || entries!.has(key)) throw DECLINE;
        this.size += key.length + 1;
        this.i = keyEnd + 1;
        this.flowSpace(blockCol);
      }
      const c = t[this.i];
      let value: unknown;
      if (c === '{' || c === '[') value = this.flow(blockCol, depth + 1);
      else if (c === '"' || c === "'") value = this.quoted();
      else if (c === undefined || c === ',' || c === close || isBreak(c)) throw DECLINE;
      else value = this.plain(true);
      if (isMap) {
        (data as Record<string, unknown>)[key] = value;
        this.shadow.keyStart = keyStart;
        entries!.set(key, this.shadow);
      } else {
        (data as unknown[]).push(value);
        items!.push(this.shadow);
      }
      this.flowSpace(blockCol);
      if (t[this.i] === ',') {
        this.i++;
        this.flowSpace(blockCol);
      } else if (t[this.i] !== close) throw DECLINE;
    }
    this.i++;
    this.shadow = shadowOf(isMap ? 1 : 2, start, start, entries, items);
    return data;
  }
}
