// Special functions against an outside reference: @stdlib/stats-base-dists-* (a general-purpose
// numerical library) over grids, and identities from the NIST Digital Library of Mathematical
// Functions (DLMF, https://dlmf.nist.gov) where the library has no counterpart.
import { describe, expect, it } from 'vitest';
import * as normal from '@stdlib/stats-base-dists-normal';
import * as gammaDist from '@stdlib/stats-base-dists-gamma';
import * as chisquare from '@stdlib/stats-base-dists-chisquare';
import * as betaDist from '@stdlib/stats-base-dists-beta';
import {
  betaQuantile,
  chiSquareQuantile,
  digamma,
  gamma,
  gammaQuantile,
  lnBeta,
  lnGamma,
  normalCdf,
  normalPdf,
  normalQuantile,
  regularizedBeta,
  regularizedGammaP,
  regularizedGammaQ,
} from '../../src/reliability/special.js';

/** Relative difference, with an absolute floor so values at or near zero compare sensibly. */
function rel(actual: number, expected: number, floor = 1e-300): number {
  if (actual === expected) return 0;
  return Math.abs(actual - expected) / Math.max(Math.abs(expected), floor);
}

/** Largest relative error over a list of (actual, expected) pairs, with the worst case for the message. */
function worst(pairs: [number, number, unknown][]): { err: number; at: unknown } {
  let err = 0;
  let at: unknown = null;
  for (const [a, e, where] of pairs) {
    const r = rel(a, e);
    if (!(r <= err)) {
      err = r;
      at = where;
    }
  }
  return { err, at };
}

const EULER_GAMMA = 0.5772156649015329; // Euler–Mascheroni constant (from memory; DLMF 5.2.3)

describe('lnGamma, gamma', () => {
  it('lnGamma matches @stdlib gamma logpdf at x = 1 (log f(1; a, 1) = −1 − lnΓ(a)) for a in [0.05, 170]', () => {
    // Source: @stdlib/stats-base-dists-gamma logpdf; f(x; a, 1) = x^(a−1)e^(−x)/Γ(a) (DLMF 8.2.1 density).
    const pairs: [number, number, unknown][] = [];
    for (let a = 0.05; a < 170; a *= 1.07) pairs.push([lnGamma(a), -1 - gammaDist.logpdf(1, a, 1), a]);
    // Absolute comparison: lnΓ crosses zero at 1 and 2, where a relative error means nothing.
    const absErr = Math.max(...pairs.map(([x, y]) => Math.abs(x - y) / Math.max(1, Math.abs(y))));
    expect(absErr).toBeLessThan(1e-13);
  });

  it('gamma(n) = (n−1)! exactly enough, Γ(½) = √π, Γ(−½) = −2√π', () => {
    // Source: DLMF 5.4.1 (Γ(n+1) = n!), 5.4.6 (Γ(½) = √π), 5.5.1 recurrence for Γ(−½).
    let fact = 1;
    for (let n = 1; n <= 25; n++) {
      expect(rel(gamma(n), fact)).toBeLessThan(1e-14);
      fact *= n;
    }
    expect(rel(gamma(0.5), Math.sqrt(Math.PI))).toBeLessThan(1e-15);
    expect(rel(gamma(-0.5), -2 * Math.sqrt(Math.PI))).toBeLessThan(1e-15);
    expect(Number.isNaN(gamma(0))).toBe(true);
    expect(Number.isNaN(gamma(-3))).toBe(true);
    expect(gamma(200)).toBe(Infinity);
  });

  it('gamma agrees with exp(lnGamma from @stdlib) and keeps the recurrence Γ(x+1) = xΓ(x)', () => {
    // Source: @stdlib gamma logpdf as above; recurrence DLMF 5.5.1.
    for (let x = 0.01; x < 150; x *= 1.13) {
      expect(rel(gamma(x), Math.exp(-1 - gammaDist.logpdf(1, x, 1)))).toBeLessThan(2e-13 * Math.max(1, Math.log(x + 1)) * 10);
      expect(rel(gamma(x + 1), x * gamma(x))).toBeLessThan(1e-13);
    }
    // Reflection Γ(x)Γ(1−x) = π/sin(πx) (DLMF 5.5.3) for negative non-integers.
    for (const x of [-0.3, -1.7, -4.25, -10.5]) {
      expect(rel(gamma(x) * gamma(1 - x), Math.PI / Math.sin(Math.PI * x))).toBeLessThan(1e-13);
    }
  });

  it('lnBeta matches @stdlib beta logpdf at x = ½ (log f = (a+b−2)·ln ½ − ln B(a, b))', () => {
    // Source: @stdlib/stats-base-dists-beta logpdf; density x^(a−1)(1−x)^(b−1)/B(a, b).
    for (const a of [0.2, 0.5, 1, 3, 12, 80, 400]) {
      for (const b of [0.3, 1, 2.5, 15, 200]) {
        const expected = (a + b - 2) * Math.log(0.5) - betaDist.logpdf(0.5, a, b);
        expect(Math.abs(lnBeta(a, b) - expected) / Math.max(1, Math.abs(expected))).toBeLessThan(1e-13);
      }
    }
  });
});

