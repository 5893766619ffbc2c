import { ACCENT, INK, MUTED, RULE, createCanvas, round, serialize, text } from '../diagram/canvas.js';
import { wrap } from '../diagram/text.js';
import type { FigurePart } from '../view.js';

/**
 * A horizontal bar chart: one labelled bar per item, longest first as given, with the printed
 * value at the end of each bar. Bar lengths are layout arithmetic on values the analysis computed;
 * the value labels are formatted by the caller, so they match the tables.
 */
export interface Bar {
  label: string;
  value: number;
  /** The value as printed in the tables. */
  text: string;
}

export function barChart(bars: Bar[], opts: { width: number; caption: string; axis: string }): FigurePart {
  const labelWidth = 128;
  const valueWidth = 52;
  const barHeight = 11;
  const gap = 5;
  const top = 8;
  const axisRoom = 24;
  const plotLeft = labelWidth + 8;
  const plotWidth = opts.width - plotLeft - valueWidth - 6;
  const height = top + bars.length * (barHeight + gap) + axisRoom;
  const canvas = createCanvas(opts.width, height, opts.caption);
  const max = Math.max(...bars.map((b) => (Number.isFinite(b.value) ? b.value : 0)), 0);
  const scale = max > 0 ? plotWidth / max : 0;
  const plotBottom = top + bars.length * (barHeight + gap);
  // Light vertical guides at quarters of the longest bar.
  for (let q = 0; q <= 4; q++) {
    const x = plotLeft + (plotWidth * q) / 4;
    canvas.svg
      .append('line')
      .attr('x1', round(x))
      .attr('y1', top - 3)
      .attr('x2', round(x))
      .attr('y2', round(plotBottom))
      .attr('stroke', RULE)
      .attr('stroke-width', q === 0 ? 0.8 : 0.3);
  }
  bars.forEach((b, i) => {
    const y = top + i * (barHeight + gap);
    const g = canvas.svg.append('g').attr('data-bar', b.label);
    const label = wrap(b.label, labelWidth, 7, 1)[0] ?? '';
    text(g, labelWidth, y + barHeight - 2.5, label, 7, { anchor: 'end' });
    const w = Math.max(0.5, (Number.isFinite(b.value) ? b.value : 0) * scale);
    g.append('rect').attr('x', plotLeft).attr('y', round(y)).attr('width', round(w)).attr('height', barHeight).attr('fill', ACCENT);
    text(g, plotLeft + w + 4, y + barHeight - 2.5, b.text, 7, { anchor: 'start', fill: INK });
  });
  text(canvas.svg, plotLeft + plotWidth / 2, height - 6, opts.axis, 7, { fill: MUTED });
  return { svg: serialize(canvas), width: canvas.width, height: canvas.height };
}
