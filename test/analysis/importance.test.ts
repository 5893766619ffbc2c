// Importance measures on small trees built here, held to their definitions (W. E. Vesely et al.,
// "Measures of Risk Importance and Their Applications", NUREG/CR-3385, US NRC 1983) computed
// independently by brute-force enumeration of all 2^n states and by finite differences.
// Source files: src/analysis/importance-classes.ts (class importance) and the per-event importance
// that src/analysis/quantify.ts takes from src/logic/importance.ts.
import { rmSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { analyze } from '../../src/analysis/analyze.js';
import { readStudy } from '../../src/study/read.js';
import { enumerate, studyOf, writeStudy } from './helpers.js';

// Invented data: three valves (one class), two pumps (one class), an operator action and a power
// supply (a class of one), all `fixed` so the probabilities are the numbers written.
const EVENTS = `
classes:
  valve: { model: fixed, probability: { value: 0.1, source: test-data } }
  pump: { model: fixed, probability: { value: 0.05, source: test-data } }
  power-supply: { model: fixed, probability: { value: 0.03, source: test-data } }
events:
  v1: { title: Valve 1 fails, class: valve }
  v2: { title: Valve 2 fails, class: valve }
  v3: { title: Valve 3 fails, class: valve }
  p1: { title: Pump 1 fails, class: pump }
  p2: { title: Pump 2 fails, class: pump }
  op: { title: Operator fails, model: fixed, probability: { value: 0.2, source: test-data } }
  pw: { title: Power lost, class: power-supply }
`;

const LOGIC = `
tops:
  plant-fails: { title: Two of three trains fail or power is lost, gate: top }
  odd-top: { title: A non-coherent top (negation), gate: odd }
gates:
  top: { any: [pw, trains] }
  trains: { atleast: 2, of: [train-1, train-2, train-3] }
  train-1: { any: [v1, p1] }
  train-2: { any: [v2, p2] }
  train-3: { all: [v3, op] }
  odd: { any: [both-valves, op-works-pump-fails] }
  both-valves: { all: [v1, v2] }
  op-works-pump-fails: { all: [op-works, p1] }
  op-works: { not: op }
`;

// Order of the variables below: v1 v2 v3 p1 p2 op pw (the study's event order).
const plantFails = (x: readonly boolean[]): boolean => {
  const [v1, v2, v3, p1, p2, op, pw] = x;
  const trains = [v1 || p1, v2 || p2, v3 && op].filter(Boolean).length;
  return Boolean(pw) || trains >= 2;
};
const oddTop = (x: readonly boolean[]): boolean => {
  const [v1, v2, , p1, , op] = x;
  return Boolean((v1 && v2) || (!op && p1));
};
const FUNCTIONS = [plantFails, oddTop];
const IDS = ['v1', 'v2', 'v3', 'p1', 'p2', 'op', 'pw'];
const P = [0.1, 0.1, 0.1, 0.05, 0.05, 0.2, 0.03];
const CLASSES: Record<string, number[]> = { valve: [0, 1, 2], pump: [3, 4], 'power-supply': [6] };

const with_ = (set: Record<number, number>): number[] => P.map((p, i) => set[i] ?? p);

describe('per-event importance by the NUREG/CR-3385 definitions', () => {
  const results = analyze(studyOf({ events: EVENTS, logic: LOGIC }));
  const top = results.tops[0]!;
  const exact = enumerate(P, plantFails);

  it('the exact top probability matches enumeration (oracle: all 2^7 states)', () => {
    expect(top.probability.exact).toBeCloseTo(exact, 14);
  });

  it('Birnbaum = ∂P/∂p_i (central finite difference, exact for a multilinear P) = P1 − P0', () => {
    for (const imp of top.importance!) {
      const i = IDS.indexOf(imp.event);
      const h = 1e-4;
      const fd = (enumerate(with_({ [i]: P[i]! + h }), plantFails) - enumerate(with_({ [i]: P[i]! - h }), plantFails)) / (2 * h);
      expect(imp.birnbaum).toBeCloseTo(fd, 9);
      const p1 = enumerate(with_({ [i]: 1 }), plantFails);
      const p0 = enumerate(with_({ [i]: 0 }), plantFails);
      expect(imp.birnbaum).toBeCloseTo(p1 - p0, 13);
      // FV = (P − P0)/P, RAW = P1/P, RRW = P/P0 (NUREG/CR-3385 definitions).
      expect(imp.fussell_vesely).toBeCloseTo((exact - p0) / exact, 12);
      expect(imp.raw).toBeCloseTo(p1 / exact, 10);
      expect(imp.rrw).toBeCloseTo(exact / p0, 10);
    }
    expect(top.importance!.map((x) => x.event).sort()).toEqual([...IDS].sort());
  });

  it('RAW and RRW satisfy the pivotal identities p·RAW + (1 − p)/RRW = 1 and FV = 1 − 1/RRW', () => {
    // P = p·P1 + (1 − p)·P0 (pivotal decomposition, common practice, no source) divided by P.
    for (const imp of top.importance!) {
      const p = P[IDS.indexOf(imp.event)]!;
      expect(p * imp.raw + (1 - p) / imp.rrw).toBeCloseTo(1, 12);
      expect(imp.fussell_vesely).toBeCloseTo(1 - 1 / imp.rrw, 12);
      expect(imp.criticality).toBeCloseTo((imp.birnbaum * p) / top.probability.exact, 12);
    }
  });
});

describe('class importance (src/analysis/importance-classes.ts) against brute force', () => {
  const results = analyze(studyOf({ events: EVENTS, logic: LOGIC }));

  for (const [t, fn] of FUNCTIONS.entries()) {
    it(`top ${results.tops[t]!.id}: P(top | class failed), P(top | class working), FV, Birnbaum, RAW, RRW`, () => {
      const list = results.tops[t]!.class_importance!;
      const exact = enumerate(P, fn);
      let checked = 0;
      for (const [cls, members] of Object.entries(CLASSES)) {
        const p1 = enumerate(with_(Object.fromEntries(members.map((i) => [i, 1]))), fn);
        const p0 = enumerate(with_(Object.fromEntries(members.map((i) => [i, 0]))), fn);
        const c = list.find((x) => x.class === cls);
        if (p1 === p0) {
          // A class that cannot change the top is left out.
          expect(c).toBeUndefined();
          continue;
        }
        checked += 1;
        expect(c!.events).toEqual(members.map((i) => IDS[i]));
        expect(c!.p_failed).toBeCloseTo(p1, 14);
        expect(c!.p_working).toBeCloseTo(p0, 14);
        expect(c!.birnbaum).toBeCloseTo(p1 - p0, 14);
        expect(c!.fussell_vesely).toBeCloseTo((exact - p0) / exact, 12);
        expect(c!.raw).toBeCloseTo(p1 / exact, 10);
        expect(c!.rrw).toBeCloseTo(exact / p0, 10);
      }
      expect(checked).toBeGreaterThanOrEqual(2);
      // Ranked by FV, highest first.
      for (let k = 1; k < list.length; k++) expect(list[k - 1]!.fussell_vesely).toBeGreaterThanOrEqual(list[k]!.fussell_vesely);
    });
  }

  it('with negation FV can be negative: the operator enters the odd top negated, so P0 > P (FV = (P − P0)/P < 0)', () => {
    // Only a non-coherent tree allows this (common practice, no source); brute force gives the value.
    const odd = results.tops[1]!;
    const op = odd.importance!.find((x) => x.event === 'op')!;
    const exact = enumerate(P, oddTop);
    const p0 = enumerate(with_({ 5: 0 }), oddTop);
    expect(op.fussell_vesely).toBeLessThan(0);
    expect(op.fussell_vesely).toBeCloseTo((exact - p0) / exact, 12);
  });

  it('a class of one event has exactly that event’s FV, Birnbaum, RAW and RRW', () => {
    const top = results.tops[0]!;
    const c = top.class_importance!.find((x) => x.class === 'power-supply')!;
    const e = top.importance!.find((x) => x.event === 'pw')!;
    expect(c.fussell_vesely).toBeCloseTo(e.fussell_vesely, 13);
    expect(c.birnbaum).toBeCloseTo(e.birnbaum, 14);
    expect(c.raw).toBeCloseTo(e.raw, 11);
    expect(c.rrw).toBeCloseTo(e.rrw, 11);
  });
});

describe('class importance with a common-cause group (beta factor, NUREG/CR-5485)', () => {
  // Invented: three pumps of one class in a beta-factor group, two of three needed, or x.
  const results = analyze(
    studyOf({
      events: `
classes:
  pump: { model: fixed, probability: { value: 0.1, source: test-data } }
events:
  a: { title: Pump A, class: pump }
  b: { title: Pump B, class: pump }
  c: { title: Pump C, class: pump }
  x: { title: Other, model: fixed, probability: { value: 0.05, source: test-data } }
`,
      logic: `
tops:
  t: { title: Two pumps fail or x, gate: g }
gates:
  g: { any: [x, two] }
  two: { atleast: 2, of: [a, b, c] }
common_cause:
  pumps: { members: [a, b, c], method: beta, beta: { value: 0.1, source: test-data } }
`,
    }),
  );
  // Variables a, b, c (independent parts (1 − β)Q = 0.09), x, and the shared event of all three
  // (βQ = 0.01); each member fails if its own part or the shared event occurs.
  const p = [0.09, 0.09, 0.09, 0.05, 0.01];
  const fn = (v: readonly boolean[]) => {
    const [a, b, c, x, s] = v;
    return Boolean(x) || [a || s, b || s, c || s].filter(Boolean).length >= 2;
  };

  it('the class holds the shared event too: all working leaves only x', () => {
    const exact = enumerate(p, fn);
    expect(results.tops[0]!.probability.exact).toBeCloseTo(exact, 14);
    const c = results.tops[0]!.class_importance!.find((k) => k.class === 'pump')!;
    const p1 = enumerate([1, 1, 1, 0.05, 1], fn);
    const p0 = enumerate([0, 0, 0, 0.05, 0], fn);
    expect(p0).toBeCloseTo(0.05, 15);
    expect(c.p_failed).toBeCloseTo(p1, 14);
    expect(c.p_working).toBeCloseTo(p0, 14);
    expect(c.fussell_vesely).toBeCloseTo((exact - p0) / exact, 12);
    expect(c.rrw).toBeCloseTo(exact / p0, 12);
  });
});

describe('importance that rounds to nothing', () => {
  // top = any[tiny, big, muted], tiny of class k (p = 1e-20), big 0.5, muted under an AND with a
  // house event that is off. Exact values by hand (NUREG/CR-3385 definitions):
  //   class FV of k = (P − P0)/P = 1e-20·(1 − 0.5)/P with P = 1 − (1 − 1e-20)(1 − 0.5),
  // which P − P0 formed by subtraction would give as 0; `muted` cannot change the top at all.
  const dir = writeStudy({
    events: `
classes:
  k: { title: K, model: fixed, probability: { value: 1e-20, source: test-data } }
events:
  tiny: { title: Tiny, class: k }
  big: { title: Big, model: fixed, probability: { value: 0.5, source: test-data } }
  muted: { title: Muted, model: fixed, probability: { value: 0.1, source: test-data } }
  house: { title: House, model: switch, on: false }
`,
    logic: `
tops:
  t: { title: T, gate: top }
gates:
  top: { any: [tiny, big, off] }
  off: { all: [muted, house] }
`,
    settings: '  samples: 0\n  horizon: 0',
  });
  const results = analyze(readStudy(dir));
  rmSync(dir, { recursive: true, force: true });
  const top = results.tops[0]!;

  it('class FV is computed like per-event FV, not by subtraction', () => {
    const P = 0.5 + 0.5 * 1e-20;
    const k = top.class_importance!.find((c) => c.class === 'k')!;
    expect(Math.abs(k.fussell_vesely - (1e-20 * 0.5) / P)).toBeLessThanOrEqual(1e-34);
    // The same as the single event's FV (a class of one event).
    const tiny = top.importance!.find((i) => i.event === 'tiny')!;
    expect(Math.abs(k.fussell_vesely - tiny.fussell_vesely)).toBeLessThanOrEqual(1e-34);
    expect(k.raw).toBeGreaterThanOrEqual(1);
    expect(k.rrw).toBeGreaterThanOrEqual(1);
  });

  it('events with zero importance are listed with a note, not dropped', () => {
    expect(top.importance!.map((i) => i.event)).not.toContain('muted');
    expect(top.no_effect!.events).toEqual(['muted']);
    expect(top.no_effect!.note).toMatch(/cannot|no change/);
  });
});
