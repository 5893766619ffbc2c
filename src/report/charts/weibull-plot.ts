/**
 * A Weibull probability plot ("Weibull paper") of one life-data fit, as SVG.
 *
 * Axes: x = ln(life), decade ticks labelled in years; y = ln(−ln(1 − F)), ticks labelled as percent
 * unreliability. On this paper a two-parameter Weibull is a straight line of slope β that crosses
 * F = 63.2% at t = η (common practice, no source), which is why the paper is drawn this way.
 *
 * Everything drawn comes from the FitResult: the median-rank points, the fitted line and its bounds
 * on F(t) are the analysis's numbers. What is computed here is layout only: the axis ranges (round
 * numbers around the data), tick positions, the transform to paper coordinates and the clipping of
 * lines to the plotting area.
 */
import type { D3Selection } from 'd3-node';
import type { FitResult } from '../../analysis/results.js';
import { ACCENT, INK, MUTED, RULE, createCanvas, round, serialize, text } from '../diagram/canvas.js';
import { textWidth, wrap } from '../diagram/text.js';
import { formatDuration, formatNumber, formatRatio } from '../format.js';
import type { FigurePart } from '../view.js';

export interface WeibullPlotOptions {
  /** Width of the figure in points (1 SVG unit = 1 pt); the height follows from it. */
  width: number;
  /** Accessible label and SVG title, e.g. "Figure 12.1. Weibull probability plot of motor-life". */
  label: string;
}

/** Unreliability ticks of the paper; those outside the plotted range are left out. */
const F_TICKS = [0.0001, 0.0002, 0.0005, 0.001, 0.002, 0.005, 0.01, 0.02, 0.05, 0.1, 0.2, 0.3, 0.5, 0.632, 0.8, 0.9, 0.99, 0.999];
/** F = 1 − e⁻¹: every Weibull passes here at t = η (common practice, no source); 0.632 is its label. */
const F_AT_SCALE = 1 - Math.exp(-1);

const FONT = 7.5;
const SMALL = 6.8;

/** ln(−ln(1 − F)), the Weibull paper's ordinate. */
function paperY(F: number): number {
  return Math.log(-Math.log1p(-F));
}

interface Frame {
  left: number;
  top: number;
  width: number;
  height: number;
  /** Paper coordinates (ln t, ln(−ln(1 − F))) → SVG points. */
  x(t: number): number;
  y(F: number): number;
}

/** Axis ends are taken from these steps in each decade, so the range is no wider than the data need. */
const AXIS_STEPS = [1, 2, 3, 5];

/**
 * The life range: from an axis step at or below the shortest plotted life to one at or above the
 * longest life or η (the line's reference point), each with a quarter of room, so no point sits on
 * the frame.
 */
function lifeRange(fit: FitResult): [number, number] {
  const lives = [...fit.points.map((p) => p.t), fit.scale + (fit.location ?? 0)].filter((t) => t > 0 && Number.isFinite(t));
  if (lives.length === 0) return [1, 100];
  const lo = Math.min(...lives) / 1.25;
  const hi = Math.max(...lives) * 1.25;
  const below = (x: number): number => {
    const d = Math.pow(10, Math.floor(Math.log10(x) + 1e-12));
    return d * [...AXIS_STEPS].reverse().find((m) => m * d <= x * (1 + 1e-12))!;
  };
  const above = (x: number): number => {
    const d = Math.pow(10, Math.floor(Math.log10(x) - 1e-12));
    const m = AXIS_STEPS.find((k) => k * d >= x * (1 - 1e-12));
    return m === undefined ? 10 * d : m * d;
  };
  return [below(lo), above(hi)];
}

/**
 * From a paper tick clearly below the lowest point (1% at most; the room keeps a point off the
 * frame) to 99%, or 99.9% if a point is above 99%.
 */