describe('digamma', () => {
  it('ψ(1) = −γ, ψ(½) = −γ − 2 ln 2, ψ(n+1) = H_n − γ', () => {
    // Source: DLMF 5.4.12, 5.4.13, 5.4.14; γ from memory (DLMF 5.2.3).
    expect(Math.abs(digamma(1) + EULER_GAMMA)).toBeLessThan(2e-15);
    expect(Math.abs(digamma(0.5) - (-EULER_GAMMA - 2 * Math.LN2))).toBeLessThan(4e-15);
    let harmonic = 0;
    for (let n = 1; n <= 40; n++) {
      harmonic += 1 / n;
      expect(rel(digamma(n + 1), harmonic - EULER_GAMMA)).toBeLessThan(2e-15);
    }
  });

  it('satisfies the recurrence and reflection formulas, and is the derivative of @stdlib lnΓ', () => {
    // Recurrence ψ(x+1) = ψ(x) + 1/x (DLMF 5.5.2); reflection ψ(1−x) − ψ(x) = π cot(πx) (DLMF 5.5.4).
    for (const x of [0.013, 0.37, 1.4616, 2.9, 7.5, 33, 1e4]) {
      expect(Math.abs(digamma(x + 1) - digamma(x) - 1 / x)).toBeLessThan(1e-14 * Math.max(1, 1 / x));
    }
    for (const x of [-0.25, -1.6, -7.3]) {
      expect(Math.abs(digamma(1 - x) - digamma(x) - Math.PI / Math.tan(Math.PI * x))).toBeLessThan(1e-12);
    }
    // Central difference of lnΓ taken from @stdlib gamma logpdf: accurate to about 1e-8.
    for (const x of [0.6, 1.9, 4.2, 15, 60]) {
      const h = 1e-4 * x;
      const lng = (a: number) => -1 - gammaDist.logpdf(1, a, 1);
      const numeric = (lng(x + h) - lng(x - h)) / (2 * h);
      expect(Math.abs(digamma(x) - numeric)).toBeLessThan(1e-7);
    }
    expect(Number.isNaN(digamma(0))).toBe(true);
    expect(Number.isNaN(digamma(-2))).toBe(true);
  });
});

