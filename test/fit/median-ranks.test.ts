// Median ranks, Johnson's adjusted ranks and rank regression
// (src/reliability/fit/median-ranks.ts, rank-regression.ts).
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { benardMedianRank, plottingPositions, fitWeibull, FitError } from '../../src/reliability/fit/index.js';
import { weibullRankRegression } from '../../src/reliability/fit/rank-regression.js';
import type { LifeObservation } from '../../src/reliability/fit/index.js';
import { ballBearings } from './helpers.js';

describe("Benard's approximation", () => {
  it('F = (i − 0.3)/(n + 0.4)', () => {
    // R. B. Abernethy, The New Weibull Handbook: Benard's median-rank approximation. For n = 10 the
    // first median rank is 0.7/10.4 = 0.067308, the last 9.7/10.4 = 0.932692 (arithmetic by hand).
    expect(benardMedianRank(1, 10)).toBeCloseTo(0.067308, 6);
    expect(benardMedianRank(10, 10)).toBeCloseTo(0.932692, 6);
    expect(benardMedianRank(5.5, 10)).toBe(0.5); // the middle of an even sample plots at F = 0.5
  });

  it('complete samples get order numbers 1 … n', () => {
    const pts = plottingPositions(ballBearings());
    expect(pts.map((p) => p.rank)).toEqual(Array.from({ length: 23 }, (_, i) => i + 1));
    pts.forEach((p, i) => expect(p.F).toBeCloseTo((i + 1 - 0.3) / 23.4, 14));
  });
});

describe("Johnson's adjusted ranks", () => {
  it('small hand example', () => {
    // L. G. Johnson (1964), adjusted rank, as worked here by hand. Five units, in order of life:
    //   10 F, 20 S, 30 F, 40 F, 50 S          (n = 5, F = failed, S = suspended)
    // increment = (n + 1 − previous rank) / (1 + units from this one on)
    //   10 F: previous 0,  5 units from here on: 0 + 6/6          = 1
    //   30 F: previous 1,  3 units from here on: 1 + 5/4          = 2.25
    //   40 F: previous 2.25, 2 units:            2.25 + 3.75/3    = 3.5
    // Benard: (1 − 0.3)/5.4 = 0.12963, (2.25 − 0.3)/5.4 = 0.36111, (3.5 − 0.3)/5.4 = 0.59259.
    const data: LifeObservation[] = [
      { time: 40, failed: true },
      { time: 10, failed: true },
      { time: 50, failed: false },
      { time: 30, failed: true },
      { time: 20, failed: false },
    ];
    const pts = plottingPositions(data);
    expect(pts.map((p) => p.t)).toEqual([10, 30, 40]);
    expect(pts.map((p) => p.rank)).toEqual([1, 2.25, 3.5]);
    expect(pts.map((p) => Number(p.F.toFixed(5)))).toEqual([0.12963, 0.36111, 0.59259]);
  });

  it('equal the mean order number over every ordering the suspensions allow (brute force)', () => {
    // Johnson's rank is the mean position of each failure over all orders of failure that agree with
    // the data, each equally likely: failures keep their order and a suspended unit fails at some
    // point after every failure observed before (or at) its suspension. Enumerated for n ≤ 7.
    const arb = fc.array(fc.record({ time: fc.integer({ min: 1, max: 9 }), failed: fc.boolean() }), { minLength: 1, maxLength: 7 });
    fc.assert(
      fc.property(arb, (data) => {
        const sorted = [...data].sort((a, b) => a.time - b.time || Number(b.failed) - Number(a.failed));
        const n = sorted.length;
        const failures = sorted.map((d, i) => (d.failed ? i : -1)).filter((i) => i >= 0);
        const sums = new Map<number, number>(failures.map((i) => [i, 0]));
        let count = 0;
        const order: number[] = [];
        const used = new Array<boolean>(n).fill(false);
        // A unit may be placed next only when every failure listed before it (in life order, failures
        // first at ties) is already placed: that keeps the failures in order and puts each suspended
        // unit after the failures it outlived.
        const consistent = (unit: number): boolean => sorted.every((e, j) => !(e.failed && j < unit && !used[j]));
        const place = (): void => {
          if (order.length === n) {
            count += 1;
            order.forEach((unit, pos) => {
              if (sums.has(unit)) sums.set(unit, sums.get(unit)! + pos + 1);
            });
            return;
          }
          for (let u = 0; u < n; u++) {
            if (used[u] || !consistent(u)) continue;
            used[u] = true;
            order.push(u);
            place();
            order.pop();
            used[u] = false;
          }
        };
        place();
        const pts = plottingPositions(data);
        pts.forEach((p, k) => {
          const mean = sums.get(failures[k]!)! / count;
          expect(p.rank).toBeCloseTo(mean, 10);
        });
      }),
      { numRuns: 150, seed: 1964 },
    );
  });
});

