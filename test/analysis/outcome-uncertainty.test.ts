// Monte Carlo of the event-tree sequences and outcomes, combined failure modes and gate counts
// (src/analysis/outcome-quantities.ts, trials.ts, uncertainty.ts). Checked against
//  - an independent brute-force Monte Carlo written here: the same seeded uniforms
//    (uniformRows), each parameter drawn by the @stdlib lognormal quantile (σ = ln EF / 1.645,
//    NUREG/CR-6823), every sequence and count quantified by enumerating all 2^n states of the
//    basic events (the brute-force oracle), the failure modes combined by the closed forms stated in
//    src/analysis/combine-modes.ts (sum, max, 1 − Π(1 − P_i), two-mode adjustment P_A(1 − P_B/2),
//    after Hill, Bowles, Jordan & Nathan, ANCOLD 2003, from memory), and percentiles by Hyndman &
//    Fan's definition 7 (Am. Stat. 50, 1996), re-implemented here;
//  - the base case: with every distribution collapsed to a point the trials are the base case, so
//    mean, median and percentiles equal the section's value exactly.
// Every study number is INVENTED for the test.
import { rmSync } from 'node:fs';
import * as lognormal from '@stdlib/stats-base-dists-lognormal';
import { describe, expect, it } from 'vitest';
import { analyze } from '../../src/analysis/analyze.js';
import type { QuantityUncertainty, Results } from '../../src/analysis/results.js';
import { uniformRows } from '../../src/analysis/sampling.js';
import { readStudy } from '../../src/study/read.js';
import type { Study } from '../../src/study/types.js';
import { writeStudy, type StudyText } from './helpers.js';

