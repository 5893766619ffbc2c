/**
 * YAML with positions. A study file is parsed once into a document that keeps every node's place,
 * so any later check can point at file, line and column by the path of the value it rejects.
 */
import { isMap, isScalar, isSeq, LineCounter, parseDocument, type Document, type Node } from 'yaml';
import { StudyError } from './errors.js';
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
}

/** Aliases allowed per file: enough for honest reuse, far too few for an expansion bomb. */
const MAX_ALIASES = 200;
/** Nesting deeper than this is not a study; refuse it before a recursive walk can overflow. */
const MAX_DEPTH = 64;

export function parseYamlFile(file: string, text: string): YamlFile {
  const lineCounter = new LineCounter();
  const doc = parseDocument(text, { lineCounter, uniqueKeys: true, prettyErrors: false, strict: true });
  const posOf = (offset: number): Pos => {
    const { line, col } = lineCounter.linePos(offset);
    return { file, line, col };
  };
  const problem = doc.errors[0];
  if (problem) {
    const at = posOf(problem.pos[0]);
    const message = firstLine(problem.message);
    const hint = problem.code === 'DUPLICATE_KEY' ? 'each key once in a mapping' : 'valid YAML (check indentation, colons and quotes)';
    throw new StudyError(`YAML: ${message}`, at, hint);
  }
  checkDepth(doc, posOf);
  let data: unknown;
  try {
    data = doc.toJS({ maxAliasCount: MAX_ALIASES });
  } catch (err) {
    const message = err instanceof Error ? err.message : String(err);
    throw new StudyError(`YAML: ${firstLine(message)}`, { file, line: 1, col: 1 }, `at most ${MAX_ALIASES} alias expansions; write the values out`);
  }
  if (data === null || data === undefined) data = {};
  const find = (path: readonly PathSegment[], wantKey: boolean): Pos => {
    let node: unknown = doc.contents;
    let best: Pos = { file, line: 1, col: 1 };
    if (isNodeWithRange(node)) best = posOf(node.range[0]);
    for (const seg of path) {
      if (isMap(node)) {
        const pair = node.items.find((p) => (isScalar(p.key) ? String(p.key.value) : p.key) === String(seg));
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
  return { file, text, data, at: (path) => find(path, false), keyAt: (path) => find(path, true) };
}

function isNodeWithRange(node: unknown): node is Node & { range: [number, number, number] } {
  return typeof node === 'object' && node !== null && Array.isArray((node as { range?: unknown }).range);
}

function checkDepth(doc: Document, posOf: (offset: number) => Pos): void {
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

function firstLine(text: string): string {
  return text.split('\n')[0]!.trim();
}
