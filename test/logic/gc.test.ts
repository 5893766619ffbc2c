// Garbage collection in the decision-diagram manager (src/logic/bdd.ts) never changes a result.
// Oracle: brute-force enumeration of all 2^n states (test/logic/oracle.ts), and the same build with
// collection off. Collection is exercised three ways: off, automatic, and forced at every safe
// point (after every gate, every AND/OR step and every row-step of a voting gate).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { BddManager, compile, importance, minimalCutSets, NodeBudgetExceeded, probability, type CompiledLogic } from '../../src/logic/index.js';
import type { LogicGraph } from '../../src/logic/graph.js';
import { bruteProbabilities, graphWithProbabilities } from './oracle.js';

const MODES = ['never', 'auto', 'always'] as const;

/** Every internal node's children have smaller ids (the order the bottom-up passes rely on). */
function childrenBelowParents(c: CompiledLogic): boolean {
  const m = c.manager;
  for (let n = 2; n < m.idLimit; n++) if (!(m.low(n) < n && m.high(n) < n)) return false;
  return true;
}

describe('garbage collection never changes a result', () => {
  it('gate probabilities equal enumeration and are bit-identical with collection off, automatic or forced', () => {
    fc.assert(
      fc.property(graphWithProbabilities({ maxVars: 10, maxGates: 12, negation: true }), ({ graph, p }) => {
        const brute = bruteProbabilities(graph, p);
        const byMode = MODES.map((collection) => {
          const c = compile(graph, { collection });
          const probs = Array.from(c.gateRoots, (r) => probability(c.manager, r, p));
          probs.forEach((x, g) => expect(Math.abs(x - brute[g]!)).toBeLessThanOrEqual(1e-12));
          expect(childrenBelowParents(c)).toBe(true);
          return { c, probs, sizes: Array.from(c.gateRoots, (r) => c.manager.size(r)) };
        });
        for (const other of byMode.slice(1)) {
          expect(other.probs).toEqual(byMode[0]!.probs);
          expect(other.sizes).toEqual(byMode[0]!.sizes);
        }
        // After a collecting build the table holds only what the variables and gates reach.
        for (const { c } of byMode.slice(1)) {
          const roots = [...c.gateRoots, ...Array.from({ length: graph.variables.length }, (_, v) => c.node({ kind: 'var', index: v }))];
          expect(c.nodeCount).toBe(c.manager.size(roots));
        }
      }),
      { numRuns: 300, seed: 41 },
    );
  });

  it('cut sets and importance are the same with collections forced after every operation', () => {
    fc.assert(
      fc.property(graphWithProbabilities({ maxVars: 9, maxGates: 10, negation: false }), ({ graph, p }) => {
        const top = graph.gates.length - 1;
        const [off, forced] = (['never', 'always'] as const).map((collection) => {
          const c = compile(graph, { collection });
          const root = c.gateRoots[top]!;
          return { cs: minimalCutSets(c.manager, root, p, { cutoff: 0, maxOrder: 20 }).sets, imp: importance(c.manager, root, p) };
        });
        expect(forced!.cs).toEqual(off!.cs);
        expect(forced!.imp).toEqual(off!.imp);
      }),
      { numRuns: 150, seed: 42 },
    );
  });

  it('operations interleaved with forced collections agree with a manager that never collects', () => {
    const NV = 7;
    const step = fc.record({ op: fc.constantFrom('and', 'or', 'not', 'ite', 'atleast'), a: fc.nat(), b: fc.nat(), c: fc.nat(), k: fc.nat(3) });
    fc.assert(
      fc.property(fc.array(step, { minLength: 1, maxLength: 25 }), (steps) => {
        const plain = new BddManager(NV, { collection: 'never' });
        const gc = new BddManager(NV, { collection: 'always' });
        const mine: number[] = Array.from({ length: NV }, (_, v) => plain.variable(v));
        // The collecting manager's ids live in a held array, renumbered by each collection.
        const held = new Int32Array(NV + steps.length).fill(-1);
        for (let v = 0; v < NV; v++) held[v] = gc.variable(v);
        gc.collecting([held], () => {
          steps.forEach((s, i) => {
            const n = NV + i;
            const pick = (x: number) => x % n;
            const apply = (m: BddManager, at: (j: number) => number): number => {
              switch (s.op) {
                case 'and':
                  return m.and(at(pick(s.a)), at(pick(s.b)));
                case 'or':
                  return m.or(at(pick(s.a)), at(pick(s.b)));
                case 'not':
                  return m.not(at(pick(s.a)));
                case 'ite':
                  return m.ite(at(pick(s.a)), at(pick(s.b)), at(pick(s.c)));
                default:
                  return m.atleast(1 + s.k, [at(pick(s.a)), at(pick(s.b)), at(pick(s.c)), at(pick(s.a + 1))]);
              }
            };
            mine.push(apply(plain, (j) => mine[j]!));
            held[n] = apply(gc, (j) => held[j]!);
            gc.collect();
          });
        });
        expect(gc.collectionCount).toBeGreaterThanOrEqual(steps.length);
        // Same function: equal on every one of the 2^7 assignments.
        for (let s = 0; s < 1 << NV; s++) {
          const x = Array.from({ length: NV }, (_, v) => (s >> v) & 1);
          for (let j = 0; j < mine.length; j++) expect(gc.evaluate(held[j]!, x)).toBe(plain.evaluate(mine[j]!, x));
        }
      }),
      { numRuns: 80, seed: 43 },
    );
  });
});

describe('the node budget counts live nodes', () => {
  // 3-of-10 voting over ten pairs x_i ∧ y_i with every x above every y in the order: the build
  // leaves about a quarter of what it makes as garbage (3,523 made, 2,737 in the result).
  const n = 10;
  const graph: LogicGraph = {
    variables: Array.from({ length: 2 * n }, (_, i) => `e${i}`),
    gates: [
      ...Array.from({ length: n }, (_, i) => ({ id: `pair${i}`, op: 'and' as const, inputs: [{ kind: 'var' as const, index: i }, { kind: 'var' as const, index: n + i }] })),
      { id: 'vote', op: 'atleast', k: 3, inputs: Array.from({ length: n }, (_, i) => ({ kind: 'gate', index: i }) as const) },
    ],
  };
  const order = Array.from({ length: 2 * n }, (_, i) => i);

  it('a build whose garbage exceeds the budget but whose live diagrams do not succeeds with collection', () => {
    expect(() => compile(graph, { order, maxNodes: 3300, collection: 'never' })).toThrow(NodeBudgetExceeded);
    for (const collection of ['auto', 'always'] as const) {
      const c = compile(graph, { order, maxNodes: 3300, collection });
      expect(c.manager.collectionCount).toBeGreaterThan(0);
      const p = new Float64Array(2 * n).fill(0.4);
      // The pairs are independent, each true with 0.4² = 0.16: P(at least 3 of 10) is a binomial
      // tail, summed term by term (common practice, no source).
      const q = 0.16;
      let tail = 0;
      let term = Math.pow(1 - q, n);
      for (let j = 0; j <= n; j++) {
        if (j >= 3) tail += term;
        term *= ((n - j) / (j + 1)) * (q / (1 - q));
      }
      expect(probability(c.manager, c.gateRoots[n]!, p)).toBeCloseTo(tail, 14);
    }
  });

  it('collect() outside collecting() is refused: the manager cannot know which ids are held', () => {
    const m = new BddManager(3);
    expect(() => m.collect()).toThrow(/collecting/);
  });
});
