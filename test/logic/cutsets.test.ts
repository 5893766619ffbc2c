import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { compile, cutSetBounds, minimalCutSets, probability, type CutSet } from '../../src/logic/index.js';
import type { LogicGraph } from '../../src/logic/graph.js';
import { bruteIsMonotone, bruteMinimalSets, bruteProbabilities, graphWithProbabilities } from './oracle.js';

/** The oracle's sets with probabilities, in the documented order (probability down, then indices). */
function bruteSorted(graph: LogicGraph, gate: number, p: ArrayLike<number>): CutSet[] {
  const sets = bruteMinimalSets(graph, gate).map((vars) => ({ vars, probability: vars.reduce((a, v) => a * p[v]!, 1) }));
  return sets.sort((a, b) => {
    if (a.probability !== b.probability) return b.probability - a.probability;
    for (let i = 0; i < Math.min(a.vars.length, b.vars.length); i++) if (a.vars[i] !== b.vars[i]) return a.vars[i]! - b.vars[i]!;
    return a.vars.length - b.vars.length;
  });
}

const key = (s: CutSet) => s.vars.join(',');

// Oracle: brute-force enumeration of the minimal true sets over all 2^n subsets (oracle.ts,
// /work/shared/reference/README.md "Independent oracle"); minimal cut sets as defined in
// NUREG-0492, Fault Tree Handbook (US NRC 1981).
describe('minimal cut sets vs brute force', () => {
  it('finds exactly the minimal cut sets of random coherent trees, sorted', () => {
    fc.assert(
      fc.property(graphWithProbabilities({ maxVars: 10, maxGates: 10, negation: false }), ({ graph, p }) => {
        const c = compile(graph);
        const top = graph.gates.length - 1;
        const r = minimalCutSets(c.manager, c.gateRoots[top]!, p);
        const expected = bruteSorted(graph, top, p);
        expect(r.sets.map(key)).toEqual(expected.map(key));
        r.sets.forEach((s, i) => expect(s.probability).toBe(expected[i]!.probability));
        expect(r.coherent).toBe(true);
        expect(r.truncated).toBe(0);
        expect(r.truncatedProbability).toBe(0);
        // The monotone hint must not change anything on a negation-free graph.
        const hinted = minimalCutSets(c.manager, c.gateRoots[top]!, p, { monotone: c.negationFree });
        expect(hinted.sets.map(key)).toEqual(expected.map(key));
      }),
      { numRuns: 200, seed: 101 },
    );
  });

  it('with negation, gives the minimal sets of the monotone relaxation and flags non-coherence', () => {
    fc.assert(
      fc.property(graphWithProbabilities({ maxVars: 9, maxGates: 10, negation: true }), ({ graph, p }) => {
        const c = compile(graph);
        const top = graph.gates.length - 1;
        const r = minimalCutSets(c.manager, c.gateRoots[top]!, p);
        expect(r.sets.map(key)).toEqual(bruteSorted(graph, top, p).map(key));
        expect(r.coherent).toBe(bruteIsMonotone(graph, top));
      }),
      { numRuns: 200, seed: 103 },
    );
  });

  it('honours cutoff and maximum order, and accounts exactly for what it dropped', () => {
    const arb = graphWithProbabilities({ maxVars: 10, maxGates: 10, negation: true }).chain((x) =>
      fc
        .record({
          cutoffPick: fc.double({ min: 0, max: 1, noNaN: true }),
          maxOrder: fc.integer({ min: 0, max: 5 }),
          // Small counting budgets run out, which must change only the accounting, never the sets.
          budget: fc.constantFrom(0, 1, 3, 20, undefined),
        })
        .map((o) => ({ ...x, ...o })),
    );
    fc.assert(
      fc.property(arb, ({ graph, p, cutoffPick, maxOrder, budget }) => {
        const c = compile(graph);
        const top = graph.gates.length - 1;
        const all = bruteSorted(graph, top, p);
        // A cutoff equal to one of the set probabilities tests the boundary (kept: ≥ cutoff).
        const cutoff = all.length ? all[Math.min(all.length - 1, Math.floor(cutoffPick * all.length))]!.probability : cutoffPick;
        const keep = all.filter((s) => s.probability >= cutoff && s.vars.length <= maxOrder);
        const drop = all.filter((s) => !(s.probability >= cutoff && s.vars.length <= maxOrder));
        const r = minimalCutSets(c.manager, c.gateRoots[top]!, p, { cutoff, maxOrder, truncationBudget: budget });
        expect(r.sets.map(key)).toEqual(keep.map(key));
        if (budget === undefined) expect(r.truncatedExact).toBe(true);
        if (r.truncatedExact) {
          expect(r.truncated).toBe(drop.length);
          const dropped = drop.reduce((a, s) => a + s.probability, 0);
          expect(Math.abs(r.truncatedProbability! - dropped)).toBeLessThanOrEqual(1e-12 * Math.max(1, dropped));
        } else {
          expect(r.truncated).toBeLessThanOrEqual(drop.length);
          expect(r.truncatedProbability).toBeUndefined();
        }
      }),
      { numRuns: 300, seed: 107 },
    );
  });

  it('keeps the most probable sets up to maxSets and accounts for the rest (exactly, or as upper bounds)', () => {
    // Oracle: brute-force enumeration (oracle.ts). Kept = the maxSets most probable of the sets that
    // meet the cutoff and order limit; near-ties (one part in 10^9, CAP_TIE_TOLERANCE) may trade places.
    const arb = graphWithProbabilities({ maxVars: 10, maxGates: 10, negation: true }).chain((x) =>
      fc
        .record({
          maxSets: fc.integer({ min: 1, max: 12 }),
          maxOrder: fc.integer({ min: 1, max: 6 }),
          budget: fc.constantFrom(0, 3, undefined),
        })
        .map((o) => ({ ...x, ...o })),
    );
    fc.assert(
      fc.property(arb, ({ graph, p, maxSets, maxOrder, budget }) => {
        const c = compile(graph);
        const top = graph.gates.length - 1;
        const eligible = bruteSorted(graph, top, p).filter((s) => s.vars.length <= maxOrder);
        const r = minimalCutSets(c.manager, c.gateRoots[top]!, p, { maxOrder, maxSets, truncationBudget: budget });
        const want = eligible.slice(0, maxSets);
        expect(r.sets.length).toBe(want.length);
        const eligibleKeys = new Set(eligible.map(key));
        r.sets.forEach((s, i) => {
          expect(eligibleKeys.has(key(s))).toBe(true);
          expect(Math.abs(s.probability - want[i]!.probability)).toBeLessThanOrEqual(2e-9 * want[i]!.probability);
        });
        const keptSum = r.sets.reduce((a, s) => a + s.probability, 0);
        const restSum = eligible.reduce((a, s) => a + s.probability, 0) - keptSum;
        const rest = eligible.length - r.sets.length;
        if (budget === undefined) expect(r.cappedExact).toBe(true);
        if (r.cappedExact) {
          expect(r.capped).toBe(rest);
          expect(Math.abs(r.cappedProbability - restSum)).toBeLessThanOrEqual(1e-12);
        } else {
          expect(r.capped).toBeGreaterThanOrEqual(rest);
          expect(r.cappedProbability).toBeGreaterThanOrEqual(restSum - 1e-12);
        }
      }),
      { numRuns: 300, seed: 109 },
    );
  });

  it('caps 10^8 equally probable sets without enumerating them', () => {
    // Invented example: four trains of 100 parts each, every part 2e-3. The minimal cut sets are
    // one part from each train: 100^4 = 10^8 of them, each 2e-3^4, summing to (100·2e-3)^4
    // (common practice, no source: the product of the trains' sums).
    const parts = 100;
    const variables = Array.from({ length: 4 * parts }, (_, i) => `t${Math.floor(i / parts)}-p${i % parts}`);
    const graph: LogicGraph = {
      variables,
      gates: [
        { id: 'all', op: 'and', inputs: [1, 2, 3, 4].map((index) => ({ kind: 'gate', index }) as const) },
        ...[0, 1, 2, 3].map((t) => ({
          id: `train-${t}`,
          op: 'or' as const,
          inputs: Array.from({ length: parts }, (_, i) => ({ kind: 'var', index: t * parts + i }) as const),
        })),
      ],
    };
    const p = new Float64Array(4 * parts).fill(2e-3);
    const c = compile(graph);
    const r = minimalCutSets(c.manager, c.gateRoots[0]!, p, { cutoff: 1e-12, maxOrder: 8, maxSets: 1000 });
    expect(r.sets.length).toBe(1000);
    r.sets.forEach((s) => expect(s.vars.length).toBe(4));
    expect(r.capped).toBe(1e8 - 1000);
    const each = 2e-3 ** 4;
    expect(r.cappedProbability).toBeCloseTo((1e8 - 1000) * each, 15);
  });

  it('reports a lower bound when the counting budget runs out', () => {
    const n = 14;
    // Invented example: 7-out-of-14 voting has C(14,7) = 3432 minimal cut sets of order 7.
    const graph: LogicGraph = {
      variables: Array.from({ length: n }, (_, i) => `e${i}`),
      gates: [{ id: 'vote', op: 'atleast', k: 7, inputs: Array.from({ length: n }, (_, i) => ({ kind: 'var', index: i })) }],
    };
    const p = new Float64Array(n).fill(0.1);
    const c = compile(graph);
    const full = minimalCutSets(c.manager, c.gateRoots[0]!, p, { maxOrder: 6 });
    expect(full.sets.length).toBe(0);
    expect(full.truncated).toBe(3432);
    expect(full.truncatedExact).toBe(true);
    const small = minimalCutSets(c.manager, c.gateRoots[0]!, p, { maxOrder: 6, truncationBudget: 50 });
    expect(small.truncatedExact).toBe(false);
    expect(small.truncated).toBeLessThan(3432);
    expect(small.truncatedProbability).toBeUndefined();
  });

  it('keeps the same sets when the counting budget is spent at once (regression)', () => {
    // Found by a property search against the brute-force oracle: a 3-of-5 vote with one event
    // entered twice, order limit 2. Spending the budget used to corrupt the search's state.
    const graph: LogicGraph = {
      variables: ['e0', 'e1', 'e2', 'e3', 'e4', 'e5'],
      gates: [{ id: 'g0', op: 'atleast', k: 3, inputs: [1, 2, 3, 0, 0].map((index) => ({ kind: 'var', index }) as const) }],
    };
    const p = [0.1, 0.2, 0.3, 0.4, 0.5, 0.6];
    const c = compile(graph);
    const expected = bruteSorted(graph, 0, p).filter((s) => s.vars.length <= 2);
    for (const truncationBudget of [0, 1, 2, 5, 100]) {
      const r = minimalCutSets(c.manager, c.gateRoots[0]!, p, { maxOrder: 2, truncationBudget });
      expect(r.sets.map(key)).toEqual(expected.map(key));
    }
  });

  it('hand example: absorption gives {A} and {B, C} for (A or B) and (A or C)', () => {
    // Common practice, no source: Boolean absorption, A·A = A and A + A·X = A.
    const graph: LogicGraph = {
      variables: ['A', 'B', 'C'],
      gates: [
        { id: 'top', op: 'and', inputs: [{ kind: 'gate', index: 1 }, { kind: 'gate', index: 2 }] },
        { id: 'g1', op: 'or', inputs: [{ kind: 'var', index: 0 }, { kind: 'var', index: 1 }] },
        { id: 'g2', op: 'or', inputs: [{ kind: 'var', index: 0 }, { kind: 'var', index: 2 }] },
      ],
    };
    const c = compile(graph);
    const r = minimalCutSets(c.manager, c.gateRoots[0]!, [0.01, 0.2, 0.3]);
    expect(r.sets).toEqual([
      { vars: [1, 2], probability: 0.2 * 0.3 },
      { vars: [0], probability: 0.01 },
    ]);
  });
});

