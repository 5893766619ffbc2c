import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { compile, probability, probabilityPair, ProbabilityEvaluator } from '../../src/logic/index.js';
import type { LogicGraph } from '../../src/logic/graph.js';
import { bruteProbabilities, graphWithProbabilities, permutation, probabilityVector } from './oracle.js';

// Exact probability against the independent oracle: enumeration of all 2^n states
// (/work/shared/reference/README.md, "Independent oracle": match to 1e-12 absolute).
describe('exact probability vs enumeration of all states', () => {
  it('matches on random graphs with shared events, voting and negation (up to 12 events)', () => {
    fc.assert(
      fc.property(graphWithProbabilities({ maxVars: 12, maxGates: 12, negation: true }), ({ graph, p }) => {
        const c = compile(graph);
        const brute = bruteProbabilities(graph, p);
        graph.gates.forEach((_, g) => {
          expect(Math.abs(probability(c.manager, c.gateRoots[g]!, p) - brute[g]!)).toBeLessThanOrEqual(1e-12);
        });
      }),
      { numRuns: 150, seed: 20260630 },
    );
  });

  it('matches on larger random graphs (16 to 20 events)', () => {
    fc.assert(
      fc.property(graphWithProbabilities({ minVars: 16, maxVars: 20, maxGates: 14, negation: true }), ({ graph, p }) => {
        const c = compile(graph);
        const top = graph.gates.length - 1;
        const brute = bruteProbabilities(graph, p);
        expect(Math.abs(probability(c.manager, c.gateRoots[top]!, p) - brute[top]!)).toBeLessThanOrEqual(1e-12);
      }),
      { numRuns: 6, seed: 7 },
    );
  });

  it('does not depend on the variable order', () => {
    const arb = graphWithProbabilities({ maxVars: 10, maxGates: 10, negation: true }).chain((x) =>
      permutation(x.graph.variables.length).map((order) => ({ ...x, order })),
    );
    fc.assert(
      fc.property(arb, ({ graph, p, order }) => {
        const a = compile(graph);
        const b = compile(graph, { order });
        expect(b.order).toEqual(order);
        const top = graph.gates.length - 1;
        const pa = probability(a.manager, a.gateRoots[top]!, p);
        const pb = probability(b.manager, b.gateRoots[top]!, p);
        expect(Math.abs(pa - pb)).toBeLessThanOrEqual(1e-12);
      }),
      { numRuns: 100, seed: 11 },
    );
  });

  it('evaluates prepared roots at many probability vectors like one-off calls', () => {
    const arb = graphWithProbabilities({ maxVars: 8, maxGates: 8, negation: true }).chain((x) =>
      probabilityVector(x.graph.variables.length).map((p2) => ({ ...x, p2 })),
    );
    fc.assert(
      fc.property(arb, ({ graph, p, p2 }) => {
        const c = compile(graph);
        const roots = Array.from(c.gateRoots);
        const ev = new ProbabilityEvaluator(c.manager, roots);
        for (const pv of [p, p2]) {
          const all = ev.evaluate(pv);
          const brute = bruteProbabilities(graph, pv);
          roots.forEach((_, g) => expect(Math.abs(all[g]! - brute[g]!)).toBeLessThanOrEqual(1e-12));
        }
      }),
      { numRuns: 60, seed: 3 },
    );
  });
});

const v = (index: number) => ({ kind: 'var', index }) as const;

describe('numerical care at the extremes', () => {
  // Closed forms below are common practice, no source: independent events multiply; 2-out-of-3
  // of equal p is 3p² − 2p³; an OR is false only when every input is.
  it('keeps full relative accuracy far below 1e-15', () => {
    const n = 20;
    const graph: LogicGraph = {
      variables: Array.from({ length: n }, (_, i) => `e${i}`),
      gates: [{ id: 'all', op: 'and', inputs: Array.from({ length: n }, (_, i) => v(i)) }],
    };
    const p = new Float64Array(n).fill(1e-15);
    const c = compile(graph);
    const P = probability(c.manager, c.gateRoots[0]!, p);
    expect(P / 1e-300 - 1).toBeLessThan(1e-13);
    expect(P).toBeGreaterThan(0);
  });

  it('gets 2-out-of-3 of tiny probabilities to relative precision', () => {
    const graph: LogicGraph = {
      variables: ['a', 'b', 'c'],
      gates: [{ id: 'vote', op: 'atleast', k: 2, inputs: [v(0), v(1), v(2)] }],
    };
    const x = 1e-9;
    const c = compile(graph);
    const P = probability(c.manager, c.gateRoots[0]!, [x, x, x]);
    const expected = 3 * x * x - 2 * x * x * x;
    expect(Math.abs(P / expected - 1)).toBeLessThan(1e-14);
  });

  it('computes the complement of a probability near 1 without cancellation', () => {
    const graph: LogicGraph = {
      variables: ['a', 'b', 'c'],
      gates: [{ id: 'any', op: 'or', inputs: [v(0), v(1), v(2)] }],
    };
    const q = [1e-10, 2e-10, 3e-10];
    const p = q.map((x) => 1 - x);
    const c = compile(graph);
    const pair = probabilityPair(c.manager, c.gateRoots[0]!, p, q);
    // 1 − P(any) = Π q_i = 6e-30, far below what 1 − P could resolve.
    expect(Math.abs(pair.q / 6e-30 - 1)).toBeLessThan(1e-14);
    expect(pair.p).toBe(1);
  });

  it('handles a 30,000-event chain without exhausting the call stack', () => {
    const n = 30_000;
    const graph: LogicGraph = {
      variables: Array.from({ length: n }, (_, i) => `e${i}`),
      gates: [
        { id: 'any', op: 'or', inputs: Array.from({ length: n }, (_, i) => v(i)) },
        { id: 'all', op: 'and', inputs: Array.from({ length: n }, (_, i) => v(i)) },
        { id: 'both', op: 'and', inputs: [{ kind: 'gate', index: 0 }, v(0)] },
      ],
    };
    const p = new Float64Array(n).fill(1e-5);
    const c = compile(graph);
    const P = probability(c.manager, c.gateRoots[0]!, p);
    // 1 − (1 − p)^n by log1p/expm1. The diagram multiplies the rounded 1 − p thirty thousand
    // times, so the two legitimately differ by about n·ε·(1 − P)/P ≈ 1e-11 relative.
    expect(Math.abs(P / -Math.expm1(n * Math.log1p(-1e-5)) - 1)).toBeLessThan(2e-11);
    expect(probability(c.manager, c.gateRoots[1]!, new Float64Array(n).fill(0.9999))).toBeCloseTo(0.9999 ** n, 14);
    expect(probability(c.manager, c.gateRoots[2]!, p)).toBe(1e-5);
  });
});
