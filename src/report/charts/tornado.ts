/**
 * A tornado chart: one row per parameter, widest swing at the top, each a bar from the base-case
 * top probability to the value with the parameter at its low end (light) and at its high end
 * (dark), around a vertical line at the base case. The axis is logarithmic when the values span
 * more than a factor of 20 (a probability range often does), linear otherwise. Layout only: every
 * end of every bar is an analysis result.
 */
import { ACCENT, INK, createCanvas, round, serialize, text } from '../diagram/canvas.js';
import { wrap } from '../diagram/text.js';
import type { FigurePart } from '../view.js';
import { BELOW_FRAME, FONT, RIGHT, drawAxes, drawLegend, linearAxis, logAxis, makeFrame } from './axes.js';
import { formatProbability } from '../format.js';

export interface TornadoRow {
  label: string;
  /** Top probability with the parameter at its low end, and at its high end. */
  low: number;
  high: number;
}

const LOW_FILL = '#9fb3cf';
const ROW = 12;
const BAR = 8;

export function tornadoChart(rows: TornadoRow[], base: number, opts: { width: number; label: string; axisTitle: string }): FigurePart {
  const values = [base, ...rows.flatMap((r) => [r.low, r.high])];
  const positive = values.filter((v) => v > 0);
  const useLog = positive.length === values.length && Math.max(...positive) / Math.min(...positive) > 20;
  const x = useLog ? logAxis(values, opts.axisTitle) : linearAxis(values, opts.axisTitle, { format: formatProbability });
  const labelWidth = Math.min(170, opts.width * 0.34);
  const left = labelWidth + 10;
  const top = 6;
  const frameHeight = rows.length * ROW + 6;
  const legendTop = top + frameHeight + BELOW_FRAME + 2;
  const height = legendTop + 2 * (FONT + 5) + 4;
  const canvas = createCanvas(opts.width, height, opts.label);
  // No y ticks: the rows are labelled at the left instead.
  const y = { kind: 'linear' as const, domain: [0, 1] as [number, number], ticks: [], title: '' };
  const frame = makeFrame(left, top, opts.width - left - RIGHT, frameHeight, x, y);
  drawAxes(canvas.svg, frame, x, y);

  const g = canvas.svg.append('g').attr('data-part', 'bars');
  const bx = frame.x(base);
  rows.forEach((r, i) => {
    const cy = top + 3 + i * ROW + ROW / 2;
    const row = g.append('g').attr('data-parameter', r.label);
    text(row, labelWidth, cy + FONT / 3, wrap(r.label, labelWidth, FONT, 1)[0] ?? '', FONT, { anchor: 'end', fill: INK });
    for (const [v, fill] of [
      [r.low, LOW_FILL],
      [r.high, ACCENT],
    ] as const) {
      if (!(useLog ? v > 0 : Number.isFinite(v))) continue;
      const px = frame.x(v);
      const x0 = Math.min(px, bx);
      const w = Math.max(0.6, Math.abs(px - bx));
      row.append('rect').attr('x', round(x0)).attr('y', round(cy - BAR / 2)).attr('width', round(w)).attr('height', BAR).attr('fill', fill);
    }
  });
  g.append('line').attr('x1', round(bx)).attr('y1', round(frame.top)).attr('x2', round(bx)).attr('y2', round(frame.top + frame.height)).attr('stroke', INK).attr('stroke-width', 0.9);
  drawLegend(canvas.svg, frame.left, legendTop, [
    { name: 'parameter at the low end of its range', stroke: LOW_FILL, fill: LOW_FILL },
    { name: 'parameter at the high end of its range', stroke: ACCENT, fill: ACCENT },
  ]);
  return { svg: serialize(canvas), width: canvas.width, height: canvas.height };
}
