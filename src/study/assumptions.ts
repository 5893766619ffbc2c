/**
 * assumptions.md: a Markdown file whose `## A1 Title` headings number the assumptions. The body of
 * each runs to the next such heading and is kept as Markdown for the report to render.
 */
import { StudyError } from './errors.js';
import type { Assumption } from './types.js';

const HEADING = /^##\s+(A\d+)\b[\s.:–—-]*(.*)$/;

/** More assumptions than this do not fit a readable register (nor a PDF made in bounded time). */
export const MAX_ASSUMPTIONS = 500;

export function parseAssumptions(text: string, file: string): Assumption[] {
  const lines = text.split(/\r?\n/);
  const out: Assumption[] = [];
  const ids = new Set<string>();
  let current: { a: Assumption; body: string[] } | undefined;
  const close = () => {
    if (current) {
      current.a.body = current.body.join('\n').trim();
      out.push(current.a);
    }
  };
  lines.forEach((line, i) => {
    const m = HEADING.exec(line);
    if (m) {
      close();
      const id = m[1]!;
      if (ids.has(id)) {
        throw new StudyError(`assumption ${id} is defined twice`, { file, line: i + 1, col: 1 }, 'each assumption number once');
      }
      if (ids.size >= MAX_ASSUMPTIONS) {
        throw new StudyError(`more than ${MAX_ASSUMPTIONS} assumptions`, { file, line: i + 1, col: 1 }, `at most ${MAX_ASSUMPTIONS} numbered assumptions (group related ones under one number)`);
      }
      ids.add(id);
      current = { a: { id, title: m[2]!.trim() || id, body: '', at: { file, line: i + 1, col: 1 } }, body: [] };
    } else if (/^##\s/.test(line)) {
      throw new StudyError(`a second-level heading that is not an assumption number`, { file, line: i + 1, col: 1 }, "'## A1 Title', '## A2 Title', …");
    } else if (current) {
      current.body.push(line);
    }
  });
  close();
  return out;
}