describe('normal distribution', () => {
  it('normalCdf matches @stdlib normal cdf relative to itself from z = −37.5 to 8.5', () => {
    // Source: @stdlib/stats-base-dists-normal cdf.
    const pairs: [number, number, unknown][] = [];
    for (let z = -37.5; z <= 8.5; z += 0.0731) pairs.push([normalCdf(z), normal.cdf(z, 0, 1), z]);
    const { err, at } = worst(pairs);
    expect(err, `worst at z = ${String(at)}`).toBeLessThan(5e-13);
  });

  it('normalPdf matches @stdlib normal pdf', () => {
    for (let z = -30; z <= 30; z += 0.37) expect(rel(normalPdf(z), normal.pdf(z, 0, 1))).toBeLessThan(1e-13);
  });

  it('normalQuantile matches @stdlib normal quantile over [1e-6, 1 − 1e-6]', () => {
    // Source: @stdlib/stats-base-dists-normal quantile. Outside this range the library itself
    // drifts (at p = 1e-10 its own cdf of its quantile is off by 8e-8), so the tails are checked
    // by the round trip below instead.
    const pairs: [number, number, unknown][] = [];
    for (let p = 1e-6; p < 1 - 1e-6; p += 0.00173) pairs.push([normalQuantile(p), normal.quantile(p, 0, 1), p]);
    for (const p of [1e-6, 1e-5, 0.001, 0.02425, 0.975, 0.99999]) pairs.push([normalQuantile(p), normal.quantile(p, 0, 1), p]);
    const { err, at } = worst(pairs.filter(([, e]) => Math.abs(e) > 1e-3));
    expect(err, `worst at p = ${String(at)}`).toBeLessThan(1e-11);
    expect(Math.abs(normalQuantile(0.5))).toBeLessThan(1e-16);
  });

  it('round trip Φ(Φ⁻¹(p)) = p to 1e-12 relative over (1e-300, 1 − 1e-16)', () => {
    // normalCdf is held to @stdlib above; the round trip then pins the quantile in the far tails.
    for (let e = -300; e <= -1; e += 0.5) {
      const p = 10 ** e;
      expect(rel(normalCdf(normalQuantile(p)), p), `p = 1e${e}`).toBeLessThan(1e-12);
      // Upper tail, checked on the complement: 1 − Φ(x) = Φ(−x).
      if (p >= 1e-16) expect(rel(normalCdf(-normalQuantile(1 - p)), 1 - (1 - p))).toBeLessThan(1e-12);
    }
    // Symmetry Φ⁻¹(1 − p) = −Φ⁻¹(p) (common practice, no source).
    // (p = 1/32 so that 1 − p is exact in binary.)
    expect(normalQuantile(1 - 0.03125)).toBe(-normalQuantile(0.03125));
    // Subnormal p: still a finite quantile near −38.4 (no overflow in the refinement).
    expect(normalQuantile(5e-324)).toBeLessThan(-38);
    expect(normalQuantile(5e-324)).toBeGreaterThan(-39);
    expect(normalQuantile(0)).toBe(-Infinity);
    expect(normalQuantile(1)).toBe(Infinity);
    expect(Number.isNaN(normalQuantile(1.5))).toBe(true);
  });

  it('z(0.95) = 1.6449 (the 1.645 of the error-factor convention)', () => {
    // Source: NUREG/CR-6823 uses 1.645 for the 95th percentile of the standard normal.
    expect(normalQuantile(0.95)).toBeCloseTo(1.6448536269514722, 14);
  });
});

describe('incomplete gamma', () => {
  it('P(a, x) matches @stdlib gamma cdf relative to the smaller tail, a in [0.3, 200]', () => {
    // Source: @stdlib/stats-base-dists-gamma cdf. Error is taken relative to min(P, 1 − P), so both
    // tails are held to it. (Above a ≈ 300 the library's own cdf is wrong just above x = a, e.g.
    // P(1000, 1001) = 0.5047 against 0.5168 from the Wilson–Hilferty approximation; see the
    // Poisson-sum check below for large a.)
    for (const a of [0.3, 0.5, 1, 2.5, 7, 10, 33.3, 100, 200]) {
      let err = 0;
      let at = 0;
      for (let x = a * 0.02; x < a * 4 + 5; x += a * 0.0071 + 0.013) {
        const ref = gammaDist.cdf(x, a, 1);
        const e = Math.abs(regularizedGammaP(a, x) - ref) / Math.min(ref, 1 - ref);
        if (e > err) {
          err = e;
          at = x;
        }
      }
      expect(err, `a = ${a}, worst x = ${at}`).toBeLessThan(2e-12);
    }
  });

  it('Q(n, x) equals the Poisson sum Σ_{k<n} e^(−x) x^k / k! for integer n, including n = 1000', () => {
    // Source: DLMF 8.4.10 (Q(n+1, x) = e^(−x) e_n(x)); summed in log space as a brute-force oracle.
    for (const n of [1, 3, 20, 150, 1000]) {
      for (const x of [0.5 * n, 0.9 * n, n, n + 1, 1.1 * n + 1, 1.5 * n + 2]) {
        let logTerm = -x; // log of e^(−x) x^0 / 0!
        let sum = 0;
        for (let k = 0; k < n; k++) {
          sum += Math.exp(logTerm);
          logTerm += Math.log(x) - Math.log(k + 1);
        }
        // The oracle itself accumulates rounding over its n terms, hence the looser bound for large n.
        expect(rel(regularizedGammaQ(n, x), sum), `n = ${n}, x = ${x}`).toBeLessThan(n > 100 ? 1e-12 : 2e-13);
        expect(Math.abs(regularizedGammaP(n, x) + regularizedGammaQ(n, x) - 1)).toBeLessThan(2e-15);
      }
    }
  });

  it('gammaQuantile inverts P (round trip) and matches @stdlib gamma quantile for shape ≤ 100', () => {
    // Source: @stdlib/stats-base-dists-gamma quantile (its β is a rate: rate = 1/scale).
    const ps = [1e-12, 1e-6, 0.001, 0.05, 0.3, 0.5, 0.8, 0.95, 0.999, 1 - 1e-9];
    for (const shape of [0.5, 0.8, 1, 1.5, 3, 10, 40, 100, 1000]) {
      for (const p of ps) {
        const x = gammaQuantile(p, shape, 2.5);
        const back = p > 0.5 ? 1 - regularizedGammaQ(shape, x / 2.5) : regularizedGammaP(shape, x / 2.5);
        const tail = Math.min(p, 1 - p);
        expect(Math.abs(back - p) / tail, `shape ${shape}, p ${p}`).toBeLessThan(1e-12);
        if (shape <= 100) {
          expect(rel(x, gammaDist.quantile(p, shape, 1 / 2.5)), `shape ${shape}, p ${p}`).toBeLessThan(1e-10);
        }
      }
    }
  });

  it('chiSquareQuantile matches @stdlib chisquare quantile and the tabled 3.841 (k = 1, 95 %)', () => {
    // Source: @stdlib/stats-base-dists-chisquare quantile; χ²₀.₉₅(1) = 3.841 is the usual table value
    // (from memory; it is 1.95996² because χ²(1) is a squared standard normal).
    for (const k of [1, 2, 3, 4, 7, 10, 25, 60, 120]) {
      for (const p of [0.001, 0.025, 0.05, 0.1, 0.5, 0.9, 0.95, 0.975, 0.999]) {
        expect(rel(chiSquareQuantile(p, k), chisquare.quantile(p, k)), `k ${k}, p ${p}`).toBeLessThan(1e-11);
      }
    }
    expect(rel(chiSquareQuantile(0.95, 1), normalQuantile(0.975) ** 2)).toBeLessThan(1e-13);
    expect(chiSquareQuantile(0.95, 1)).toBeCloseTo(3.841, 3);
  });
});