describe('cut-set bounds', () => {
  // Esary–Proschan: for a coherent tree with independent events,
  // exact ≤ min-cut upper bound ≤ rare-event sum (NUREG-0492; reference README, "Fault trees").
  it('exact ≤ MCUB ≤ rare-event sum on random coherent trees', () => {
    fc.assert(
      fc.property(graphWithProbabilities({ maxVars: 10, maxGates: 10, negation: false }), ({ graph, p }) => {
        const c = compile(graph);
        const top = graph.gates.length - 1;
        const exact = probability(c.manager, c.gateRoots[top]!, p);
        expect(Math.abs(exact - bruteProbabilities(graph, p)[top]!)).toBeLessThanOrEqual(1e-12);
        const { rareEvent, mcub } = cutSetBounds(minimalCutSets(c.manager, c.gateRoots[top]!, p).sets);
        const tol = 1e-12;
        expect(exact).toBeLessThanOrEqual(mcub + tol);
        expect(mcub).toBeLessThanOrEqual(rareEvent + tol);
      }),
      { numRuns: 200, seed: 109 },
    );
  });

  it('computes MCUB without cancellation for tiny cut sets', () => {
    // 1 − (1 − 1e-20)³ = 3e-20 to first order; forming the product naively gives exactly 0.
    const sets = [1e-20, 1e-20, 1e-20].map((probability) => ({ vars: [], probability }));
    const b = cutSetBounds(sets);
    expect(Math.abs(b.mcub / 3e-20 - 1)).toBeLessThan(1e-12);
    expect(Math.abs(b.rareEvent / 3e-20 - 1)).toBeLessThan(1e-15);
    // Definition check at ordinary values: 1 − (0.9·0.8) = 0.28, sum 0.3 (common practice, no source).
    const c = cutSetBounds([{ probability: 0.1 }, { probability: 0.2 }]);
    expect(c.mcub).toBeCloseTo(0.28, 15);
    expect(c.rareEvent).toBeCloseTo(0.3, 15);
    expect(cutSetBounds([{ probability: 1 }, { probability: 0.5 }]).mcub).toBe(1);
    expect(cutSetBounds([])).toEqual({ rareEvent: 0, mcub: 0 });
  });
});
