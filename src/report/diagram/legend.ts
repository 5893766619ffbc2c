import type { FigurePart } from '../view.js';
import { ACCENT, FILL_GATE, INK, MUTED, createCanvas, round, serialize, text } from './canvas.js';
import { andPath, housePath, notBubble, notPath, orPath, trianglePath } from './symbols.js';

/** The key to the symbols, drawn with the same shapes as the diagrams. */
export function drawLegend(caption: string, width: number): FigurePart {
  const items: { name: string; note: string; draw: (g: ReturnType<typeof createCanvas>['svg'], cx: number, top: number) => void }[] = [
    { name: 'OR gate', note: 'output occurs if any input occurs', draw: (g, cx, t) => path(g, orPath(cx, t, 26, 24), FILL_GATE) },
    { name: 'AND gate', note: 'output occurs only if all inputs occur', draw: (g, cx, t) => path(g, andPath(cx, t, 26, 24), FILL_GATE) },
    {
      name: 'k/n voting gate',
      note: 'output occurs if at least k of the n inputs occur',
      draw: (g, cx, t) => {
        path(g, orPath(cx, t, 26, 24), FILL_GATE);
        text(g, cx, t + 19, 'k/n', 7, { weight: 'medium' });
      },
    },
    {
      name: 'NOT gate',
      note: 'output occurs if its input does not',
      draw: (g, cx, t) => {
        path(g, notPath(cx, t, 26, 24, 3), FILL_GATE);
        const b = notBubble(cx, t, 3);
        g.append('circle').attr('cx', b.cx).attr('cy', b.cy).attr('r', b.r).attr('fill', '#ffffff').attr('stroke', INK).attr('stroke-width', 0.8);
      },
    },
    {
      name: 'Basic event',
      note: 'a component failure with its own probability',
      draw: (g, cx, t) => {
        g.append('circle').attr('cx', round(cx)).attr('cy', round(t + 11)).attr('r', 11).attr('fill', '#ffffff').attr('stroke', INK).attr('stroke-width', 0.8);
      },
    },
    {
      name: 'Common-cause member',
      note: 'box: its total P; below: its independent part (shared part: its group)',
      draw: (g, cx, t) => {
        g.append('circle').attr('cx', round(cx)).attr('cy', round(t + 11)).attr('r', 11).attr('fill', '#ffffff').attr('stroke', INK).attr('stroke-width', 0.8);
        text(g, cx, t + 13.5, 'CCF', 6.5, { weight: 'medium' });
      },
    },
    { name: 'House event', note: 'a condition set on or off (a switch)', draw: (g, cx, t) => path(g, housePath(cx, t, 21, 20), '#ffffff') },
    {
      name: 'Transfer',
      note: 'the subtree continues on the figure named under it',
      draw: (g, cx, t) => path(g, trianglePath(cx, t, 22, 19), '#ffffff'),
    },
  ];
  const perRow = 4;
  const cell = (width - 12) / perRow;
  const rowHeight = 64;
  const rows = Math.ceil(items.length / perRow);
  const canvas = createCanvas(width, rows * rowHeight + 8, caption);
  items.forEach((item, i) => {
    const cx = 6 + (i % perRow) * cell + cell / 2;
    const top = 8 + Math.floor(i / perRow) * rowHeight;
    const g = canvas.svg.append('g').attr('data-legend', item.name);
    item.draw(g, cx, top);
    text(g, cx, top + 34, item.name, 7.5, { weight: 'medium' });
    splitNote(item.note).forEach((l, j) => text(g, cx, top + 43 + j * 8, l, 6.8, { fill: MUTED }));
  });
  text(canvas.svg, width - 8, rows * rowHeight + 2, 'P = probability used for the node', 6.8, { anchor: 'end', fill: ACCENT });
  return { svg: serialize(canvas), width: canvas.width, height: canvas.height };
}

function path(g: ReturnType<typeof createCanvas>['svg'], d: string, fill: string): void {
  g.append('path').attr('d', d).attr('fill', fill).attr('stroke', INK).attr('stroke-width', 0.8);
}

/** Two balanced lines for the short notes under each symbol. */
function splitNote(note: string): string[] {
  const words = note.split(' ');
  if (words.length < 4) return [note];
  const half = Math.ceil(words.length / 2);
  return [words.slice(0, half).join(' '), words.slice(half).join(' ')];
}