describe('incomplete beta', () => {
  it('I_x(a, b) matches @stdlib beta cdf over a grid of shapes', () => {
    // Source: @stdlib/stats-base-dists-beta cdf.
    const pairs: [number, number, unknown][] = [];
    for (const a of [0.2, 0.5, 1, 2, 5, 20, 100, 500]) {
      for (const b of [0.2, 0.5, 1, 3, 10, 50, 300]) {
        for (const x of [1e-6, 0.01, 0.1, 0.3, 0.5, 0.7, 0.9, 0.99, 0.999999]) {
          pairs.push([regularizedBeta(x, a, b), betaDist.cdf(x, a, b), [a, b, x]]);
        }
      }
    }
    const { err, at } = worst(pairs.filter(([, e]) => e > 1e-280));
    expect(err, `worst at ${JSON.stringify(at)}`).toBeLessThan(2e-12);
  });

  it('I_x(1, 1) = x and I_x(a, 1) = x^a (closed forms)', () => {
    // Source: DLMF 8.17.1 with B(a, 1) = 1/a (uniform and power-function distributions).
    for (const x of [0.001, 0.2, 0.5, 0.93]) {
      expect(rel(regularizedBeta(x, 1, 1), x)).toBeLessThan(1e-15);
      expect(rel(regularizedBeta(x, 3.5, 1), x ** 3.5)).toBeLessThan(1e-14);
    }
  });

  it('betaQuantile matches @stdlib beta quantile', () => {
    // Source: @stdlib/stats-base-dists-beta quantile.
    const pairs: [number, number, unknown][] = [];
    for (const a of [0.2, 0.5, 1, 2, 5, 20, 100, 500]) {
      for (const b of [0.2, 0.5, 1, 3, 10, 50, 300]) {
        for (const p of [1e-8, 0.01, 0.05, 0.3, 0.5, 0.7, 0.95, 0.99]) {
          pairs.push([betaQuantile(p, a, b), betaDist.quantile(p, a, b), [a, b, p]]);
        }
      }
    }
    const { err, at } = worst(pairs);
    expect(err, `worst at ${JSON.stringify(at)}`).toBeLessThan(1e-11);
  });
});