function unreliabilityRange(fit: FitResult): [number, number] {
  const Fs = fit.points.map((p) => p.F).filter((F) => F > 0 && F < 1);
  const low = Math.min(0.01, ...Fs.map((F) => F * 0.8));
  const bottom = [...F_TICKS].reverse().find((f) => f <= low * (1 + 1e-9)) ?? F_TICKS[0]!;
  const top = Math.max(...Fs, 0) > 0.99 ? 0.999 : 0.99;
  return [bottom, top];
}

/** The fitted line and bounds, clipped to the plotting area (Liang–Barsky on each segment). */
function clippedPath(frame: Frame, pts: { t: number; F: number }[]): string {
  const xy = pts.filter((p) => p.t > 0 && p.F > 0 && p.F < 1).map((p) => [frame.x(p.t), frame.y(p.F)] as const);
  const x0 = frame.left;
  const x1 = frame.left + frame.width;
  const y0 = frame.top;
  const y1 = frame.top + frame.height;
  let d = '';
  let penAt: readonly [number, number] | undefined;
  for (let i = 1; i < xy.length; i++) {
    const [ax, ay] = xy[i - 1]!;
    const [bx, by] = xy[i]!;
    const dx = bx - ax;
    const dy = by - ay;
    let u0 = 0;
    let u1 = 1;
    let inside = true;
    for (const [p, q] of [
      [-dx, ax - x0],
      [dx, x1 - ax],
      [-dy, ay - y0],
      [dy, y1 - ay],
    ] as const) {
      if (p === 0) {
        if (q < 0) inside = false;
        continue;
      }
      const r = q / p;
      if (p < 0) u0 = Math.max(u0, r);
      else u1 = Math.min(u1, r);
    }
    if (!inside || u0 > u1) {
      penAt = undefined;
      continue;
    }
    const s = [round(ax + u0 * dx), round(ay + u0 * dy)] as const;
    const e = [round(ax + u1 * dx), round(ay + u1 * dy)] as const;
    if (!penAt || penAt[0] !== s[0] || penAt[1] !== s[1]) d += `M${s[0]},${s[1]}`;
    d += `L${e[0]},${e[1]}`;
    penAt = u1 < 1 ? undefined : e;
  }
  return d;
}

function line(g: D3Selection, x1: number, y1: number, x2: number, y2: number, stroke: string, width: number, dash?: string): void {
  const l = g.append('line').attr('x1', round(x1)).attr('y1', round(y1)).attr('x2', round(x2)).attr('y2', round(y2)).attr('stroke', stroke).attr('stroke-width', width);
  if (dash) l.attr('stroke-dasharray', dash);
}

/** How each drawn series looks: the bounds differ from the line and from each other by dash, not colour. */
const STYLE = {
  fitted: { stroke: ACCENT, width: 1.4 },
  upper: { stroke: INK, width: 0.9, dash: '6 3' },
  lower: { stroke: INK, width: 0.9, dash: '1.5 2' },
} as const;

/** The fit methods in words, for the plot and the fits section. */
export const METHOD_WORDS: Record<FitResult['method'], string> = { mle: 'maximum likelihood', rank: 'median-rank regression' };

/** Percent of a one-sided bound level, e.g. 0.9 → "90%". */
export function levelText(level: number): string {
  return `${formatNumber(level * 100)}%`;
}

/** The line under the plot: the estimates and what the bounds are. */
export function plotCaptionLine(fit: FitResult): string {
  const location = fit.location !== undefined ? `, γ = ${formatDuration(fit.location)}` : '';
  return (
    `β = ${formatRatio(fit.shape)}, η = ${formatDuration(fit.scale)}${location} (${METHOD_WORDS[fit.method]}); ` +
    `normal-approximation (Fisher information) bounds on F(t), one-sided ${levelText(fit.level)} each: a two-sided ${levelText(2 * fit.level - 1)} band`
  );
}

