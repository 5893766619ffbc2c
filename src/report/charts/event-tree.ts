/**
 * An event-tree diagram in the usual form: the initiating load at the left, one column per heading
 * with its title above, and one row per sequence at the right with its outcome and annual
 * probability. At a heading that a path asks, the upper branch is "works" (the line goes straight
 * on) and the lower branch is "fails" (the line drops to the first row of the failure sequences);
 * a heading a path does not ask is passed straight through. The sequences arrive in tree order
 * (works above fails), so every branch point is a drop from the row of its first sequence.
 *
 * Layout only: the probabilities printed are the analysis's, formatted by the caller.
 */
import { ACCENT, INK, MUTED, RULE, createCanvas, round, serialize, text } from '../diagram/canvas.js';
import { textWidth, wrap } from '../diagram/text.js';
import type { FigurePart } from '../view.js';

export interface TreeDrawing {
  label: string;
  load: { title: string; detail: string };
  headings: { id: string; title: string }[];
  sequences: { id: string; path: ('works' | 'fails' | null)[]; outcome: string; probability: string }[];
}

const FONT = 7;
const ROW = 18;

export function eventTreeDiagram(tree: TreeDrawing, width: number): FigurePart {
  const H = tree.headings.length;
  const rightText = (s: TreeDrawing['sequences'][number]) => `${s.id}  ${s.outcome}  ${s.probability}`;
  const rightWidth = Math.min(200, Math.max(...tree.sequences.map((s) => textWidth(rightText(s), FONT))) + 12);
  const initWidth = 76;
  const colWidth = Math.max(44, (width - initWidth - rightWidth) / Math.max(1, H));
  const total = initWidth + colWidth * H + rightWidth;
  const headerLines = tree.headings.map((h) => wrap(h.title, colWidth - 6, FONT, 4));
  const header = 10 + Math.max(2, ...headerLines.map((l) => l.length)) * (FONT + 2) + FONT + 10;
  const height = header + tree.sequences.length * ROW + 20;
  const canvas = createCanvas(total, height, tree.label);
  const svg = canvas.svg;

  // Column guides and headings.
  const colX = (h: number) => initWidth + h * colWidth;
  const g = svg.append('g').attr('data-part', 'headings');
  wrap(tree.load.title, initWidth - 8, FONT, 3).forEach((line, i) => text(g, initWidth / 2, 12 + i * (FONT + 2), line, FONT, { weight: 'medium' }));
  tree.headings.forEach((h, i) => {
    headerLines[i]!.forEach((line, k) => text(g, colX(i) + colWidth / 2, 12 + k * (FONT + 2), line, FONT, { weight: 'medium' }));
    text(g, colX(i) + colWidth / 2, header - 8, h.id, FONT - 1, { fill: MUTED });
    g.append('line')
      .attr('x1', round(colX(i)))
      .attr('y1', 4)
      .attr('x2', round(colX(i)))
      .attr('y2', round(height - 16))
      .attr('stroke', RULE)
      .attr('stroke-width', 0.3)
      .attr('stroke-dasharray', '2 2');
  });
  const seqX = colX(H);
  text(g, seqX + 6, header - 8, 'Sequence, outcome, per year', FONT - 1, { anchor: 'start', fill: MUTED });

  // Branches: a recursive walk over the sequences (already in tree order).
  const lines = svg.append('g').attr('data-part', 'branches').attr('stroke', INK).attr('stroke-width', 1).attr('fill', 'none');
  const rowY = (i: number) => header + i * ROW + ROW / 2;
  const seg = (x1: number, y1: number, x2: number, y2: number) =>
    lines.append('line').attr('x1', round(x1)).attr('y1', round(y1)).attr('x2', round(x2)).attr('y2', round(y2));
  const walk = (rows: number[], depth: number, fromX: number): void => {
    const y = rowY(rows[0]!);
    if (depth === H) {
      seg(fromX, y, seqX, y);
      return;
    }
    const asked = tree.sequences[rows[0]!]!.path[depth] !== null;
    if (!asked) {
      walk(rows, depth + 1, fromX);
      return;
    }
    const x = colX(depth) + colWidth / 2;
    seg(fromX, y, x, y);
    const works = rows.filter((r) => tree.sequences[r]!.path[depth] === 'works');
    const fails = rows.filter((r) => tree.sequences[r]!.path[depth] === 'fails');
    if (works.length) walk(works, depth + 1, x);
    if (fails.length) {
      const yf = rowY(fails[0]!);
      seg(x, y, x, yf);
      walk(fails, depth + 1, x);
    }
  };
  walk(
    tree.sequences.map((_, i) => i),
    0,
    initWidth - 10,
  );
  svg.append('circle').attr('cx', round(initWidth - 10)).attr('cy', round(rowY(0))).attr('r', 2.2).attr('fill', ACCENT);
  text(svg, initWidth / 2, rowY(0) + FONT + 6, tree.load.detail, FONT - 1, { fill: MUTED });

  const out = svg.append('g').attr('data-part', 'sequences');
  tree.sequences.forEach((s, i) => {
    const y = rowY(i) + FONT / 3;
    text(out, seqX + 6, y, s.id, FONT, { anchor: 'start', weight: 'medium' });
    text(out, seqX + 6 + textWidth(`${s.id}  `, FONT, 'medium'), y, s.outcome, FONT, { anchor: 'start' });
    text(out, total - 4, y, s.probability, FONT, { anchor: 'end' });
  });
  text(svg, 4, height - 5, 'Upper branch: the heading works; lower branch: it fails. A line passing a column: not asked on that path.', FONT - 1, { anchor: 'start', fill: MUTED });
  return { svg: serialize(canvas), width: canvas.width, height: canvas.height };
}
