/**
 * Load-range event trees and the combination of failure modes. References: brute-force enumeration
 * of every state of the basic events (the independent oracle of ../shared/reference/README.md); the
 * law of total probability (the sequences of a tree partition each range; common practice, no
 * source); the uni-modal bounds max P_i ≤ P(∪) ≤ 1 − Π(1 − P_i), whose upper bound is a theorem for
 * increasing functions of independent events (Harris–FKG inequality; Esary, Proschan & Walkup 1967,
 * from memory); the common-cause adjustment as stated in src/analysis/combine-modes.ts after Hill,
 * Bowles, Jordan & Nathan (ANCOLD 2003, from memory), checked against its own definition by
 * enumeration. Every study number is INVENTED for the test.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { commonCauseAdjustment, uniModalBounds } from '../../src/analysis/combine-modes.js';
import { StudyError } from '../../src/study/errors.js';
import { arrangeSequences } from '../../src/study/event-trees.js';
import type { BranchState } from '../../src/study/types.js';
import { enumerate, eventsYaml, rel, run } from './helpers.js';

// Variables in this order for the oracle: power, x1, x2, x3, y.
const P = [0.05, 0.1, 0.15, 0.2, 0.3];
const EVENTS = eventsYaml([['power', P[0]!], ['x1', P[1]!], ['x2', P[2]!], ['x3', P[3]!], ['y', P[4]!]]);
const LOGIC = `tops:
  t-y: { title: y or no power (invented), gate: gy }
gates:
  g1: { any: [power, x1] }
  g2: { any: [power, x2] }
  g3: { any: [power, x3] }
  gy: { any: [power, y] }
  all3: { all: [g1, g2, g3] }
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
      A: { title: first gate, fails: { gate: g1 } }
      B: { title: enough gates, fails: { atleast: { r1: 2, r2: 1 }, of: [g1, g2, g3] } }
      C: { title: fixed, fails: { probability: 0.2, source: test-data } }
      D: { title: a top, fails: { top: t-y } }
    outcomes:
      ok: { title: fine }
      bad: { title: bad }
      worse: { title: worse }
    sequences:
      - { when: { A: fails, D: fails }, outcome: worse }
      - { when: { A: works, B: works }, outcome: ok }
      - { when: { A: works, B: fails, C: works }, outcome: bad }
      - { when: { A: works, B: fails, C: fails }, outcome: worse }
      - { when: { A: fails, D: works }, outcome: bad }
`;

describe('load-range event tree', () => {
  const { results } = run({ events: EVENTS, logic: LOGIC });
  const tree = results.event_trees![0]!;

  it('puts the sequences in tree order and sums the outcomes to the initiating probability', () => {
    expect(tree.sequences.map((s) => s.path)).toEqual([
      ['works', 'works', null, null],
      ['works', 'fails', 'works', null],
      ['works', 'fails', 'fails', null],
      ['fails', null, null, 'works'],
      ['fails', null, null, 'fails'],
    ]);
    expect(tree.load.basis).toBe('mixed');
    // r1: AEP 0.1 − 0.01 = 0.09 per year; r2: 0.002 per year.
    expect(tree.load.ranges.map((r) => r.probability)).toEqual([0.1 - 0.01, 0.002]);
    expect(rel(tree.check.sum_of_outcomes, 0.092)).toBeLessThanOrEqual(1e-14);
    tree.load.ranges.forEach((r, i) => {
      const s = tree.outcomes.reduce((a, o) => a + o.by_range[i]!, 0);
      expect(rel(s, r.probability)).toBeLessThanOrEqual(1e-14);
    });
  });

  it('quantifies each sequence, shared events and all, as brute-force enumeration does', () => {
    const g1 = (x: readonly boolean[]) => x[0]! || x[1]!;
    const g2 = (x: readonly boolean[]) => x[0]! || x[2]!;
    const g3 = (x: readonly boolean[]) => x[0]! || x[3]!;
    const gy = (x: readonly boolean[]) => x[0]! || x[4]!;
    const k = [2, 1];
    const conds: ((x: readonly boolean[], r: number) => boolean)[] = [
      (x) => g1(x),
      (x, r) => Number(g1(x)) + Number(g2(x)) + Number(g3(x)) >= k[r]!,
      () => true, // C is a fixed probability, a factor of its own
      (x) => gy(x),
    ];
    for (const s of tree.sequences) {
      for (let r = 0; r < 2; r++) {
        let factor = 1;
        if (s.path[2] === 'fails') factor = 0.2;
        if (s.path[2] === 'works') factor = 0.8;
        const logic = enumerate(P, (x) =>
          s.path.every((state, h) => state === null || h === 2 || (state === 'fails' ? conds[h]!(x, r) : !conds[h]!(x, r))),
        );
        expect(Math.abs(s.conditional[r]! - factor * logic)).toBeLessThanOrEqual(1e-14);
      }
    }
    // The product of branch numbers is not the same thing where events are shared: P(A ∧ D) ≠ P(A)P(D).
    const last = tree.sequences[4]!;
    const pA = enumerate(P, g1);
    const pD = enumerate(P, gy);
    expect(rel(last.product_of_branches, 0.092 * pA * pD)).toBeLessThanOrEqual(1e-12);
    // By hand, conditioning on power: P(A ∧ D) = P_power + (1 − P_power)·P_x1·P_y = 0.0785, against
    // P(A)·P(D) = 0.145 × 0.335 = 0.0486 as a product of branch numbers.
    expect(rel(last.probability, 0.092 * (0.05 + 0.95 * 0.1 * 0.3))).toBeLessThanOrEqual(1e-12);
    expect(rel(last.product_of_branches, 0.092 * 0.145 * 0.335)).toBeLessThanOrEqual(1e-12);
  });

  it('reports each heading’s own failure probability per range', () => {
    const B = tree.headings[1]!;
    expect(B.k).toEqual([2, 1]);
    const atLeast = (k: number) => enumerate(P, (x) => Number(x[0]! || x[1]!) + Number(x[0]! || x[2]!) + Number(x[0]! || x[3]!) >= k);
    expect(rel(B.fails[0]!, atLeast(2))).toBeLessThanOrEqual(1e-12);
    expect(rel(B.fails[1]!, atLeast(1))).toBeLessThanOrEqual(1e-12);
    expect(tree.headings[2]!.fails).toEqual([0.2, 0.2]);
  });

  it('gives the tree’s numbers a place in the provenance register', () => {
    const keys = results.parameters.filter((p) => p.owner_kind === 'tree').map((p) => p.key);
    expect(keys).toEqual(['tree.r1.aep_upper', 'tree.r1.aep_lower', 'tree.r2.frequency', 'tree.C.probability']);
    expect(results.parameters.find((p) => p.key === 'tree.r1.aep_upper')!.used_by).toEqual(['tree']);
  });
});

describe('tree structure', () => {
  const at = { file: 'logic.yaml', line: 1, col: 1 };
  const seq = (...path: (BranchState | null)[]) => ({ path, at });
  const message = (fn: () => unknown): string => {
    try {
      fn();
    } catch (e) {
      if (e instanceof StudyError) return e.message;
      throw e;
    }
    return '';
  };

  it('accepts a tree and orders it works-first', () => {
    const out = arrangeSequences([seq('fails', 'fails'), seq('works', null), seq('fails', 'works')], ['a', 'b'], at);
    expect(out.map((s) => s.path)).toEqual([['works', null], ['fails', 'works'], ['fails', 'fails']]);
  });

  it('refuses overlap, a missing branch and a branch covered twice', () => {
    expect(message(() => arrangeSequences([seq('works', null), seq('works', 'fails'), seq('fails', null)], ['a', 'b'], at))).toMatch(/overlap/);
    expect(message(() => arrangeSequences([seq('works', null), seq('fails', 'works')], ['a', 'b'], at))).toMatch(/no sequence covers 'b: fails' after a fails/);
    expect(message(() => arrangeSequences([seq('works'), seq('works'), seq('fails')], ['a'], at))).toMatch(/same branch/);
  });

  it('refuses a study tree whose sequences do not cover it, naming the branch', () => {
    expect(() =>
      run({
        events: EVENTS,
        logic: LOGIC.replace('      - { when: { A: fails, D: works }, outcome: bad }\n', ''),
      }),
    ).toThrow(/no sequence covers 'D: works' after A fails/);
  });
});

describe('combining failure modes that share a load', () => {
  it('uni-modal bounds bracket the exact union of increasing modes of shared events (enumeration)', () => {
    // Modes: random monotone DNFs over 3..7 shared independent events; the exact union and each
    // mode's probability by enumerating all states.
    const modeArb = (nv: number) => fc.array(fc.uniqueArray(fc.integer({ min: 0, max: nv - 1 }), { minLength: 1, maxLength: 3 }), { minLength: 1, maxLength: 3 });
    fc.assert(
      fc.property(
        fc.integer({ min: 3, max: 7 }).chain((nv) =>
          fc.record({
            p: fc.array(fc.double({ min: 0.01, max: 0.6, noNaN: true }), { minLength: nv, maxLength: nv }),
            modes: fc.array(modeArb(nv), { minLength: 2, maxLength: 4 }),
          }),
        ),
        ({ p, modes }) => {
          const occurs = (mode: number[][], x: readonly boolean[]) => mode.some((term) => term.every((v) => x[v]!));
          const pm = modes.map((mode) => enumerate(p, (x) => occurs(mode, x)));
          const union = enumerate(p, (x) => modes.some((mode) => occurs(mode, x)));
          const b = uniModalBounds(pm);
          const slack = 1e-12;
          expect(b.lower).toBeLessThanOrEqual(union + slack);
          expect(union).toBeLessThanOrEqual(b.upper + slack);
          expect(b.upper).toBeLessThanOrEqual(b.sum + slack);
        },
      ),
      { numRuns: 200, seed: 20030 },
    );
  });

  it('the common-cause adjustment: P_A(1 − P_B/2) for two modes, P_A(1 − (P_B + P_C)/2 + P_B·P_C/3) for three', () => {
    const [a, b] = commonCauseAdjustment([0.3, 0.2]);
    expect(rel(a!, 0.3 * (1 - 0.2 / 2))).toBeLessThanOrEqual(1e-15);
    expect(rel(b!, 0.2 * (1 - 0.3 / 2))).toBeLessThanOrEqual(1e-15);
    const [x] = commonCauseAdjustment([0.3, 0.2, 0.1]);
    expect(rel(x!, 0.3 * (1 - (0.2 + 0.1) / 2 + (0.2 * 0.1) / 3))).toBeLessThanOrEqual(1e-15);
  });

  it('the adjustment shares each joint occurrence equally (enumeration) and adds up to the upper bound', () => {
    const p = [0.4, 0.25, 0.1, 0.05];
    const adjusted = commonCauseAdjustment(p);
    // Oracle: every state of four independent modes, its probability split equally among the modes in it.
    const want = p.map(() => 0);
    for (let s = 1; s < 16; s++) {
      let w = 1;
      const on: number[] = [];
      p.forEach((pi, i) => {
        const x = ((s >> i) & 1) === 1;
        w *= x ? pi : 1 - pi;
        if (x) on.push(i);
      });
      for (const i of on) want[i]! += w / on.length;
    }
    adjusted.forEach((v, i) => expect(Math.abs(v - want[i]!)).toBeLessThanOrEqual(1e-15));
    expect(rel(adjusted.reduce((s, v) => s + v, 0), uniModalBounds(p).upper)).toBeLessThanOrEqual(1e-14);
  });

  it('combines an event-tree outcome with per-range modes range by range', () => {
    const logic =
      LOGIC +
      `failure_modes:
  dam:
    title: All modes (invented)
    load: tree
    modes:
      from-tree: { title: worse outcome, outcome: worse }
      other: { title: other mode, by_range: { r1: 0.01, r2: 0.1 }, source: test-data }
`;
    const { results } = run({ events: EVENTS, logic });
    const f = results.failure_modes![0]!;
    const tree = results.event_trees![0]!;
    const worse = tree.outcomes.find((o) => o.id === 'worse')!;
    const cond = worse.by_range.map((x, r) => x / tree.load.ranges[r]!.probability);
    f.modes[0]!.conditional.forEach((c, r) => expect(rel(c, cond[r]!)).toBeLessThanOrEqual(1e-14));
    expect(f.modes[1]!.conditional).toEqual([0.01, 0.1]);
    // Per range: sum, max, 1 − Π(1 − P), then weighted by the range probabilities 0.09 and 0.002.
    const w = [0.09, 0.002];
    const upper = w.reduce((s, wr, r) => s + wr * (1 - (1 - cond[r]!) * (1 - [0.01, 0.1][r]!)), 0);
    expect(rel(f.annual.upper, upper)).toBeLessThanOrEqual(1e-12);
    const lower = w.reduce((s, wr, r) => s + wr * Math.max(cond[r]!, [0.01, 0.1][r]!), 0);
    expect(rel(f.annual.lower, lower)).toBeLessThanOrEqual(1e-12);
    expect(rel(f.modes[0]!.adjusted_annual + f.modes[1]!.adjusted_annual, f.annual.upper)).toBeLessThanOrEqual(1e-12);
  });
});
