// Importance in coherent trees and group reductions, against exact oracles: brute-force enumeration
// of all 2^n states (test/logic/oracle.ts). In a coherent (monotone) function P(top | x false) ≤
// P(top) ≤ P(top | x true), so Birnbaum ≥ 0, 0 ≤ FV ≤ 1, RAW ≥ 1 and RRW ≥ 1 hold exactly
// (W. E. Vesely et al., NUREG/CR-3385, 1983); rounding must not be reported as a violation.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { compile, importance, ProbabilityEvaluator } from '../../src/logic/index.js';
import { evaluateGates, graphWithProbabilities, stateProbability } from './oracle.js';

describe('importance in coherent trees', () => {
  it('stays in the coherent ranges, and clamping moves nothing beyond rounding', () => {
    // Without the clamp about 2% of these trees report e.g. RAW = 0.9999999999999998 (measured).
    fc.assert(
      fc.property(graphWithProbabilities({ maxVars: 10, maxGates: 10, negation: false }), ({ graph, p }) => {
        const c = compile(graph);
        const root = c.gateRoots[graph.gates.length - 1]!;
        const raw = importance(c.manager, root, p);
        const imp = importance(c.manager, root, p, undefined, { coherent: true });
        const P = imp.probability;
        for (let v = 0; v < p.length; v++) {
          expect(imp.birnbaum[v]!).toBeGreaterThanOrEqual(0);
          expect(imp.fussellVesely[v]!).toBeGreaterThanOrEqual(0);
          expect(imp.fussellVesely[v]!).toBeLessThanOrEqual(1);
          expect(imp.raw[v]!).toBeGreaterThanOrEqual(1);
          expect(imp.rrw[v]!).toBeGreaterThanOrEqual(1);
          expect(Math.abs(imp.birnbaum[v]! - raw.birnbaum[v]!)).toBeLessThanOrEqual(1e-14);
          expect(Math.abs(imp.conditionalTrue[v]! - raw.conditionalTrue[v]!)).toBeLessThanOrEqual(1e-14 * Math.max(P, 1e-300) + 1e-300);
          expect(Math.abs(imp.conditionalFalse[v]! - raw.conditionalFalse[v]!)).toBeLessThanOrEqual(1e-14 * Math.max(P, 1e-300) + 1e-300);
        }
      }),
      { numRuns: 1500, seed: 5 },
    );
  });
});

describe('group reduction P − P(group held false)', () => {
  /** Σ over states of pr(s)·[top(s) − top(s with the group false)]: one term per state. */
  function bruteReduction(graph: Parameters<typeof evaluateGates>[0], p: Float64Array, group: boolean[], gate: number): number {
    const n = graph.variables.length;
    let mask = 0;
    group.forEach((g, v) => (mask |= g ? 1 << v : 0));
    let sum = 0;
    for (let s = 0; s < 1 << n; s++) {
      const d = evaluateGates(graph, s)[gate]! - evaluateGates(graph, s & ~mask)[gate]!;
      if (d !== 0) sum += d * stateProbability(s, p);
    }
    return sum;
  }

  it('equals enumeration on random trees, with and without negation', () => {
    const arb = graphWithProbabilities({ maxVars: 9, maxGates: 8, negation: true }).chain((x) =>
      fc.array(fc.boolean(), { minLength: x.graph.variables.length, maxLength: x.graph.variables.length }).map((group) => ({ ...x, group })),
    );
    fc.assert(
      fc.property(arb, ({ graph, p, group }) => {
        const c = compile(graph);
        const top = graph.gates.length - 1;
        const got = new ProbabilityEvaluator(c.manager, [c.gateRoots[top]!]).groupReduction(p, group.map(Number))[0]!;
        const want = bruteReduction(graph, p, group, top);
        expect(Math.abs(got - want)).toBeLessThanOrEqual(1e-13);
      }),
      { numRuns: 300, seed: 6 },
    );
  });

  it('keeps a tiny group’s share of a large probability (where P − P0 by subtraction gives 0)', () => {
    // top = a OR b, group {a}: P − P0 = p_a·(1 − p_b) exactly (a fails the top only when b does not).
    const c = compile({ variables: ['a', 'b'], gates: [{ id: 'top', op: 'or', inputs: [{ kind: 'var', index: 0 }, { kind: 'var', index: 1 }] }] });
    const p = Float64Array.of(1e-20, 0.5);
    const ev = new ProbabilityEvaluator(c.manager, [c.gateRoots[0]!]);
    expect(ev.evaluate(p)[0]! - ev.evaluate(Float64Array.of(0, 0.5))[0]!).toBe(0);
    expect(ev.groupReduction(p, [1, 0])[0]!).toBeCloseTo(1e-20 * 0.5, 35);
  });
});