describe('median-rank regression (life on rank)', () => {
  it('ball bearings: our computed β̂ = 2.248, η̂ = 80.97, checked by independent least squares', () => {
    // Not a published value: computed by this code, and re-derived here by solving the 2×2 normal
    // equations of ln t = a + b·y, y = ln(−ln(1 − (i − 0.3)/(n + 0.4))), with β = 1/b, η = e^a.
    const data = ballBearings();
    const t = data.map((d) => d.time).sort((a, b) => a - b);
    const n = t.length;
    const ys = t.map((_, i) => Math.log(-Math.log(1 - (i + 1 - 0.3) / (n + 0.4))));
    const xs = t.map(Math.log);
    // [n Σy; Σy Σy²] [a; b] = [Σx; Σxy], by Cramer's rule
    const sy = ys.reduce((s, v) => s + v, 0);
    const syy = ys.reduce((s, v) => s + v * v, 0);
    const sx = xs.reduce((s, v) => s + v, 0);
    const sxy = xs.reduce((s, v, i) => s + v * ys[i]!, 0);
    const det = n * syy - sy * sy;
    const a = (sx * syy - sy * sxy) / det;
    const b = (n * sxy - sy * sx) / det;
    const fit = fitWeibull(data, { method: 'rank' });
    expect(fit.shape).toBeCloseTo(1 / b, 10);
    expect(fit.scale).toBeCloseTo(Math.exp(a), 8);
    expect(fit.shape.toPrecision(4)).toBe('2.248');
    expect(fit.scale.toPrecision(4)).toBe('80.97');
    // r² = squared correlation of (x, y), computed the textbook way
    const mx = sx / n;
    const my = sy / n;
    const cov = xs.reduce((s, v, i) => s + (v - mx) * (ys[i]! - my), 0);
    const vx = xs.reduce((s, v) => s + (v - mx) ** 2, 0);
    const vy = ys.reduce((s, v) => s + (v - my) ** 2, 0);
    expect(fit.gof.rSquared).toBeCloseTo((cov * cov) / (vx * vy), 12);
  });

  it('recovers a sample lying exactly on a Weibull line', () => {
    // Lives placed at the Weibull quantiles of Benard's ranks lie on the line: r² = 1 and the
    // regression returns the generating β and η (common practice, no source).
    const [shape, scale, n] = [2.7, 40, 12];
    const data = Array.from({ length: n }, (_, i) => ({
      time: scale * Math.pow(-Math.log(1 - (i + 1 - 0.3) / (n + 0.4)), 1 / shape),
      failed: true,
    }));
    const r = weibullRankRegression(data);
    expect(r.shape).toBeCloseTo(shape, 10);
    expect(r.scale).toBeCloseTo(scale, 9);
    expect(r.rSquared).toBeCloseTo(1, 12);
  });

  it('needs two failures at different lives', () => {
    expect(() => fitWeibull([{ time: 3, failed: true }, { time: 5, failed: false }], { method: 'rank' })).toThrow(FitError);
    expect(() => fitWeibull([{ time: 3, failed: true }, { time: 3, failed: true }], { method: 'rank' })).toThrow(FitError);
  });
});
