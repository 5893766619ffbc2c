// The Weibull probability plot read back from its SVG: the axes are calibrated from the labelled
// ticks, and what is drawn is compared with the fit it was given and with @stdlib's Weibull CDF.
import { describe, expect, it } from 'vitest';
import weibullCdf from '@stdlib/stats-base-dists-weibull-cdf';
import type { FitResult } from '../../src/analysis/results.js';
import { weibullPlot } from '../../src/report/charts/weibull-plot.js';
import { analyzeStudy, buildStudy, onlyFit } from './study.js';

const cdf = (t: number, shape: number, scale: number): number => weibullCdf(t, shape, scale) as number;
/** The Weibull paper's ordinate (common practice, no source). */
const paperY = (F: number): number => Math.log(-Math.log(1 - F));

interface Drawn {
  svg: string;
  frame: { left: number; right: number; top: number; bottom: number };
  xTicks: { x: number; label: string }[];
  yTicks: { y: number; label: string }[];
  circles: { x: number; y: number }[];
  paths: Record<string, { d: string; dash?: string; xy: [number, number][] }>;
  texts: string[];
}

function attr(tag: string, name: string): string | undefined {
  return new RegExp(`\\s${name}="([^"]*)"`).exec(tag)?.[1];
}

function group(svg: string, series: string): string {
  const start = svg.indexOf(`<g data-series="${series}"`);
  if (start < 0) throw new Error(`no group ${series}`);
  return svg.slice(start, svg.indexOf('</g>', start));
}

/** Reads what the plot drew: the frame, the labelled ticks (tick mark + label pairs), circles and paths. */
function read(svg: string): Drawn {
  const grid = [...group(svg, 'grid').matchAll(/<line [^>]*>/g)].map((m) => m[0]);
  const num = (tag: string, name: string) => Number(attr(tag, name));
  const vertical = grid.filter((l) => num(l, 'x1') === num(l, 'x2'));
  const horizontal = grid.filter((l) => num(l, 'y1') === num(l, 'y2'));
  const frame = {
    left: Math.min(...horizontal.map((l) => num(l, 'x1'))),
    right: Math.max(...horizontal.map((l) => num(l, 'x2'))),
    top: Math.min(...vertical.map((l) => num(l, 'y1'))),
    bottom: Math.max(...vertical.map((l) => num(l, 'y2'))),
  };
  const xTicks: Drawn['xTicks'] = [];
  const yTicks: Drawn['yTicks'] = [];
  const axis = group(svg, 'axes');
  for (const m of axis.matchAll(/(<line [^>]*>)<\/line><text [^>]*>([^<]*)<\/text>/g)) {
    const l = m[1]!;
    if (num(l, 'x1') === num(l, 'x2')) xTicks.push({ x: num(l, 'x1'), label: m[2]! });
    else yTicks.push({ y: num(l, 'y1'), label: m[2]! });
  }
  const circles = [...group(svg, 'points').matchAll(/<circle [^>]*>/g)].map((m) => ({ x: num(m[0], 'cx'), y: num(m[0], 'cy') }));
  const paths: Drawn['paths'] = {};
  for (const m of svg.matchAll(/<path data-series="([a-z]+)"[^>]*>/g)) {
    const d = attr(m[0], 'd') ?? '';
    const xy = [...d.matchAll(/[ML](-?[\d.]+),(-?[\d.]+)/g)].map((p) => [Number(p[1]), Number(p[2])] as [number, number]);
    const dash = attr(m[0], 'stroke-dasharray');
    paths[m[1]!] = { d, xy, ...(dash ? { dash } : {}) };
  }
  const texts = [...svg.matchAll(/<text [^>]*>([^<]*)<\/text>/g)].map((m) => m[1]!);
  return { svg, frame, xTicks, yTicks, circles, paths, texts };
}

/** Paper coordinates from two labelled ticks on each axis: x ↔ ln t, y ↔ ln(−ln(1 − F)). */
function calibrate(drawn: Drawn, x: [string, number, string, number], y: [string, number, string, number]) {
  const xa = drawn.xTicks.find((t) => t.label === x[0])!.x;
  const xb = drawn.xTicks.find((t) => t.label === x[2])!.x;
  const ya = drawn.yTicks.find((t) => t.label === y[0])!.y;
  const yb = drawn.yTicks.find((t) => t.label === y[2])!.y;
  const lnT = (px: number) => Math.log(x[1]) + ((px - xa) / (xb - xa)) * (Math.log(x[3]) - Math.log(x[1]));
  const w = (py: number) => paperY(y[1]) + ((py - ya) / (yb - ya)) * (paperY(y[3]) - paperY(y[1]));
  const yOf = (F: number) => ya + ((paperY(F) - paperY(y[1])) / (paperY(y[3]) - paperY(y[1]))) * (yb - ya);
  return { lnT, w, yOf };
}

function referenceFit(): FitResult {
  return onlyFit(analyzeStudy(buildStudy()).results);
}

