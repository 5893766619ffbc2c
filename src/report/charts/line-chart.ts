/**
 * A line chart of one or more series on linear or log axes (the exercise-interval curve, the
 * cumulative uncertainty curve, the forecast), with optional reference lines and a legend below.
 * Draws the analysis's points as given; see axes.ts for what is layout.
 */
import { ACCENT, MUTED, createCanvas, round, serialize, text } from '../diagram/canvas.js';
import type { FigurePart } from '../view.js';
import { BELOW_FRAME, FONT, RIGHT, SERIES_STYLES, drawAxes, drawLegend, leftMargin, makeFrame, type Axis } from './axes.js';

export interface Series {
  name: string;
  points: { x: number; y: number }[];
  /** Mark each point with a dot (for few, meaningful points). */
  markers?: boolean;
}

export interface LineChartOptions {
  width: number;
  /** Height of the plotting frame, points. */
  frameHeight?: number;
  /** Accessible label and SVG title. */
  label: string;
  x: Axis;
  y: Axis;
  /** Horizontal (`y`) or vertical (`x`) reference lines, e.g. the base case. */
  references?: { axis: 'x' | 'y'; value: number; label: string }[];
  /** Draw a legend (default: when there is more than one series). */
  legend?: boolean;
}

export function lineChart(series: Series[], opts: LineChartOptions): FigurePart {
  const frameHeight = opts.frameHeight ?? 170;
  const left = leftMargin(opts.y);
  const top = 8;
  const right = RIGHT;
  const showLegend = opts.legend ?? series.length > 1;
  const legendHeight = showLegend ? series.length * (FONT + 5) + 4 : 0;
  const height = top + frameHeight + BELOW_FRAME + legendHeight + 4;
  const canvas = createCanvas(opts.width, height, opts.label);
  const frame = makeFrame(left, top, opts.width - left - right, frameHeight, opts.x, opts.y);
  drawAxes(canvas.svg, frame, opts.x, opts.y);

  for (const r of opts.references ?? []) {
    const g = canvas.svg.append('g').attr('data-part', 'reference');
    if (r.axis === 'y') {
      const py = frame.y(r.value);
      g.append('line').attr('x1', round(frame.left)).attr('y1', round(py)).attr('x2', round(frame.left + frame.width)).attr('y2', round(py)).attr('stroke', MUTED).attr('stroke-width', 0.8).attr('stroke-dasharray', '2 2');
      text(g, frame.left + frame.width - 3, py - 3, r.label, FONT - 0.5, { anchor: 'end', fill: MUTED });
    } else {
      const px = frame.x(r.value);
      g.append('line').attr('x1', round(px)).attr('y1', round(frame.top)).attr('x2', round(px)).attr('y2', round(frame.top + frame.height)).attr('stroke', MUTED).attr('stroke-width', 0.8).attr('stroke-dasharray', '2 2');
      text(g, px + 3, frame.top + FONT + 2, r.label, FONT - 0.5, { anchor: 'start', fill: MUTED });
    }
  }

  series.forEach((s, i) => {
    const style = SERIES_STYLES[i % SERIES_STYLES.length]!;
    const g = canvas.svg.append('g').attr('data-series', s.name);
    const pts = s.points.filter((p) => Number.isFinite(p.x) && Number.isFinite(p.y) && (opts.x.kind === 'linear' || p.x > 0) && (opts.y.kind === 'linear' || p.y > 0));
    const d = pts.map((p, k) => `${k === 0 ? 'M' : 'L'}${round(frame.x(p.x))},${round(frame.y(p.y))}`).join('');
    if (d) {
      const path = g.append('path').attr('d', d).attr('fill', 'none').attr('stroke', style.stroke).attr('stroke-width', 1.4);
      if (style.dash) path.attr('stroke-dasharray', style.dash);
    }
    if (s.markers) {
      for (const p of pts) g.append('circle').attr('cx', round(frame.x(p.x))).attr('cy', round(frame.y(p.y))).attr('r', 2).attr('fill', i === 0 ? ACCENT : style.stroke);
    }
  });

  if (showLegend) {
    drawLegend(
      canvas.svg,
      frame.left,
      top + frameHeight + BELOW_FRAME + 2,
      series.map((s, i) => ({ name: s.name, ...SERIES_STYLES[i % SERIES_STYLES.length]! })),
    );
  }
  return { svg: serialize(canvas), width: canvas.width, height: canvas.height };
}
