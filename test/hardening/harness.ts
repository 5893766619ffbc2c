/**
 * Shared helpers of the hardening tests: the bad-input corpus table, output folders with a sentinel
 * to prove a failed run leaves them alone, and the checks every refused study must pass.
 */
import { createHash } from 'node:crypto';
import { cpSync, lstatSync, mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import { expect } from 'vitest';
import { tempDir, type Captured } from '../cli/helpers.js';

export const CORPUS = 'test/bad-studies';
export const VALID_STUDY = 'test/fixtures/hardening/valid-study';

export interface CorpusCase {
  name: string;
  what: string;
  /** A fragment the first error message must contain. */
  fragment: string;
  /** `file:line` the first error must point at, or undefined when it has no place in a file. */
  where?: { file: string; line: number };
}

/**
 * The cases listed in the corpus README. The first table lists the committed folders, the second
 * (after the "made by the test" heading) the cases the tests build at run time.
 */
export function readCorpusTables(): { committed: CorpusCase[]; generated: CorpusCase[] } {
  const text = readFileSync(join(CORPUS, 'README.md'), 'utf8');
  const [first, second] = text.split(/^## Cases made by the test/m);
  return { committed: tableRows(first ?? ''), generated: tableRows(second ?? '') };
}

function tableRows(markdown: string): CorpusCase[] {
  const rows: CorpusCase[] = [];
  for (const line of markdown.split('\n')) {
    const m = /^\| `([^`]+)` \| (.*) \| `(.*)` \| (.+) \|$/.exec(line);
    if (!m) continue;
    const where = m[4]!.trim();
    const loc = /^(.+):(\d+)$/.exec(where);
    const c: CorpusCase = { name: m[1]!, what: m[2]!.replace(/\\\|/g, '|'), fragment: m[3]!.replace(/\\\|/g, '|') };
    if (loc) c.where = { file: loc[1]!, line: Number(loc[2]) };
    else if (where !== '—') throw new Error(`corpus README: bad 'where' column '${where}' for ${c.name}`);
    rows.push(c);
  }
  return rows;
}

/** A copy of a study folder in a fresh temporary directory; returns the copy's path. */
export function copyStudy(from: string, name = 'study'): string {
  const dir = join(tempDir('faultbook-hardening-'), name);
  cpSync(from, dir, { recursive: true });
  return dir;
}

/** Every file under `dir` (hidden ones too) with its bytes' hash and its permission bits. */
export function snapshot(dir: string): Record<string, string> {
  const out: Record<string, string> = {};
  const walk = (d: string) => {
    for (const name of readdirSync(d).sort()) {
      const full = join(d, name);
      const st = lstatSync(full);
      const key = relative(dir, full);
      if (st.isDirectory()) {
        out[`${key}/`] = `dir ${(st.mode & 0o777).toString(8)}`;
        walk(full);
      } else {
        out[key] = `${createHash('sha256').update(readFileSync(full)).digest('hex')} ${(st.mode & 0o777).toString(8)}`;
      }
    }
  };
  walk(dir);
  return out;
}

/** An output folder holding what an earlier good run left: a sentinel and an old results.json. */
export function earlierOutputs(): string {
  const dir = join(tempDir('faultbook-hardening-out-'), 'out');
  mkdirSync(dir, { recursive: true });
  writeFileSync(join(dir, 'SENTINEL.txt'), 'left by an earlier run; must survive a failed one\n');
  writeFileSync(join(dir, 'results.json'), '{ "format": "faultbook-results/1", "note": "an old, good result" }\n');
  return dir;
}

/** No stack frames, no internal-error banner: what a user sees for a bad study. */
export function expectNoStackTrace(stderr: string): void {
  expect(stderr).not.toMatch(/^\s+at\s.*(:\d+:\d+\)?|<anonymous>|native)/m);
  expect(stderr).not.toMatch(/internal error|FAULTBOOK_DEBUG|TypeError|RangeError|ReferenceError/);
}

/** The rules of DESIGN.md for a refused study, applied to one captured run. */
export function expectRefused(r: Captured, c: CorpusCase): void {
  const context = `${c.name}: ${c.what}\n--- stderr ---\n${r.stderr}`;
  expect(r.code, context).toBe(2);
  expectNoStackTrace(r.stderr);
  const first = r.stderr.split('\n').find((l) => l.startsWith('error: '));
  expect(first, context).toBeDefined();
  expect(first, context).toContain(c.fragment);
  if (c.where) {
    expect(first!.startsWith(`error: ${c.where.file}:${c.where.line}:`), context).toBe(true);
  }
  // What would be right, on the line after the message.
  const lines = r.stderr.split('\n');
  const i = lines.indexOf(first!);
  expect(lines[i + 1] ?? '', context).toMatch(/^ {2}expected: \S/);
  expect(r.stdout, context).toBe('');
}
