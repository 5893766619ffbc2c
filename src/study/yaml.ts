/**
 * YAML with positions. A study file is parsed once into a document that keeps every node's place,
 * so any later check can point at file, line and column by the path of the value it rejects.
 */
import { createRequire } from 'node:module';
import type { Document, ErrorCode, Node, Pair, YAMLMap } from 'yaml';
import { StudyError } from './errors.js';
import { readPlainYaml } from './plain-yaml.js';
import type { Pos } from './types.js';

export type PathSegment = string | number;

export interface YamlFile {
  /** Path relative to the study folder, as shown to the user. */
  file: string;
  text: string;
  data: unknown;
  /** Position of the value at `path` (or of its nearest existing parent). */
  at(path: readonly PathSegment[]): Pos;
  /** Position of the key that names the value at `path` (for "unknown key" style messages). */
  keyAt(path: readonly PathSegment[]): Pos;
  /** The text of the scalar at `path` exactly as written (`2e-3`, not the 0.002 it parses to); undefined when there is none. */
  sourceAt?(path: readonly PathSegment[]): string | undefined;
}

/** Aliases allowed per file: enough for honest reuse, far too few for an expansion bomb. */
const MAX_ALIASES = 200;
/** Nesting deeper than this is not a study; refuse it before a recursive walk can overflow. */
const MAX_DEPTH = 64;
/**
 * Characters the data may hold once every alias is expanded: twice the largest file, so honest
 * reuse fits and one long scalar repeated by the alias limit (7 MB × 200) cannot exhaust memory.
 */
export const MAX_EXPANDED_CHARS = 16 * 1024 * 1024;
/** One text value (a title, a note, a Markdown scope) longer than this is not prose an appendix can hold. */
export const MAX_TEXT_CHARS = 64 * 1024;

export function parseYamlFile(file: string, text: string): YamlFile {
  // Most study files are plain YAML: read them quickly; anything else takes the full parser below.
  const plain = readPlainYaml(file, text, { maxDepth: MAX_DEPTH, maxTextChars: MAX_TEXT_CHARS, maxExpandedChars: MAX_EXPANDED_CHARS });
  if (plain) return { file, text, data: plain.data, at: (path) => plain.at(path, false), keyAt: (path) => plain.at(path, true), sourceAt: plain.sourceAt };
  return parseYamlDocument(file, text);
}

/**
 * The `yaml` package, loaded the first time a file needs the full parser (a study whose files are
 * all plain never loads it). It is CommonJS under Node, so `require` keeps reading synchronous.
 */
let yamlPackage: typeof import('yaml') | undefined;
function fullParser(): typeof import('yaml') {
  return (yamlPackage ??= createRequire(import.meta.url)('yaml') as typeof import('yaml'));
}

