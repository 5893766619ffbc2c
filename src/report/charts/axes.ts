/**
 * Axes for the result charts (sensitivity, uncertainty, forecast): a linear or logarithmic scale
 * with round-number ends and ticks, and the frame, grid, tick labels and titles drawn on a canvas.
 *
 * Layout only: the values plotted are the analysis's numbers; what is computed here is the axis
 * range (round numbers around the data), tick positions and the transform to points. Tick labels
 * go through the report's format module, like every other number in the appendix.
 */
import type { D3Selection } from 'd3-node';
import { INK, MUTED, RULE, round, text } from '../diagram/canvas.js';
import { textWidth } from '../diagram/text.js';
import { formatNumber, formatProbability } from '../format.js';

export const FONT = 7;

/** Room right of the frame, for the last x tick label. */
export const RIGHT = 24;

export interface Axis {
  kind: 'linear' | 'log';
  domain: [number, number];
  ticks: { value: number; label: string }[];
  title: string;
}

const STEPS = [1, 2, 5];

/** The largest 1-2-5 number ≤ x (x > 0). */
function floorNice(x: number): number {
  const d = Math.pow(10, Math.floor(Math.log10(x) + 1e-12));
  return d * [...STEPS].reverse().find((m) => m * d <= x * (1 + 1e-12))!;
}

/** The smallest 1-2-5 number ≥ x (x > 0). */
function ceilNice(x: number): number {
  const d = Math.pow(10, Math.floor(Math.log10(x) - 1e-12));
  const m = STEPS.find((k) => k * d >= x * (1 - 1e-12));
  return m === undefined ? 10 * d : m * d;
}

/**
 * A log axis over the positive values: ends on the 1-2-5 grid; ticks at 1, 2 and 5 × 10^k when the
 * range spans up to two decades, at every decade beyond that.
 */
export function logAxis(values: number[], title: string, format: (x: number) => string = formatProbability): Axis {
  const positive = values.filter((v) => v > 0 && Number.isFinite(v));
  let lo = positive.length ? Math.min(...positive) : 1e-6;
  let hi = positive.length ? Math.max(...positive) : 1;
  if (hi === lo) {
    lo /= 2;
    hi *= 2;
  }
  const decades = Math.log10(hi / lo);
  const domain: [number, number] =
    decades > 2 ? [Math.pow(10, Math.floor(Math.log10(lo) + 1e-12)), Math.pow(10, Math.ceil(Math.log10(hi) - 1e-12))] : [floorNice(lo), ceilNice(hi)];
  const ticks: Axis['ticks'] = [];
  const steps = Math.log10(domain[1] / domain[0]) > 2 ? [1] : STEPS;
  for (let k = Math.floor(Math.log10(domain[0]) + 1e-12); k <= Math.ceil(Math.log10(domain[1]) - 1e-12); k++) {
    for (const m of steps) {
      const v = m * Math.pow(10, k);
      if (v >= domain[0] * (1 - 1e-9) && v <= domain[1] * (1 + 1e-9)) ticks.push({ value: v, label: format(v) });
    }
  }
  return { kind: 'log', domain, ticks, title };
}

/** A linear axis: a 1-2-5 step giving about five intervals, ends on multiples of it (from 0 if `zero`). */
export function linearAxis(values: number[], title: string, opts: { zero?: boolean; format?: (x: number) => string } = {}): Axis {
  const finite = values.filter((v) => Number.isFinite(v));
  let lo = finite.length ? Math.min(...finite) : 0;
  let hi = finite.length ? Math.max(...finite) : 1;
  if (opts.zero) lo = Math.min(0, lo);
  if (hi === lo) {
    const pad = hi === 0 ? 1 : Math.abs(hi) / 2;
    lo -= opts.zero && lo === 0 ? 0 : pad;
    hi += pad;
  }
  const step = ceilNice((hi - lo) / 5);
  const start = Math.floor(lo / step + 1e-9) * step;
  const end = Math.ceil(hi / step - 1e-9) * step;
  const format = opts.format ?? formatNumber;
  const ticks: Axis['ticks'] = [];
  for (let k = 0; start + k * step <= end + step * 1e-9; k++) {
    // Rebuild each tick from its index so 0.1 + 0.2 does not print as 0.30000000000000004.
    const v = Number((start + k * step).toPrecision(12));
    ticks.push({ value: v, label: format(v) });
  }
  return { kind: 'linear', domain: [start, end], ticks, title };
}

/** An axis with ticks chosen by the caller (e.g. the exercise intervals by name). */
export function withTicks(axis: Axis, ticks: { value: number; label: string }[]): Axis {
  return { ...axis, ticks: ticks.filter((t) => t.value >= axis.domain[0] * (1 - 1e-9) && t.value <= axis.domain[1] * (1 + 1e-9)) };
}

