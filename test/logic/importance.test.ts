import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { compile, importance, probability } from '../../src/logic/index.js';
import type { LogicGraph } from '../../src/logic/graph.js';
import { bruteProbabilities, randomGraph } from './oracle.js';

// Definitions: W. E. Vesely et al., "Measures of Risk Importance and Their Applications",
// NUREG/CR-3385 (US NRC 1983); Birnbaum I_B = P(top | i failed) − P(top | i works)
// (reference README, "Fault trees"). Oracle: enumeration of all states with the event held
// true or false (oracle.ts), and finite differences of the exact top probability.
const interior = (n: number) =>
  fc.array(fc.double({ min: 0.01, max: 0.99, noNaN: true }), { minLength: n, maxLength: n }).map((a) => Float64Array.from(a));

const arb = randomGraph({ maxVars: 9, maxGates: 10, negation: true }).chain((graph) =>
  interior(graph.variables.length).map((p) => ({ graph, p })),
);

describe('importance on the diagram', () => {
  it('conditional probabilities match enumeration with the event held true / false', () => {
    fc.assert(
      fc.property(arb, ({ graph, p }) => {
        const c = compile(graph);
        const top = graph.gates.length - 1;
        const imp = importance(c.manager, c.gateRoots[top]!, p);
        expect(Math.abs(imp.probability - bruteProbabilities(graph, p)[top]!)).toBeLessThanOrEqual(1e-12);
        for (let i = 0; i < p.length; i++) {
          const on = Float64Array.from(p);
          on[i] = 1;
          const off = Float64Array.from(p);
          off[i] = 0;
          const p1 = bruteProbabilities(graph, on)[top]!;
          const p0 = bruteProbabilities(graph, off)[top]!;
          expect(Math.abs(imp.conditionalTrue[i]! - p1)).toBeLessThanOrEqual(1e-12);
          expect(Math.abs(imp.conditionalFalse[i]! - p0)).toBeLessThanOrEqual(1e-12);
          expect(Math.abs(imp.birnbaum[i]! - (p1 - p0))).toBeLessThanOrEqual(1e-12);
        }
      }),
      { numRuns: 80, seed: 201 },
    );
  });

  it('Birnbaum equals the partial derivative (central finite difference)', () => {
    fc.assert(
      fc.property(arb, ({ graph, p }) => {
        const c = compile(graph);
        const root = c.gateRoots[graph.gates.length - 1]!;
        const imp = importance(c.manager, root, p);
        const h = 1e-3;
        for (let i = 0; i < p.length; i++) {
          const up = Float64Array.from(p);
          up[i] = p[i]! + h;
          const down = Float64Array.from(p);
          down[i] = p[i]! - h;
          // P is multilinear, so the central difference is exact up to rounding.
          const fd = (probability(c.manager, root, up) - probability(c.manager, root, down)) / (2 * h);
          expect(Math.abs(imp.birnbaum[i]! - fd)).toBeLessThanOrEqual(1e-10);
        }
      }),
      { numRuns: 80, seed: 203 },
    );
  });

  it('FV, criticality, RAW and RRW satisfy their defining identities', () => {
    fc.assert(
      fc.property(arb, ({ graph, p }) => {
        const c = compile(graph);
        const imp = importance(c.manager, c.gateRoots[graph.gates.length - 1]!, p);
        const P = imp.probability;
        for (let i = 0; i < p.length; i++) {
          const p1 = imp.conditionalTrue[i]!;
          const p0 = imp.conditionalFalse[i]!;
          // Multilinearity: P = p·P1 + (1 − p)·P0.
          expect(Math.abs(p[i]! * p1 + (1 - p[i]!) * p0 - P)).toBeLessThanOrEqual(1e-12);
          if (P > 1e-9) {
            expect(Math.abs(imp.fussellVesely[i]! - (1 - p0 / P))).toBeLessThanOrEqual(1e-9);
            expect(Math.abs(imp.criticality[i]! - (imp.birnbaum[i]! * p[i]!) / P)).toBeLessThanOrEqual(1e-12);
            expect(Math.abs(imp.raw[i]! - p1 / P)).toBeLessThanOrEqual(1e-12 * Math.max(1, p1 / P));
          }
          if (p0 > 1e-9) expect(Math.abs(imp.rrw[i]! / (P / p0) - 1)).toBeLessThanOrEqual(1e-12);
          if (p0 === 0) expect(imp.rrw[i]).toBe(Infinity);
        }
      }),
      { numRuns: 80, seed: 205 },
    );
  });
});

