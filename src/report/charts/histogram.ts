/**
 * The histogram of the Monte Carlo trials: the analysis's log-spaced bins as bars on a log axis of
 * the top-event probability, counts up the side, and marker lines at the summary values (5th
 * percentile, median, mean, 95th percentile, point estimate) with their names. Layout only.
 */
import { ACCENT, INK, MUTED, createCanvas, round, serialize, text } from '../diagram/canvas.js';
import { formatCount } from '../format.js';
import type { FigurePart } from '../view.js';
import { BELOW_FRAME, FONT, RIGHT, drawAxes, leftMargin, linearAxis, logAxis, makeFrame } from './axes.js';

export interface HistogramOptions {
  width: number;
  label: string;
  xTitle: string;
  /** Vertical lines at summary values; `strong` ones solid, the others dashed. */
  markers: { value: number; name: string; strong?: boolean }[];
}

export function histogramChart(h: { edges: number[]; counts: number[] }, opts: HistogramOptions): FigurePart {
  const frameHeight = 115;
  const x = logAxis([...h.edges, ...opts.markers.map((m) => m.value)], opts.xTitle);
  const y = linearAxis(h.counts, 'Trials per bin', { zero: true, format: formatCount });
  const left = leftMargin(y);
  // Marker names sit above the frame, staggered in rows so neighbours do not overlap.
  const rows = Math.min(3, opts.markers.length);
  const top = 6 + rows * (FONT + 3);
  const height = top + frameHeight + BELOW_FRAME + 4;
  const canvas = createCanvas(opts.width, height, opts.label);
  const frame = makeFrame(left, top, opts.width - left - RIGHT, frameHeight, x, y);
  drawAxes(canvas.svg, frame, x, y);

  const bars = canvas.svg.append('g').attr('data-part', 'bins');
  h.counts.forEach((c, i) => {
    if (c <= 0) return;
    const x0 = frame.x(h.edges[i]!);
    const x1 = frame.x(h.edges[i + 1]!);
    const y0 = frame.y(c);
    bars
      .append('rect')
      .attr('x', round(x0))
      .attr('y', round(y0))
      .attr('width', round(Math.max(0.5, x1 - x0 - 0.4)))
      .attr('height', round(frame.top + frame.height - y0))
      .attr('fill', ACCENT)
      .attr('fill-opacity', 0.75);
  });

  const marks = canvas.svg.append('g').attr('data-part', 'markers');
  [...opts.markers]
    .sort((a, b) => a.value - b.value)
    .forEach((m, k) => {
      if (!(m.value > 0)) return;
      const px = frame.x(m.value);
      const l = marks.append('line').attr('x1', round(px)).attr('y1', round(frame.top - 2 - (k % rows) * (FONT + 3))).attr('x2', round(px)).attr('y2', round(frame.top + frame.height)).attr('stroke', m.strong ? INK : MUTED).attr('stroke-width', 0.9);
      if (!m.strong) l.attr('stroke-dasharray', '3 2');
      text(marks, px, frame.top - 4 - (k % rows) * (FONT + 3), m.name, FONT - 0.5, { fill: m.strong ? INK : MUTED });
    });
  return { svg: serialize(canvas), width: canvas.width, height: canvas.height };
}