describe('Weibull probability plot of the reference fit', () => {
  const fit = referenceFit();
  const drawn = read(weibullPlot(fit, { width: 460, label: 'Figure 1.1. Weibull probability plot of bearing-life' }).svg);
  const { lnT, w, yOf } = calibrate(drawn, ['10', 10, '100', 100], ['1%', 0.01, '90%', 0.9]);

  it('labels the unreliability axis in percent, 1% to 99%, and the life axis in decades of years', () => {
    // The lowest point is Benard's (1 − 0.3)/23.4 = 3.0%, so the paper runs from 1% (README: Benard).
    expect(drawn.yTicks.map((t) => t.label)).toEqual(['1%', '2%', '5%', '10%', '20%', '30%', '50%', '63.2%', '80%', '90%', '99%']);
    expect(drawn.xTicks.map((t) => t.label)).toEqual(expect.arrayContaining(['10', '100']));
    expect(drawn.texts).toContain('Life, years (logarithmic scale)');
    // Ticks run the right way: life grows to the right, unreliability upwards.
    const xs = drawn.xTicks.map((t) => t.x);
    expect([...xs].sort((a, b) => a - b)).toEqual(xs);
    const ys = drawn.yTicks.map((t) => t.y);
    expect([...ys].sort((a, b) => b - a)).toEqual(ys);
  });

  it('puts the ticks where Weibull paper has them: equal steps of ln t and of ln(−ln(1 − F))', () => {
    for (const t of drawn.xTicks) expect(Math.exp(lnT(t.x)) / Number(t.label) - 1).toBeLessThan(1e-3);
    for (const t of drawn.yTicks) {
      // 63.2% stands for F = 1 − e⁻¹, where every Weibull is at t = η (README, common practice).
      const F = t.label === '63.2%' ? 1 - Math.exp(-1) : Number(t.label.replace('%', '')) / 100;
      expect(Math.abs(w(t.y) - paperY(F))).toBeLessThan(1e-3);
    }
  });

  it('draws one circle per failure at its median rank', () => {
    expect(drawn.circles).toHaveLength(fit.points.length);
    drawn.circles.forEach((c, i) => {
      expect(Math.exp(lnT(c.x)) / fit.points[i]!.t - 1).toBeLessThan(1e-3);
      expect(Math.abs(w(c.y) - paperY(fit.points[i]!.F))).toBeLessThan(1e-3);
    });
  });

  it('draws the fitted Weibull as the straight line of slope β through (η, 63.2%)', () => {
    const line = drawn.paths.fitted!;
    expect(line.dash).toBeUndefined();
    expect(line.xy.length).toBeGreaterThan(10);
    // Every vertex lies on the fitted CDF (@stdlib), to the 0.01 pt the coordinates are rounded to.
    for (const [x, y] of line.xy) expect(Math.abs(w(y) - paperY(cdf(Math.exp(lnT(x)), fit.shape, fit.scale)))).toBeLessThan(2e-3);
    // A straight line on the paper with slope β (common practice, no source).
    const [x0, y0] = line.xy[0]!;
    const [x1, y1] = line.xy[line.xy.length - 1]!;
    expect((w(y1) - w(y0)) / (lnT(x1) - lnT(x0)) / fit.shape - 1).toBeLessThan(1e-3);
    // It meets the 63.2% line at t = η.
    const y632 = yOf(1 - Math.exp(-1));
    const k = line.xy.findIndex(([, y]) => y < y632);
    const [ax, ay] = line.xy[k - 1]!;
    const [bx, by] = line.xy[k]!;
    const xCross = ax + ((y632 - ay) / (by - ay)) * (bx - ax);
    expect(Math.exp(lnT(xCross)) / fit.scale - 1).toBeLessThan(1e-3);
  });

  it('draws both bounds on F(t) dashed, each differently, on either side of the line, inside the frame', () => {
    const { upper, lower, fitted } = drawn.paths;
    expect(upper!.dash).toBeDefined();
    expect(lower!.dash).toBeDefined();
    expect(upper!.dash).not.toBe(lower!.dash);
    for (const [x, y] of upper!.xy) expect(w(y)).toBeGreaterThan(paperY(cdf(Math.exp(lnT(x)), fit.shape, fit.scale)));
    for (const [x, y] of lower!.xy) expect(w(y)).toBeLessThan(paperY(cdf(Math.exp(lnT(x)), fit.shape, fit.scale)));
    const f = drawn.frame;
    for (const p of [upper!, lower!, fitted!]) {
      for (const [x, y] of p.xy) {
        expect(x).toBeGreaterThanOrEqual(f.left - 0.01);
        expect(x).toBeLessThanOrEqual(f.right + 0.01);
        expect(y).toBeGreaterThanOrEqual(f.top - 0.01);
        expect(y).toBeLessThanOrEqual(f.bottom + 0.01);
      }
    }
  });

  it('has a legend and a caption line with β, η and the bound level', () => {
    const legend = group(drawn.svg, 'legend');
    expect(legend).toContain('Failures at their median ranks (23)');
    expect(legend).toContain('Fitted Weibull, maximum likelihood');
    expect(legend).toContain('Upper 90% bound on F(t)');
    expect(legend).toContain('Lower 90% bound on F(t)');
    const caption = group(drawn.svg, 'caption');
    // Published β̂ = 2.102 and η̂ = 81.88 (Lawless 2003, from memory; README), as the report rounds them.
    expect(caption).toContain('β = 2.10');
    expect(caption).toContain('η = 81.88 years');
    expect(caption).toContain('one-sided 90%');
    expect(caption).toContain('two-sided 80%');
  });

  it('is the same SVG every time, sized in points, and names itself', () => {
    const again = weibullPlot(fit, { width: 460, label: 'Figure 1.1. Weibull probability plot of bearing-life' });
    expect(again.svg).toBe(drawn.svg);
    expect(again.width).toBe(460);
    expect(drawn.svg).toMatch(/^<svg [^>]*width="460pt"/);
    expect(drawn.svg).toContain('<title>Figure 1.1. Weibull probability plot of bearing-life</title>');
    expect(drawn.svg).not.toMatch(/NaN|Infinity/);
  });
});