/** The full parser: any YAML, every check, the parser's own errors explained. */
export function parseYamlDocument(file: string, text: string): YamlFile {
  const { isMap, isScalar, isSeq, LineCounter, parseDocument, visit } = fullParser();
  const lineCounter = new LineCounter();
  // stringKeys: a key that is a list or a mapping is an error here, not a warning printed by the parser later.
  // uniqueKeys is off because the parser compares each key with every earlier one (quadratic in the
  // keys of a mapping); checkDuplicateKeys does the same check with a set.
  const doc = parseDocument(text, { lineCounter, uniqueKeys: false, prettyErrors: false, strict: true, stringKeys: true });
  const posOf = (offset: number): Pos => {
    const { line, col } = lineCounter.linePos(offset);
    return { file, line, col };
  };
  const problem = doc.errors[0];
  if (problem) {
    const { message, hint, offset } = explainYamlError(problem.code, problem.message, text, problem.pos[0]);
    throw new StudyError(`YAML: ${message}`, posOf(offset), hint);
  }
  checkTags(doc, posOf);
  checkDepth(doc, posOf);
  checkDuplicateKeys(doc, posOf);
  checkExpandedSize(doc, posOf);
  let data: unknown;
  try {
    data = doc.toJS({ maxAliasCount: MAX_ALIASES });
  } catch (err) {
    const message = err instanceof Error ? err.message : String(err);
    // Point at the first alias: that is where the expansion starts, not line 1.
    let at: Pos = { file, line: 1, col: 1 };
    visit(doc, {
      Alias(_key, node) {
        if (node.range) at = posOf(node.range[0]);
        return visit.BREAK;
      },
    });
    throw new StudyError(`YAML: ${firstLine(message)}`, at, `at most ${MAX_ALIASES} alias expansions; write the values out`);
  }
  if (data === null || data === undefined) data = {};
  // Key → pair of each mapping, built the first time a look-up passes through it: a check that
  // points at every one of n entries then costs n look-ups, not n² comparisons.
  const indexes = new WeakMap<YAMLMap, Map<string, Pair>>();
  const pairOf = (map: YAMLMap, key: string): Pair | undefined => {
    let index = indexes.get(map);
    if (!index) {
      index = new Map();
      for (const p of map.items) {
        const k = isScalar(p.key) ? String(p.key.value) : undefined;
        if (k !== undefined && !index.has(k)) index.set(k, p as Pair);
      }
      indexes.set(map, index);
    }
    return index.get(key);
  };
  const find = (path: readonly PathSegment[], wantKey: boolean): Pos => {
    let node: unknown = doc.contents;
    let best: Pos = { file, line: 1, col: 1 };
    if (isNodeWithRange(node)) best = posOf(node.range[0]);
    for (const seg of path) {
      if (isMap(node)) {
        const pair = pairOf(node as YAMLMap, String(seg));
        if (!pair) return best;
        if (wantKey && isNodeWithRange(pair.key)) best = posOf(pair.key.range[0]);
        node = pair.value;
        if (!wantKey || seg !== path[path.length - 1]) {
          if (isNodeWithRange(node)) best = posOf(node.range[0]);
          else if (isNodeWithRange(pair.key)) best = posOf(pair.key.range[0]);
        }
      } else if (isSeq(node) && typeof seg === 'number') {
        node = node.items[seg];
        if (isNodeWithRange(node)) best = posOf(node.range[0]);
        else return best;
      } else {
        return best;
      }
    }
    return best;
  };
  const sourceAt = (path: readonly PathSegment[]): string | undefined => {
    let node: unknown = doc.contents;
    for (const seg of path) {
      if (isMap(node)) node = pairOf(node as YAMLMap, String(seg))?.value;
      else if (isSeq(node) && typeof seg === 'number') node = node.items[seg];
      else return undefined;
    }
    if (!isScalar(node) || !isNodeWithRange(node)) return undefined;
    const raw = text.slice(node.range[0], node.range[1]).trim();
    return /^["']/.test(raw) ? raw.slice(1, -1) : raw;
  };
  return { file, text, data, at: (path) => find(path, false), keyAt: (path) => find(path, true), sourceAt };
}

function isNodeWithRange(node: unknown): node is Node & { range: [number, number, number] } {
  return typeof node === 'object' && node !== null && Array.isArray((node as { range?: unknown }).range);
}

function checkDepth(doc: Document, posOf: (offset: number) => Pos): void {
  const { isMap, isSeq } = fullParser();
  const stack: { node: unknown; depth: number }[] = [{ node: doc.contents, depth: 0 }];
  while (stack.length > 0) {
    const { node, depth } = stack.pop()!;
    if (depth > MAX_DEPTH) {
      const at = isNodeWithRange(node) ? posOf(node.range[0]) : posOf(0);
      throw new StudyError(`YAML nested more than ${MAX_DEPTH} levels deep`, at, 'a study nests a few levels: sections, ids, fields');
    }
    if (isMap(node)) for (const p of node.items) stack.push({ node: p.value, depth: depth + 1 });
    else if (isSeq(node)) for (const item of node.items) stack.push({ node: item, depth: depth + 1 });
  }
}

/**
 * A tag the schema does not know (`!!js/function`, `!something`) is refused: the parser would keep
 * the value as plain text and the study would silently mean something else than written.
 */
function checkTags(doc: Document, posOf: (offset: number) => Pos): void {
  const unknown = doc.warnings.find((w) => w.code === 'TAG_RESOLVE_FAILED');
  if (!unknown) return;
  const full = /tag:?\s*(\S+)/i.exec(unknown.message)?.[1];
  // Shown as written: the parser expands the '!!' shorthand to the tag:yaml.org prefix.
  const tag = full ? full.replace(/^tag:yaml\.org,2002:/, '!!') : 'a tag';
  throw new StudyError(`YAML: unknown tag ${tag}`, posOf(unknown.pos[0]), 'plain values without a tag (a study needs no YAML tags)');
}

/** Each key once per mapping, checked with a set per mapping (linear). */
function checkDuplicateKeys(doc: Document, posOf: (offset: number) => Pos): void {
  const { isMap, isScalar, isSeq } = fullParser();
  const stack: unknown[] = [doc.contents];
  while (stack.length > 0) {
    const node = stack.pop();
    if (isMap(node)) {
      const seen = new Set<string>();
      for (const p of node.items) {
        if (isScalar(p.key)) {
          const key = String(p.key.value);
          if (seen.has(key)) {
            throw new StudyError(
              `YAML: the key '${key}' appears twice in one mapping`,
              posOf(p.key.range?.[0] ?? 0),
              'each key once in a mapping (merge the two entries or rename one)',
            );
          }
          seen.add(key);
        }
        stack.push(p.value);
      }
    } else if (isSeq(node)) for (const item of node.items) stack.push(item);
  }
}

/**
 * Refuses a file whose aliases would expand past MAX_EXPANDED_CHARS. Each node's expanded size is
 * computed once, in document order, so an alias costs a look-up of the size of the node it names
 * (which precedes it); the count limit alone lets one huge scalar be repeated into gigabytes.
 */
function checkExpandedSize(doc: Document, posOf: (offset: number) => Pos): void {
  const { isAlias, isMap, isScalar, isSeq } = fullParser();
  const sizes = new Map<unknown, number>();
  const anchors = new Map<string, unknown>();
  let firstAlias: Pos | undefined;
  // Depth is already limited (checkDepth), so recursion over the tree is safe; aliases are not followed.
  const size = (node: unknown): number => {
    if (node === null || node === undefined) return 1;
    const anchor = (node as { anchor?: string }).anchor;
    if (anchor) anchors.set(anchor, node);
    let total: number;
    if (isAlias(node)) {
      if (!firstAlias && node.range) firstAlias = posOf(node.range[0]);
      // Not yet sized means the alias sits inside its own anchor: the parser refuses that itself.
      total = sizes.get(anchors.get(node.source)) ?? 1;
    } else if (isScalar(node)) {
      if (typeof node.value === 'string' && node.value.length > MAX_TEXT_CHARS) {
        throw new StudyError(
          `a text of ${node.value.length.toLocaleString('en-US')} characters, longer than a study text may be`,
          posOf(node.range?.[0] ?? 0),
          `at most ${MAX_TEXT_CHARS / 1024} Ki characters per value (keep long material in a referenced document)`,
        );
      }
      total = typeof node.value === 'string' ? node.value.length + 1 : 8;
    }
    else if (isMap(node)) {
      total = 1;
      for (const p of node.items) total += size(p.key) + size(p.value);
    } else if (isSeq(node)) {
      total = 1;
      for (const item of node.items) total += size(item);
    } else total = 1;
    sizes.set(node, total);
    return total;
  };
  const total = size(doc.contents);
  if (total > MAX_EXPANDED_CHARS) {
    throw new StudyError(
      `YAML: aliases expand this file to about ${(total / 1048576).toFixed(0)} million characters`,
      firstAlias ?? posOf(0),
      `at most ${MAX_EXPANDED_CHARS / 1048576} million characters once aliases are expanded; write the values out or shorten them`,
    );
  }
}

function firstLine(text: string): string {
  // The parser appends " at line L, column C:" and a source excerpt; the position is reported separately.
  return text.split('\n')[0]!.trim().replace(/\s+at line \d+, column \d+:?$/, '');
}

/**
 * The parser's message in the user's terms, with what would be right, and the offset to point at
 * (the parser reports an unclosed quote where the file ends; the user wants where it opens).
 */
function explainYamlError(code: ErrorCode, raw: string, text: string, offset: number): { message: string; hint: string; offset: number } {
  switch (code) {
    case 'DUPLICATE_KEY': {
      const key = /^\s*("[^"\n]*"|'[^'\n]*'|[^:,{}\[\]\n]*)/.exec(text.slice(offset))?.[1]?.trim().replace(/^["']|["']$/g, '');
      return key
        ? { message: `the key '${key}' appears twice in one mapping`, hint: 'each key once in a mapping (merge the two entries or rename one)', offset }
        : { message: firstLine(raw), hint: 'each key once in a mapping', offset };
    }
    case 'NON_STRING_KEY':
      return { message: 'a key is a list or a mapping, not a name', hint: 'plain names as keys, e.g. "motor-a:"', offset };
    case 'MULTIPLE_DOCS':
      return { message: "the file holds more than one YAML document (a '---' line starts a second one)", hint: "one document per file: remove the '---' separator", offset };
    case 'RESOURCE_EXHAUSTION':
      // The parser ran out of stack: only absurd nesting does that.
      return { message: 'the file nests too deeply to read', hint: 'a study nests a few levels: sections, ids, fields', offset };
    case 'MISSING_CHAR': {
      const quote = /closing "quote/.test(raw) ? '"' : /closing 'quote/.test(raw) ? "'" : undefined;
      if (quote) {
        // Inside an unclosed quoted value no further quote occurs, so the last one before the end opened it.
        let open = text.lastIndexOf(quote, offset - 1);
        while (quote === '"' && open > 0 && text[open - 1] === '\\') open = text.lastIndexOf(quote, open - 2);
        return { message: `a value opened with ${quote} is never closed`, hint: `a closing ${quote} at the end of the value`, offset: open >= 0 ? open : offset };
      }
      return { message: firstLine(raw), hint: 'valid YAML (check indentation, colons and quotes)', offset };
    }
    // The parser's words stay (they are searchable); the hint says in plain words what usually causes them.
    case 'BAD_INDENT':
      return { message: firstLine(raw), hint: 'this line is indented differently from the lines beside it: the keys of one mapping start in the same column (use spaces, two per level)', offset };
    case 'BLOCK_AS_IMPLICIT_KEY':
      return { message: firstLine(raw), hint: "a line indented further than the key above it is read as part of that key's value: indent it like its neighbours; or, if a value holds ': ', put the value in quotes", offset };
    case 'MULTILINE_IMPLICIT_KEY':
      return { message: firstLine(raw), hint: "a key and its ':' on one line; check the indentation of this line and the one above it", offset };
    case 'TAB_AS_INDENT':
      return { message: firstLine(raw), hint: 'indentation with spaces only (two per level), no tabs', offset };
    default:
      return { message: firstLine(raw), hint: 'valid YAML (check indentation, colons and quotes)', offset };
  }
}
