import binomial from '@stdlib/stats-base-dists-binomial';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { compile, countDistribution } from '../../src/logic/index.js';
import type { LogicGraph } from '../../src/logic/graph.js';
import { evaluateGates, graphWithProbabilities, stateProbability } from './oracle.js';

const v = (index: number) => ({ kind: 'var', index }) as const;

describe('distribution of how many tops are true', () => {
  // Oracle: enumeration of all 2^n states, counting the true tops in each (oracle.ts).
  it('matches enumeration and sums to 1 on random graphs with shared events', () => {
    fc.assert(
      fc.property(graphWithProbabilities({ maxVars: 10, maxGates: 8, negation: true }), ({ graph, p }) => {
        const c = compile(graph);
        const tops = graph.gates.map((_, g) => g);
        const dist = countDistribution(c.manager, tops.map((g) => c.gateRoots[g]!), p);
        const brute = new Float64Array(tops.length + 1);
        for (let s = 0; s < 2 ** graph.variables.length; s++) {
          const vals = evaluateGates(graph, s);
          brute[vals.reduce((a, b) => a + b, 0)] += stateProbability(s, p);
        }
        expect(dist.length).toBe(tops.length + 1);
        dist.forEach((x, j) => expect(Math.abs(x - brute[j]!)).toBeLessThanOrEqual(1e-12));
        expect(Math.abs(dist.reduce((a, b) => a + b, 0) - 1)).toBeLessThanOrEqual(1e-12);
      }),
      { numRuns: 120, seed: 301 },
    );
  });

  it('independent identical tops give the binomial distribution', () => {
    // Reference: @stdlib/stats-base-dists-binomial pmf. Six invented gates, each fails to open
    // when both of its own two events occur: q = 0.3 · 0.4 = 0.12, independent across gates.
    const n = 6;
    const graph: LogicGraph = {
      variables: Array.from({ length: 2 * n }, (_, i) => `e${i}`),
      gates: Array.from({ length: n }, (_, i) => ({ id: `gate-${i}`, op: 'and' as const, inputs: [v(2 * i), v(2 * i + 1)] })),
    };
    const p = Array.from({ length: 2 * n }, (_, i) => (i % 2 ? 0.4 : 0.3));
    const c = compile(graph);
    const dist = countDistribution(c.manager, Array.from(c.gateRoots), p);
    for (let j = 0; j <= n; j++) expect(Math.abs(dist[j]! - binomial.pmf(j, n, 0.3 * 0.4))).toBeLessThanOrEqual(1e-15);
  });

  it('one shared event: conditioning on it by hand', () => {
    // Four invented gates, each stuck if the shared supply s fails or its own hoist h_i fails.
    // Given s failed all four are stuck; given s works the count is binomial(4, p_h). So
    // P(j) = (1 − p_s)·Bin(j; 4, p_h) + p_s·[j = 4] (total probability; binomial pmf from @stdlib).
    const n = 4;
    const graph: LogicGraph = {
      variables: ['s', 'h0', 'h1', 'h2', 'h3'],
      gates: Array.from({ length: n }, (_, i) => ({ id: `gate-${i}`, op: 'or' as const, inputs: [v(0), v(i + 1)] })),
    };
    const ps = 0.05;
    const ph = 0.2;
    const c = compile(graph);
    const dist = countDistribution(c.manager, Array.from(c.gateRoots), [ps, ph, ph, ph, ph]);
    for (let j = 0; j <= n; j++) {
      const expected = (1 - ps) * binomial.pmf(j, n, ph) + (j === n ? ps : 0);
      expect(Math.abs(dist[j]! - expected)).toBeLessThanOrEqual(1e-15);
    }
  });
});
