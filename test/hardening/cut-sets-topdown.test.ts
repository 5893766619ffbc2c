/**
 * The diagram-free fallback (src/logic/cut-sets-topdown.ts) against two independent oracles:
 * brute-force enumeration of all 2ⁿ states (shared/reference/README.md: "Independent oracle") and
 * the minimal cut sets read off the decision diagram (src/logic/cutsets.ts).
 *
 * Theorems held (NUREG-0492; Esary–Proschan): for a coherent tree the minimal cut sets are unique,
 * so both methods must list the same sets above the same cutoff and order; the reported bound covers
 * every dropped partial product, so exact ≤ upperBound whatever the cutoff, and for a coherent tree
 * with nothing cut off it is the min-cut upper bound of the full list. With negation the expansion
 * relaxes negated events, which only enlarges the function, so exact ≤ upperBound still holds.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { compile, cutSetBounds, minimalCutSets, probability, type LogicGate, type LogicGraph, type NodeRef } from '../../src/logic/index.js';
import { ExpansionBudgetExceeded, topDownCutSets } from '../../src/logic/cut-sets-topdown.js';

/** Value of every gate for one assignment of the variables (gates may refer only to lower indices). */
function evaluate(graph: LogicGraph, x: readonly boolean[]): boolean[] {
  const val: boolean[] = [];
  const ref = (r: NodeRef): boolean => (r.kind === 'const' ? r.value : r.kind === 'var' ? x[r.index]! : val[r.index]!);
  graph.gates.forEach((g, i) => {
    const ins = g.inputs.map(ref);
    const count = ins.filter(Boolean).length;
    val[i] = g.op === 'or' ? count > 0 : g.op === 'and' ? count === ins.length : g.op === 'not' ? !ins[0] : count >= g.k!;
  });
  return val;
}

/** Exact P(gate) by enumerating every state (fixed variables held). */
function bruteForce(graph: LogicGraph, gate: number, p: readonly number[], fixed: ReadonlyMap<number, boolean>): number {
  const n = graph.variables.length;
  let total = 0;
  for (let s = 0; s < 1 << n; s++) {
    const x = Array.from({ length: n }, (_, v) => fixed.get(v) ?? Boolean(s & (1 << v)));
    let w = 1;
    for (let v = 0; v < n; v++) {
      if (fixed.has(v)) {
        if (x[v] !== Boolean(s & (1 << v))) w = 0; // count each fixed state once
      } else w *= x[v] ? p[v]! : 1 - p[v]!;
    }
    if (w > 0 && evaluate(graph, x)[gate]) total += w;
  }
  return total;
}

interface Model {
  graph: LogicGraph;
  p: number[];
  fixed: Map<number, boolean>;
}

/**
 * Random trees of up to 9 events: each gate takes 1–4 inputs among the variables and the gates made
 * before it, so events and subtrees are shared; OR, AND, voting and (optionally) NOT.
 */
function models(withNot: boolean, withFixed: boolean): fc.Arbitrary<Model> {
  return fc
    .record({
      nv: fc.integer({ min: 2, max: 9 }),
      ng: fc.integer({ min: 1, max: 7 }),
      seed: fc.array(fc.nat(), { minLength: 64, maxLength: 64 }),
      p: fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: 9, maxLength: 9 }),
      fixedBits: fc.array(fc.integer({ min: 0, max: 5 }), { minLength: 9, maxLength: 9 }),
    })
    .map(({ nv, ng, seed, p, fixedBits }) => {
      let s = 0;
      const next = (n: number) => seed[s++ % seed.length]! % n;
      const gates: LogicGate[] = [];
      for (let g = 0; g < ng; g++) {
        const ops: LogicGate['op'][] = withNot ? ['or', 'and', 'atleast', 'not'] : ['or', 'and', 'atleast'];
        const op = ops[next(ops.length)]!;
        const count = op === 'not' ? 1 : 1 + next(4);
        const inputs: NodeRef[] = [];
        for (let i = 0; i < count; i++) {
          const useGate = g > 0 && next(3) === 0;
          inputs.push(useGate ? { kind: 'gate', index: next(g) } : { kind: 'var', index: next(nv) });
        }
        const gate: LogicGate = { id: `g${g}`, op, inputs };
        if (op === 'atleast') gate.k = 1 + next(count);
        gates.push(gate);
      }
      const fixed = new Map<number, boolean>();
      if (withFixed) fixedBits.slice(0, nv).forEach((b, v) => b >= 4 && fixed.set(v, b === 5));
      return { graph: { variables: Array.from({ length: nv }, (_, v) => `e${v}`), gates }, p: p.slice(0, nv), fixed };
    });
}

const key = (sets: { vars: number[] }[]) => sets.map((s) => s.vars.join(',')).sort();