describe('Weibull probability plot layout on other data', () => {
  /**
   * An INVENTED fit for layout only (no analysis behind it): early failures of a large fleet, so the
   * plotted F stays below 1%, and a shape below 1. Points and curve follow @stdlib's CDF so that the
   * picture is self-consistent; bounds are the line shifted on the paper.
   */
  function inventedFit(): FitResult {
    const shape = 0.8;
    const scale = 4000;
    const points = [0.3, 1.1, 2.6, 5.0, 9.0].map((t) => ({ t, F: cdf(t, shape, scale) }));
    const curve = Array.from({ length: 30 }, (_, i) => {
      const t = 0.05 * Math.pow(40 / 0.05, i / 29);
      const v = paperY(cdf(t, shape, scale));
      const back = (x: number) => 1 - Math.exp(-Math.exp(x));
      return { t, F: cdf(t, shape, scale), lower: back(v - 0.6), upper: back(v + 0.6) };
    });
    return {
      id: 'invented', data: 'data/invented.csv', method: 'rank', provenance: 'invented for a layout test',
      rows: 500, n: 500, failures: 5, suspensions: 495, shape, scale, b10: scale * Math.pow(-Math.log(0.9), 1 / shape),
      level: 0.95, bounds: { shape: { lower: 0.5, upper: 1.2 }, scale: { lower: 1000, upper: 9000 }, b10: { lower: 20, upper: 400 } },
      covariance_log: [[0.04, 0], [0, 0.2]], log_likelihood: -60, goodness_of_fit: { anderson_darling: 0.5, note: 'invented' },
      points, curve, warnings: [], used_by: [],
    };
  }

  it('extends the paper below 1% when the points need it and keeps every point inside the frame', () => {
    const fit = inventedFit();
    const drawn = read(weibullPlot(fit, { width: 440, label: 'invented' }).svg);
    const labels = drawn.yTicks.map((t) => t.label);
    expect(labels[labels.length - 1]).toBe('99%');
    // The lowest point, F(0.3 y) ≈ 0.0018, needs the paper to start at or below 0.1%.
    expect(Number(labels[0]!.replace('%', '')) / 100).toBeLessThanOrEqual(cdf(0.3, 0.8, 4000));
    expect(drawn.circles).toHaveLength(5);
    for (const c of drawn.circles) {
      expect(c.x).toBeGreaterThan(drawn.frame.left);
      expect(c.x).toBeLessThan(drawn.frame.right);
      expect(c.y).toBeGreaterThan(drawn.frame.top);
      expect(c.y).toBeLessThan(drawn.frame.bottom);
    }
    // η = 4000 years is on the paper (its life axis reaches it) and the labels are in years.
    const { lnT } = calibrate(drawn, [drawn.xTicks[0]!.label, Number(drawn.xTicks[0]!.label), drawn.xTicks[drawn.xTicks.length - 1]!.label, Number(drawn.xTicks[drawn.xTicks.length - 1]!.label)], ['1%', 0.01, '90%', 0.9]);
    expect(Math.exp(lnT(drawn.frame.right))).toBeGreaterThanOrEqual(4000);
    expect(group(drawn.svg, 'legend')).toContain('Upper 95% bound on F(t)');
    expect(group(drawn.svg, 'caption')).toContain('median-rank regression');
    expect(drawn.svg).not.toMatch(/NaN|Infinity/);
  });

  it('leaves out the part of a three-parameter curve before the location (F = 0 there)', () => {
    const fit = { ...inventedFit(), location: 0.2 };
    fit.curve = fit.curve.map((c) => (c.t <= 0.2 ? { t: c.t, F: 0, lower: 0, upper: 0 } : c));
    const drawn = read(weibullPlot(fit, { width: 440, label: 'invented' }).svg);
    expect(drawn.paths.fitted!.xy.length).toBeGreaterThan(2);
    expect(drawn.svg).not.toMatch(/NaN|Infinity/);
    expect(group(drawn.svg, 'caption')).toContain('γ =');
  });
});