describe('importance asked again on one manager (the passes are kept and reused)', () => {
  it('gives the numbers of a fresh computation, for the same numbers, new numbers, and after the caller edits its array', () => {
    // Oracle: enumeration (oracle.ts). The same manager is asked at p, then at p2, then at p again
    // with p's array edited in place between calls: a reused pass must never answer for other numbers.
    fc.assert(
      fc.property(arb.chain(({ graph, p }) => interior(graph.variables.length).map((p2) => ({ graph, p, p2 }))), ({ graph, p, p2 }) => {
        const c = compile(graph);
        const top = graph.gates.length - 1;
        const root = c.gateRoots[top]!;
        const check = (probs: Float64Array, coherent: boolean) => {
          const imp = importance(c.manager, root, probs, undefined, { coherent });
          expect(Math.abs(imp.probability - bruteProbabilities(graph, probs)[top]!)).toBeLessThanOrEqual(1e-12);
          for (let i = 0; i < probs.length; i++) {
            const on = Float64Array.from(probs);
            on[i] = 1;
            expect(Math.abs(imp.conditionalTrue[i]! - bruteProbabilities(graph, on)[top]!)).toBeLessThanOrEqual(1e-12);
          }
          return imp;
        };
        const first = check(p, false);
        check(p2, false);
        const again = check(p, false);
        expect(Array.from(again.birnbaum)).toEqual(Array.from(first.birnbaum));
        // Clamping one result (the coherent option; its values are not checked here, the graph
        // may have negations) must not reach the kept passes another call reads.
        importance(c.manager, root, p, undefined, { coherent: true });
        expect(Array.from(check(p, false).birnbaum)).toEqual(Array.from(first.birnbaum));
        const edited = p;
        edited[0] = edited[0]! / 2;
        check(edited, false);
      }),
      { numRuns: 40, seed: 207 },
    );
  });
});

describe('importance, hand cases', () => {
  const v = (index: number) => ({ kind: 'var', index }) as const;
  // Common practice, no source: for OR(a, b), ∂P/∂p_a = 1 − p_b; for AND(a, b), ∂P/∂p_a = p_b and
  // P(top | a works) = 0, so RRW is infinite; an event the top does not depend on has RAW = RRW = 1.
  it('series and parallel pairs', () => {
    const graph: LogicGraph = {
      variables: ['a', 'b', 'unused'],
      gates: [
        { id: 'or', op: 'or', inputs: [v(0), v(1)] },
        { id: 'and', op: 'and', inputs: [v(0), v(1)] },
      ],
    };
    const p = [0.1, 0.3, 0.5];
    const c = compile(graph);
    const or = importance(c.manager, c.gateRoots[0]!, p);
    expect(or.birnbaum[0]).toBeCloseTo(0.7, 15);
    expect(or.birnbaum[1]).toBeCloseTo(0.9, 15);
    expect(or.raw[2]).toBe(1);
    expect(or.rrw[2]).toBe(1);
    expect(or.fussellVesely[2]).toBe(0);
    const and = importance(c.manager, c.gateRoots[1]!, p);
    expect(and.birnbaum[0]).toBeCloseTo(0.3, 15);
    expect(and.conditionalFalse[0]).toBe(0);
    expect(and.rrw[0]).toBe(Infinity);
    expect(and.fussellVesely[0]).toBeCloseTo(1, 15);
    expect(and.raw[0]).toBeCloseTo(1 / 0.1, 12);
  });

  it('keeps P(top | x false) accurate when it is far below P(top)', () => {
    // top = (a AND b) OR c with p_c = 1e-14: with a working the top is just c, so P0(a) = 1e-14
    // exactly, while P − p_a·I_B would leave it to the rounding of 0.25.
    const graph: LogicGraph = {
      variables: ['a', 'b', 'c'],
      gates: [
        { id: 'top', op: 'or', inputs: [{ kind: 'gate', index: 1 }, v(2)] },
        { id: 'ab', op: 'and', inputs: [v(0), v(1)] },
      ],
    };
    const p = [0.5, 0.5, 1e-14];
    const c = compile(graph);
    const imp = importance(c.manager, c.gateRoots[0]!, p);
    expect(Math.abs(imp.conditionalFalse[0]! / 1e-14 - 1)).toBeLessThan(1e-12);
    const P = 0.25 + 0.75 * 1e-14;
    expect(Math.abs(imp.rrw[0]! / (P / 1e-14) - 1)).toBeLessThan(1e-12);
  });
});