export interface Frame {
  left: number;
  top: number;
  width: number;
  height: number;
  x(v: number): number;
  y(v: number): number;
}

function position(axis: Axis, v: number, from: number, length: number): number {
  const [a, b] = axis.domain;
  const t = axis.kind === 'log' ? Math.log(v / a) / Math.log(b / a) : (v - a) / (b - a);
  return from + t * length;
}

/** Room the y tick labels need on the left (widest label, the rotated title beside it). */
export function leftMargin(y: Axis): number {
  const widest = Math.max(0, ...y.ticks.map((t) => textWidth(t.label, FONT)));
  return Math.ceil(widest + 8 + FONT + 8);
}

export function makeFrame(left: number, top: number, width: number, height: number, x: Axis, y: Axis): Frame {
  return {
    left,
    top,
    width,
    height,
    x: (v) => position(x, v, left, width),
    // SVG y grows downwards: the low end of the axis is at the bottom.
    y: (v) => position(y, v, top + height, -height),
  };
}

/** Grid lines, the frame, tick labels and the two axis titles. */
export function drawAxes(svg: D3Selection, frame: Frame, x: Axis, y: Axis): void {
  const g = svg.append('g').attr('data-part', 'axes');
  const bottom = frame.top + frame.height;
  const right = frame.left + frame.width;
  for (const t of x.ticks) {
    const px = frame.x(t.value);
    g.append('line').attr('x1', round(px)).attr('y1', round(frame.top)).attr('x2', round(px)).attr('y2', round(bottom)).attr('stroke', RULE).attr('stroke-width', 0.3);
    text(g, px, bottom + FONT + 4, t.label, FONT, { fill: INK });
  }
  for (const t of y.ticks) {
    const py = frame.y(t.value);
    g.append('line').attr('x1', round(frame.left)).attr('y1', round(py)).attr('x2', round(right)).attr('y2', round(py)).attr('stroke', RULE).attr('stroke-width', 0.3);
    text(g, frame.left - 4, py + FONT / 3, t.label, FONT, { anchor: 'end', fill: INK });
  }
  g.append('rect')
    .attr('x', round(frame.left))
    .attr('y', round(frame.top))
    .attr('width', round(frame.width))
    .attr('height', round(frame.height))
    .attr('fill', 'none')
    .attr('stroke', MUTED)
    .attr('stroke-width', 0.8);
  text(g, frame.left + frame.width / 2, bottom + 2 * FONT + 9, x.title, FONT, { fill: MUTED });
  const widest = Math.max(0, ...y.ticks.map((t) => textWidth(t.label, FONT)));
  const tx = round(frame.left - widest - 10);
  const ty = round(frame.top + frame.height / 2);
  text(g, tx, ty, y.title, FONT, { fill: MUTED }).attr('transform', `rotate(-90 ${tx} ${ty})`);
}

/** Height below the frame taken by the x tick labels and title. */
export const BELOW_FRAME = 2 * FONT + 14;

/** Line styles told apart by dash as well as colour, so the charts read in black and white. */
export const SERIES_STYLES: { stroke: string; dash?: string }[] = [
  { stroke: '#2b4c7e' },
  { stroke: INK, dash: '6 3' },
  { stroke: '#8a4f0f', dash: '1.5 2' },
  { stroke: MUTED, dash: '6 2 1.5 2' },
  { stroke: '#2b4c7e', dash: '3 2' },
];

/** A legend below the chart, one entry per line: a short stroke in the series' style and its name. */
export function drawLegend(svg: D3Selection, left: number, top: number, entries: { name: string; stroke: string; dash?: string; fill?: string }[]): number {
  const g = svg.append('g').attr('data-part', 'legend');
  entries.forEach((e, i) => {
    const y = top + i * (FONT + 5) + FONT;
    if (e.fill) {
      g.append('rect').attr('x', round(left)).attr('y', round(y - FONT + 1)).attr('width', 16).attr('height', FONT - 1).attr('fill', e.fill);
    } else {
      const l = g.append('line').attr('x1', round(left)).attr('y1', round(y - FONT / 3)).attr('x2', round(left + 16)).attr('y2', round(y - FONT / 3)).attr('stroke', e.stroke).attr('stroke-width', 1.4);
      if (e.dash) l.attr('stroke-dasharray', e.dash);
    }
    text(g, left + 22, y, e.name, FONT, { anchor: 'start', fill: INK });
  });
  return entries.length * (FONT + 5);
}