describe('top-down cut sets against the decision diagram and brute force', () => {
  it('coherent trees: the same minimal cut sets as the diagram, and exact ≤ bound = MCUB', () => {
    fc.assert(
      fc.property(models(false, true), ({ graph, p, fixed }) => {
        const top = graph.gates.length - 1;
        const c = compile(graph, { fixed });
        const root = c.gateRoots[top]!;
        const bdd = minimalCutSets(c.manager, root, p);
        const td = topDownCutSets(graph, top, p, { fixed });
        expect(key(td.sets)).toEqual(key(bdd.sets));
        expect(td.coherent).toBe(true);
        expect(td.droppedTerms).toBe(0);
        const exact = bruteForce(graph, top, p, fixed);
        expect(probability(c.manager, root, p)).toBeCloseTo(exact, 12);
        expect(td.upperBound).toBeGreaterThanOrEqual(exact - 1e-12);
        expect(td.upperBound).toBeCloseTo(cutSetBounds(bdd.sets).mcub, 12);
        expect(td.rareEvent).toBeCloseTo(cutSetBounds(bdd.sets).rareEvent, 12);
      }),
      { numRuns: 300, seed: 20260630 },
    );
  });

  it('with a cutoff and an order limit: the kept sets agree, and the bound still covers the exact value', () => {
    fc.assert(
      fc.property(models(false, false), fc.constantFrom(1e-3, 1e-2, 0.05, 0.2), fc.integer({ min: 1, max: 3 }), ({ graph, p }, cutoff, maxOrder) => {
        const top = graph.gates.length - 1;
        const c = compile(graph);
        const bdd = minimalCutSets(c.manager, c.gateRoots[top]!, p, { cutoff, maxOrder });
        const td = topDownCutSets(graph, top, p, { cutoff, maxOrder });
        expect(key(td.sets)).toEqual(key(bdd.sets));
        for (const s of td.sets) {
          expect(s.probability).toBeGreaterThanOrEqual(cutoff);
          expect(s.vars.length).toBeLessThanOrEqual(maxOrder);
        }
        expect(td.upperBound).toBeGreaterThanOrEqual(bruteForce(graph, top, p, new Map()) - 1e-12);
      }),
      { numRuns: 300, seed: 7 },
    );
  });

  it('with negation and house events: exact ≤ bound (the relaxation only enlarges the function)', () => {
    fc.assert(
      fc.property(models(true, true), fc.constantFrom(0, 1e-3, 0.05), ({ graph, p, fixed }, cutoff) => {
        const top = graph.gates.length - 1;
        const td = topDownCutSets(graph, top, p, { fixed, cutoff });
        expect(td.upperBound).toBeGreaterThanOrEqual(bruteForce(graph, top, p, fixed) - 1e-12);
        expect(td.upperBound).toBeLessThanOrEqual(1);
      }),
      { numRuns: 300, seed: 11 },
    );
  });

  it('a worked example: (a ∧ b) ∨ 2-of-{a, c, d}, by hand', () => {
    // Minimal cut sets: {a,b}, {a,c}, {a,d}, {c,d} (common practice, worked by hand).
    const graph: LogicGraph = {
      variables: ['a', 'b', 'c', 'd'],
      gates: [
        { id: 'ab', op: 'and', inputs: [{ kind: 'var', index: 0 }, { kind: 'var', index: 1 }] },
        { id: 'vote', op: 'atleast', k: 2, inputs: [{ kind: 'var', index: 0 }, { kind: 'var', index: 2 }, { kind: 'var', index: 3 }] },
        { id: 'top', op: 'or', inputs: [{ kind: 'gate', index: 0 }, { kind: 'gate', index: 1 }] },
      ],
    };
    const p = [0.1, 0.2, 0.3, 0.4];
    const td = topDownCutSets(graph, 2, p);
    expect(td.sets.map((s) => s.vars)).toEqual([[2, 3], [0, 3], [0, 2], [0, 1]]);
    expect(td.sets.map((s) => s.probability)).toEqual([0.3 * 0.4, 0.1 * 0.4, 0.1 * 0.3, 0.1 * 0.2].map((x) => expect.closeTo(x, 15)));
    // MCUB by hand: 1 − (1 − .12)(1 − .04)(1 − .03)(1 − .02).
    expect(td.upperBound).toBeCloseTo(1 - 0.88 * 0.96 * 0.97 * 0.98, 14);
    // With cutoff 0.035 the two smaller sets are dropped but still counted in the bound.
    const cut = topDownCutSets(graph, 2, p, { cutoff: 0.035 });
    expect(cut.sets.map((s) => s.vars)).toEqual([[2, 3], [0, 3]]);
    expect(cut.upperBound).toBeGreaterThanOrEqual(bruteForce(graph, 2, p, new Map()));
  });

  it('stops with a typed error when the expansion outgrows its step budget', () => {
    // 2-of-40 has 780 minimal cut sets; 100 steps are far too few.
    const graph: LogicGraph = {
      variables: Array.from({ length: 40 }, (_, i) => `e${i}`),
      gates: [{ id: 'v', op: 'atleast', k: 2, inputs: Array.from({ length: 40 }, (_, i) => ({ kind: 'var' as const, index: i })) }],
    };
    expect(() => topDownCutSets(graph, 0, new Array(40).fill(0.01), { maxSteps: 100 })).toThrow(ExpansionBudgetExceeded);
    expect(topDownCutSets(graph, 0, new Array(40).fill(0.01)).sets).toHaveLength(780);
  });
});