export function weibullPlot(fit: FitResult, opts: WeibullPlotOptions): FigurePart {
  const W = opts.width;
  const margin = { left: 50, right: 14, top: 12 };
  const plotWidth = W - margin.left - margin.right;
  const plotHeight = Math.round(plotWidth * 0.68);
  const [tMin, tMax] = lifeRange(fit);
  const [fMin, fMax] = unreliabilityRange(fit);
  const lx0 = Math.log(tMin);
  const lx1 = Math.log(tMax);
  const ly0 = paperY(fMin);
  const ly1 = paperY(fMax);
  const frame: Frame = {
    left: margin.left,
    top: margin.top,
    width: plotWidth,
    height: plotHeight,
    x: (t) => margin.left + ((Math.log(t) - lx0) / (lx1 - lx0)) * plotWidth,
    y: (F) => margin.top + plotHeight - ((paperY(F) - ly0) / (ly1 - ly0)) * plotHeight,
  };
  const bottom = margin.top + plotHeight;

  const caption = plotCaptionLine(fit);
  const captionLines = wrap(caption, W - 12, SMALL, 3);
  const legendTop = bottom + 34;
  const legendRow = 12;
  const height = legendTop + 2 * legendRow + 4 + captionLines.length * 9 + 4;
  const canvas = createCanvas(W, height, opts.label);
  const svg = canvas.svg;
  svg.append('rect').attr('x', 0).attr('y', 0).attr('width', canvas.width).attr('height', canvas.height).attr('fill', '#ffffff');

  // Grid: horizontal lines at the unreliability ticks, vertical ones at each decade and its 2…9 multiples.
  const grid = svg.append('g').attr('data-series', 'grid');
  // Ticks at every decade and its 2…9 multiples inside the range; decades labelled, and 2 and 5 too
  // (and the range's ends) when the axis spans little more than two decades, so it never has too few labels.
  const span = Math.log10(tMax / tMin);
  const xTicks: { t: number; major: boolean; label: boolean }[] = [];
  for (let d = Math.floor(Math.log10(tMin) + 1e-12); Math.pow(10, d) <= tMax * (1 + 1e-12); d++) {
    for (let m = 1; m <= 9; m++) {
      const t = m * Math.pow(10, d);
      if (t < tMin * (1 - 1e-12) || t > tMax * (1 + 1e-12)) continue;
      const end = Math.abs(t / tMin - 1) < 1e-9 || Math.abs(t / tMax - 1) < 1e-9;
      xTicks.push({ t, major: m === 1, label: m === 1 || (span <= 2.5 && (m === 2 || m === 5 || end)) });
    }
  }
  for (const tick of xTicks) {
    const x = frame.x(tick.t);
    line(grid, x, margin.top, x, bottom, RULE, tick.major ? 0.6 : 0.25);
  }
  const yTicks = F_TICKS.filter((f) => f >= fMin * (1 - 1e-9) && f <= fMax * (1 + 1e-9));
  for (const f of yTicks) {
    const y = frame.y(f === 0.632 ? F_AT_SCALE : f);
    // 63.2% is where the line meets η: drawn darker than the other grid lines, but solid, so it is not taken for a bound.
    line(grid, margin.left, y, margin.left + plotWidth, y, f === 0.632 ? MUTED : RULE, f === 0.632 ? 0.8 : 0.35);
  }
  svg.append('rect').attr('x', margin.left).attr('y', margin.top).attr('width', plotWidth).attr('height', plotHeight).attr('fill', 'none').attr('stroke', INK).attr('stroke-width', 0.8);

  // Tick labels.
  const axes = svg.append('g').attr('data-series', 'axes');
  for (const tick of xTicks.filter((t) => t.label)) {
    const x = frame.x(tick.t);
    line(axes, x, bottom, x, bottom + (tick.major ? 3.5 : 2), INK, 0.6);
    text(axes, x, bottom + 12, formatNumber(tick.t), tick.major ? FONT : SMALL, { fill: tick.major ? INK : MUTED });
  }
  for (const f of yTicks) {
    const y = frame.y(f === 0.632 ? F_AT_SCALE : f);
    line(axes, margin.left - 3, y, margin.left, y, INK, 0.6);
    text(axes, margin.left - 5, y + 2.6, `${formatNumber(f * 100)}%`, FONT, { anchor: 'end' });
  }
  text(axes, margin.left + plotWidth / 2, bottom + 25, 'Life, years (logarithmic scale)', FONT, { fill: MUTED });
  const yTitle = 'fraction failed, F(t) — on a ln(−ln(1 − F)) scale';
  text(axes, 0, 0, yTitle, FONT, { fill: MUTED }).attr('transform', `translate(9,${round(margin.top + plotHeight / 2)}) rotate(-90)`);

  // Bounds first, then the fitted line, then the points on top.
  const series = (name: keyof typeof STYLE, key: 'F' | 'lower' | 'upper') => {
    const style = STYLE[name];
    const d = clippedPath(
      frame,
      fit.curve.map((c) => ({ t: c.t, F: c[key] })),
    );
    const p = svg.append('path').attr('data-series', name).attr('d', d).attr('fill', 'none').attr('stroke', style.stroke).attr('stroke-width', style.width);
    if ('dash' in style) p.attr('stroke-dasharray', style.dash);
  };
  series('upper', 'upper');
  series('lower', 'lower');
  series('fitted', 'F');
  const points = svg.append('g').attr('data-series', 'points');
  for (const p of fit.points) {
    if (!(p.t > 0 && p.F > 0 && p.F < 1)) continue;
    points
      .append('circle')
      .attr('cx', round(frame.x(p.t)))
      .attr('cy', round(frame.y(p.F)))
      .attr('r', 2.3)
      .attr('fill', '#ffffff')
      .attr('stroke', INK)
      .attr('stroke-width', 0.9);
  }

  // Legend under the axis title: two columns, two rows; each sample drawn as in the plot.
  const legend = svg.append('g').attr('data-series', 'legend');
  const level = levelText(fit.level);
  const entries: { label: string; draw: (x: number, y: number) => void }[] = [
    {
      label: `Failures at their median ranks (${fit.failures})`,
      draw: (x, y) => {
        legend.append('circle').attr('cx', round(x + 11)).attr('cy', round(y)).attr('r', 2.3).attr('fill', '#ffffff').attr('stroke', INK).attr('stroke-width', 0.9);
      },
    },
    { label: `Fitted Weibull, ${METHOD_WORDS[fit.method]}`, draw: (x, y) => line(legend, x, y, x + 22, y, STYLE.fitted.stroke, STYLE.fitted.width) },
    { label: `Upper ${level} bound on F(t)`, draw: (x, y) => line(legend, x, y, x + 22, y, STYLE.upper.stroke, STYLE.upper.width, STYLE.upper.dash) },
    { label: `Lower ${level} bound on F(t)`, draw: (x, y) => line(legend, x, y, x + 22, y, STYLE.lower.stroke, STYLE.lower.width, STYLE.lower.dash) },
  ];
  const columnWidth = Math.max(...entries.map((e) => textWidth(e.label, SMALL))) + 34;
  const legendLeft = Math.max(6, margin.left + (plotWidth - 2 * columnWidth) / 2);
  entries.forEach((e, i) => {
    const x = legendLeft + (i % 2) * columnWidth;
    const y = legendTop + Math.floor(i / 2) * legendRow;
    e.draw(x, y);
    text(legend, x + 28, y + 2.4, e.label, SMALL, { anchor: 'start' });
  });

  const captionTop = legendTop + 2 * legendRow + 6;
  const captionGroup = svg.append('g').attr('data-series', 'caption');
  captionLines.forEach((l, i) => text(captionGroup, W / 2, captionTop + i * 9, l, SMALL, { fill: INK }));
  return { svg: serialize(canvas), width: canvas.width, height: canvas.height };
}