function readAndClean(parts: StudyText): Study {
  const dir = writeStudy(parts);
  try {
    return readStudy(dir);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

// Events a, b, c with lognormal probabilities; the tree's by-range branch numbers of heading C
// uncertain too. Gates g1 = a OR b, g2 = b AND c share b.
const MEDIAN = { a: 0.02, b: 0.05, c: 0.3 };
const EF = { a: 3, b: 2, c: 1.5 };
const C_MEDIAN = [0.1, 0.4];
const C_EF = [2, 1.5];
const unc = (m: number, ef: number) => `{ value: ${m}, source: test-data, uncertainty: { lognormal: { median: ${m}, ef: ${ef} } } }`;
const EVENTS = `events:
  a: { title: a (invented), model: fixed, probability: ${unc(MEDIAN.a, EF.a)} }
  b: { title: b (invented), model: fixed, probability: ${unc(MEDIAN.b, EF.b)} }
  c: { title: c (invented), model: fixed, probability: ${unc(MEDIAN.c, EF.c)} }
`;
const LOGIC = `tops:
  t1: { title: g1 fails (invented), gate: g1 }
gates:
  g1: { any: [a, b] }
  g2: { all: [b, c] }
counts:
  both:
    title: g1 and g2 (invented)
    of: [g1, g2]
event_trees:
  tree:
    title: Test tree (invented)
    load:
      title: Load (invented)
      source: test-data
      ranges:
        r1: { title: frequent, aep: [0.1, 0.01] }
        r2: { title: rare, frequency: 0.002 /year }
    headings:
      A: { title: first, fails: { gate: g1 } }
      B: { title: second, fails: { gate: g2 } }
      C: { title: numbers, fails: { by_range: { r1: ${unc(C_MEDIAN[0]!, C_EF[0]!)}, r2: ${unc(C_MEDIAN[1]!, C_EF[1]!)} } } }
    outcomes:
      ok: { title: fine }
      bad: { title: bad }
    sequences:
      - { when: { A: works }, outcome: ok }
      - { when: { A: fails, B: works, C: works }, outcome: ok }
      - { when: { A: fails, B: works, C: fails }, outcome: bad }
      - { when: { A: fails, B: fails }, outcome: bad }
failure_modes:
  modes:
    title: Two modes (invented)
    load: tree
    modes:
      from-tree: { title: from the tree, outcome: bad }
      other: { title: other, by_range: { r1: 0.01, r2: 0.05 }, source: test-data }
`;
const N = 4000;
const SEED = 31;

/** Hyndman–Fan definition 7: x[h], h = (n − 1)p, interpolated (re-implemented here). */
function quantile7(values: readonly number[], p: number): number {
  const s = [...values].sort((x, y) => x - y);
  const h = (s.length - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(s.length - 1, lo + 1);
  return s[lo]! + (h - lo) * (s[hi]! - s[lo]!);
}

function enumerate3(p: readonly number[], f: (a: boolean, b: boolean, c: boolean) => boolean): number {
  let total = 0;
  for (let s = 0; s < 8; s++) {
    const x = [(s & 1) === 1, (s & 2) === 2, (s & 4) === 4];
    if (f(x[0]!, x[1]!, x[2]!)) total += x.reduce((w, on, i) => w * (on ? p[i]! : 1 - p[i]!), 1);
  }
  return total;
}

/** One trial of the oracle: every quantity from the sampled numbers, by enumeration and closed forms. */
function oracleTrial(pa: number, pb: number, pc: number, cBranch: readonly number[]): Map<string, number> {
  const p = [pa, pb, pc];
  const g1 = (a: boolean, b: boolean) => a || b;
  const g2 = (_a: boolean, b: boolean, c: boolean) => b && c;
  const rangeP = [0.1 - 0.01, 0.002];
  const out = new Map<string, number>();
  const seqCond = [
    (_r: number) => enumerate3(p, (a, b) => !g1(a, b)),
    (r: number) => enumerate3(p, (a, b, c) => g1(a, b) && !g2(a, b, c)) * (1 - cBranch[r]!),
    (r: number) => enumerate3(p, (a, b, c) => g1(a, b) && !g2(a, b, c)) * cBranch[r]!,
    (_r: number) => enumerate3(p, (a, b, c) => g1(a, b) && g2(a, b, c)),
  ];
  const seqAnnual = seqCond.map((f) => rangeP.reduce((s, rp, r) => s + rp * f(r), 0));
  seqAnnual.forEach((x, i) => out.set(`event-tree-sequence/S${i + 1}`, x));
  out.set('event-tree-outcome/ok', seqAnnual[0]! + seqAnnual[1]!);
  out.set('event-tree-outcome/bad', seqAnnual[2]! + seqAnnual[3]!);
  // Modes per range: P(bad | r) and the stated numbers.
  const other = [0.01, 0.05];
  const bad = rangeP.map((_, r) => seqCond[2]!(r) + seqCond[3]!(r));
  const annual = (xs: number[]) => xs.reduce((s, x, r) => s + rangeP[r]! * x, 0);
  out.set('failure-mode/from-tree', annual(bad.map((x, r) => x * (1 - other[r]! / 2))));
  out.set('failure-mode/other', annual(other.map((x, r) => x * (1 - bad[r]! / 2))));
  out.set('failure-modes-combined/sum', annual(bad.map((x, r) => x + other[r]!)));
  out.set('failure-modes-combined/lower', annual(bad.map((x, r) => Math.max(x, other[r]!))));
  out.set('failure-modes-combined/upper', annual(bad.map((x, r) => 1 - (1 - x) * (1 - other[r]!))));
  out.set('gate-count/at-least-1', enumerate3(p, (a, b, c) => g1(a, b) || g2(a, b, c)));
  out.set('gate-count/at-least-2', enumerate3(p, (a, b, c) => g1(a, b) && g2(a, b, c)));
  return out;
}

describe('outcome uncertainty against an independent brute-force Monte Carlo', () => {
  const study = readAndClean({ events: EVENTS, logic: LOGIC, settings: `  samples: ${N}\n  seed: ${SEED}\n  horizon: 0` });
  const results = analyze(study);
  const got = new Map(results.outcome_uncertainty!.map((q) => [`${q.kind}/${q.id}`, q]));

  // The oracle's draws: the study's uncertain parameters in study order take the dimensions in
  // that order (a, b, c, then C's r1 and r2), each by the @stdlib lognormal quantile.
  const order: [number, number][] = [
    [MEDIAN.a, EF.a],
    [MEDIAN.b, EF.b],
    [MEDIAN.c, EF.c],
    [C_MEDIAN[0]!, C_EF[0]!],
    [C_MEDIAN[1]!, C_EF[1]!],
  ];
  const rows = uniformRows(SEED, 'monte-carlo', N, order.length);
  const u = new Float64Array(order.length);
  const trials: Map<string, number>[] = [];
  for (let t = 0; t < N; t++) {
    rows.row(t, u);
    const x = order.map(([m, ef], d) => lognormal.quantile(u[d]!, Math.log(m), Math.log(ef) / 1.645));
    trials.push(oracleTrial(x[0]!, x[1]!, x[2]!, [x[3]!, x[4]!]));
  }

  it('lists every sequence, outcome, mode, combination and count', () => {
    expect([...got.keys()].sort()).toEqual([...trials[0]!.keys()].sort());
    expect(results.outcome_uncertainty!.length).toBe(2 + 4 + 2 + 3 + 2);
  });

  it('mean, median, 5th and 95th percentiles and sd agree with the oracle to 1e-9 relative', () => {
    for (const [key, q] of got) {
      const xs = trials.map((m) => m.get(key)!);
      const mean = xs.reduce((s, x) => s + x, 0) / N;
      const sd = Math.sqrt(xs.reduce((s, x) => s + (x - mean) ** 2, 0) / (N - 1));
      for (const [mine, want] of [
        [q.mean, mean],
        [q.median, quantile7(xs, 0.5)],
        [q.p05, quantile7(xs, 0.05)],
        [q.p95, quantile7(xs, 0.95)],
        [q.sd, sd],
      ] as const) {
        expect(Math.abs(mine - want), `${key}: ${mine} against ${want}`).toBeLessThanOrEqual(1e-9 * Math.abs(want));
      }
      // The quantities really vary: a constant would pass the check above trivially.
      if (key !== 'failure-mode/other') expect(q.p95).toBeGreaterThan(q.p05);
    }
  });

  it('the point is the value of the quantity in its own section', () => {
    const tree = results.event_trees![0]!;
    const modes = results.failure_modes![0]!;
    const count = results.gate_counts![0]!;
    expect(got.get('event-tree-outcome/bad')!.point).toBe(tree.outcomes.find((o) => o.id === 'bad')!.probability);
    expect(got.get('event-tree-sequence/S3')!.point).toBe(tree.sequences[2]!.probability);
    expect(got.get('failure-mode/from-tree')!.point).toBe(modes.modes[0]!.adjusted_annual);
    expect(got.get('failure-modes-combined/upper')!.point).toBe(modes.annual.upper);
    expect(got.get('gate-count/at-least-2')!.point).toBe(count.at_least.exact[2]);
    for (const q of results.outcome_uncertainty!) expect(q.owner).toBe(q.kind === 'gate-count' ? 'both' : q.kind.startsWith('failure') ? 'modes' : 'tree');
  });

  it('samples the tree\u2019s own uncertain numbers, and the tops\u2019 uncertainty comes from the same trials', () => {
    expect(results.uncertainty![0]!.sampled_parameters).toEqual(['a.probability', 'b.probability', 'c.probability', 'tree.C.r1', 'tree.C.r2']);
    // t1 = g1 = a OR b: its mean over the oracle's trials.
    const draws = uniformRows(SEED, 'monte-carlo', N, order.length);
    let mean = 0;
    for (let t = 0; t < N; t++) {
      draws.row(t, u);
      const [pa, pb] = order.slice(0, 2).map(([m, ef], d) => lognormal.quantile(u[d]!, Math.log(m), Math.log(ef) / 1.645));
      mean += (1 - (1 - pa!) * (1 - pb!)) / N;
    }
    expect(Math.abs(results.uncertainty![0]!.mean - mean)).toBeLessThanOrEqual(1e-9 * mean);
  });
});

describe('with every distribution collapsed to its value', () => {
  /** The example study with each uncertainty replaced by a lognormal of EF 1 at the parameter's value. */
  function collapsed(ef: number): { results: Results; byKey: Map<string, QuantityUncertainty> } {
    const study = readStudy(new URL('../../example-study', import.meta.url).pathname);
    for (const p of study.parameters) if (p.uncertainty) p.uncertainty = { kind: 'lognormal', median: p.value, ef };
    study.settings.samples = 500;
    const results = analyze(study);
    return { results, byKey: new Map(results.outcome_uncertainty!.map((q) => [`${q.kind}/${q.owner}/${q.id}`, q])) };
  }

  it('every trial is the base case: mean, median and percentiles equal the point exactly', () => {
    const { results } = collapsed(1);
    expect(results.outcome_uncertainty!.length).toBeGreaterThan(10);
    const kinds = new Set(results.outcome_uncertainty!.map((q) => q.kind));
    expect([...kinds].sort()).toEqual(['event-tree-outcome', 'event-tree-sequence', 'failure-mode', 'failure-modes-combined', 'gate-count']);
    for (const q of results.outcome_uncertainty!) {
      expect(q.mean, `${q.kind} ${q.id}`).toBe(q.point);
      expect(q.median).toBe(q.point);
      expect(q.p05).toBe(q.point);
      expect(q.p95).toBe(q.point);
      expect(q.sd).toBe(0);
    }
  });

  it('a near-point spread (EF 1.0001) moves the mean from the point by less than 1e-3 relative', () => {
    const { byKey } = collapsed(1.0001);
    for (const q of byKey.values()) {
      expect(Math.abs(q.mean - q.point)).toBeLessThanOrEqual(1e-3 * q.point);
      expect(q.p95).toBeGreaterThanOrEqual(q.p05);
    }
  });
});
