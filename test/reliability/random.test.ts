// The seeded generator: published algorithms (xoshiro128**, Blackman & Vigna, ACM TOMS 2021;
// SplitMix64, Steele, Lea & Flood, OOPSLA 2014) checked by hand arithmetic and an independent BigInt
// rewrite of the reference C code; plus the properties the analysis relies on.
import { describe, expect, it } from 'vitest';
import { createRng, latinHypercube, splitMix64, xoshiro128StarStar } from '../../src/reliability/random.js';
import { chiSquareQuantile } from '../../src/reliability/special.js';

/** xoshiro128** as in the reference C code (prng.di.unimi.it/xoshiro128starstar.c), in BigInt. */
function referenceXoshiro128(state: [number, number, number, number], count: number): number[] {
  const M = 0xffffffffn;
  const s = state.map(BigInt);
  const rotl = (x: bigint, k: bigint) => ((x << k) | (x >> (32n - k))) & M;
  const out: number[] = [];
  for (let i = 0; i < count; i++) {
    const result = (rotl((s[1]! * 5n) & M, 7n) * 9n) & M;
    const t = (s[1]! << 9n) & M;
    s[2]! ^= s[0]!;
    s[3]! ^= s[1]!;
    s[1]! ^= s[2]!;
    s[0]! ^= s[3]!;
    s[2]! ^= t;
    s[3] = rotl(s[3]!, 11n);
    out.push(Number(result));
  }
  return out;
}

describe('SplitMix64 and xoshiro128**', () => {
  it('SplitMix64 from state 0 gives the well-known first outputs', () => {
    // From memory: the widely quoted outputs of the reference splitmix64.c seeded with 0.
    let state = 0n;
    const out: string[] = [];
    for (let i = 0; i < 3; i++) {
      const [next, value] = splitMix64(state);
      state = next;
      out.push(value.toString(16).padStart(16, '0'));
    }
    expect(out).toEqual(['e220a8397b1dcdaf', '6e789e6aa1b965f4', '06c45d188009454f']);
  });

  it('xoshiro128** from state (1, 2, 3, 4): first outputs by hand', () => {
    // Hand: out = rotl(s1·5, 7)·9. 1st: s1 = 2 → 10 → 1280 → 11520. Update: t = 1024, s2 = 3^1 = 2,
    // s3 = 4^2 = 6, s1 = 2^2 = 0, s0 = 1^6 = 7, s2 = 2^1024 = 1026, s3 = rotl(6, 11) = 12288.
    // 2nd: s1 = 0 → 0. Update: s2 = 1026^7 = 1029, s1 = 0^1029 = 1029. 3rd: 1029·5 = 5145 → rotl 7 → 658560 → ·9 = 5927040.
    const r = xoshiro128StarStar([1, 2, 3, 4]);
    expect([r.nextUint32(), r.nextUint32(), r.nextUint32()]).toEqual([11520, 0, 5927040]);
  });

  it('the 32-bit implementation equals a BigInt rewrite of the reference code', () => {
    for (const state of [[1, 2, 3, 4], [0xdeadbeef, 0x01234567, 0x89abcdef, 0xfedcba98], [0xffffffff, 0, 0xffffffff, 7]] as const) {
      const r = xoshiro128StarStar(state);
      const ours = Array.from({ length: 1000 }, () => r.nextUint32());
      expect(ours).toEqual(referenceXoshiro128([...state], 1000));
    }
  });
});

describe('createRng', () => {
  it('the same seed gives the same sequence; another seed or stream gives another', () => {
    const a = createRng(20260630);
    const b = createRng(20260630);
    const xs = Array.from({ length: 100 }, () => a.next());
    const ys = Array.from({ length: 100 }, () => b.next());
    expect(xs).toEqual(ys);
    const c = createRng(20260631);
    expect(Array.from({ length: 100 }, () => c.next())).not.toEqual(xs);
    const d = createRng(20260630, 1);
    expect(Array.from({ length: 100 }, () => d.next())).not.toEqual(xs);
  });

  it('pins the first values of the project seed (a change here changes every study result)', () => {
    // Not an outside reference: a guard that the sequence never drifts between versions. The values
    // follow from SplitMix64 (checked above) seeding xoshiro128** (checked above).
    const r = createRng(0);
    const [w0, w1] = [splitMix64(0n), splitMix64(splitMix64(0n)[0])];
    const state: [number, number, number, number] = [
      Number(w0[1] >> 32n), Number(w0[1] & 0xffffffffn), Number(w1[1] >> 32n), Number(w1[1] & 0xffffffffn),
    ];
    expect(Array.from({ length: 8 }, () => r.nextUint32())).toEqual(referenceXoshiro128(state, 8));
  });

  it('returns doubles strictly inside (0, 1) and rejects a non-integer seed', () => {
    const r = createRng(7);
    let min = 1;
    let max = 0;
    for (let i = 0; i < 200000; i++) {
      const u = r.next();
      if (u < min) min = u;
      if (u > max) max = u;
    }
    expect(min).toBeGreaterThan(0);
    expect(max).toBeLessThan(1);
    expect(() => createRng(1.5)).toThrow(RangeError);
    expect(() => createRng(Number.NaN)).toThrow(RangeError);
  });

  it('is uniform: chi-square over 20 bins of 200 000 draws below the 99.9 % point', () => {
    // Pearson's chi-square goodness-of-fit test (common practice, no source); the critical value from
    // chiSquareQuantile, itself checked against @stdlib. Fixed seed, so the outcome is deterministic.
    const r = createRng(12345);
    const bins = new Array<number>(20).fill(0);
    const n = 200000;
    let sum = 0;
    for (let i = 0; i < n; i++) {
      const u = r.next();
      sum += u;
      bins[Math.floor(u * 20)]! += 1;
    }
    const expected = n / 20;
    const chi2 = bins.reduce((acc, o) => acc + (o - expected) ** 2 / expected, 0);
    expect(chi2).toBeLessThan(chiSquareQuantile(0.999, 19));
    // Mean within 4 standard errors of ½ (sd of U(0,1) is 1/√12).
    expect(Math.abs(sum / n - 0.5)).toBeLessThan((4 / Math.sqrt(12)) / Math.sqrt(n));
  });
});

describe('latinHypercube', () => {
  it('hits each of the n strata exactly once, inside (0, 1)', () => {
    // Definition of Latin hypercube sampling (McKay, Beckman & Conover, Technometrics 1979).
    for (const n of [1, 2, 7, 100, 1000]) {
      const col = latinHypercube(createRng(99), n);
      expect(col).toHaveLength(n);
      const strata = col.map((u) => Math.floor(u * n)).sort((x, y) => x - y);
      expect(strata).toEqual(Array.from({ length: n }, (_, i) => i));
      for (const u of col) {
        expect(u).toBeGreaterThan(0);
        expect(u).toBeLessThan(1);
      }
    }
  });

  it('is shuffled (not in stratum order), reproducible, and columns from one generator differ', () => {
    const rng = createRng(5);
    const first = latinHypercube(rng, 50);
    const second = latinHypercube(rng, 50);
    expect(first).not.toEqual(second);
    const ordered = first.every((u, i) => Math.floor(u * 50) === i);
    expect(ordered).toBe(false);
    expect(latinHypercube(createRng(5), 50)).toEqual(first);
    expect(latinHypercube(createRng(5), 0)).toEqual([]);
  });
});
