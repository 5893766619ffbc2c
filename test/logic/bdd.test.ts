import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  BddManager,
  compile,
  FALSE,
  LogicGraphError,
  NodeBudgetExceeded,
  probability,
  TRUE,
  variableOrder,
} from '../../src/logic/index.js';
import type { LogicGraph } from '../../src/logic/graph.js';
import { bruteProbabilities, graphWithProbabilities, permutation } from './oracle.js';

/** A tiny expression language, evaluated directly (the oracle) and built on the manager. */
type Expr =
  | { t: 'var'; v: number }
  | { t: 'and' | 'or'; a: Expr; b: Expr }
  | { t: 'not'; a: Expr }
  | { t: 'ite'; a: Expr; b: Expr; c: Expr }
  | { t: 'atleast'; k: number; xs: Expr[] }
  | { t: 'restrict'; a: Expr; v: number; value: boolean };

const NV = 6;
const exprArb: fc.Arbitrary<Expr> = fc.letrec<{ e: Expr }>((tie) => ({
  e: fc.oneof(
    { depthSize: 'small', withCrossShrink: true },
    fc.record({ t: fc.constant('var' as const), v: fc.nat(NV - 1) }),
    fc.record({ t: fc.constantFrom('and' as const, 'or' as const), a: tie('e'), b: tie('e') }),
    fc.record({ t: fc.constant('not' as const), a: tie('e') }),
    fc.record({ t: fc.constant('ite' as const), a: tie('e'), b: tie('e'), c: tie('e') }),
    fc.record({ t: fc.constant('atleast' as const), k: fc.nat(4), xs: fc.array(tie('e'), { minLength: 1, maxLength: 4 }) }),
    fc.record({ t: fc.constant('restrict' as const), a: tie('e'), v: fc.nat(NV - 1), value: fc.boolean() }),
  ),
})).e;

function evalExpr(e: Expr, s: number): boolean {
  switch (e.t) {
    case 'var':
      return ((s >>> e.v) & 1) === 1;
    case 'and':
      return evalExpr(e.a, s) && evalExpr(e.b, s);
    case 'or':
      return evalExpr(e.a, s) || evalExpr(e.b, s);
    case 'not':
      return !evalExpr(e.a, s);
    case 'ite':
      return evalExpr(e.a, s) ? evalExpr(e.b, s) : evalExpr(e.c, s);
    case 'atleast':
      return e.xs.filter((x) => evalExpr(x, s)).length >= e.k;
    case 'restrict':
      return evalExpr(e.a, e.value ? s | (1 << e.v) : s & ~(1 << e.v));
  }
}

function build(m: BddManager, e: Expr): number {
  switch (e.t) {
    case 'var':
      return m.variable(e.v);
    case 'and':
      return m.and(build(m, e.a), build(m, e.b));
    case 'or':
      return m.or(build(m, e.a), build(m, e.b));
    case 'not':
      return m.not(build(m, e.a));
    case 'ite':
      return m.ite(build(m, e.a), build(m, e.b), build(m, e.c));
    case 'atleast':
      return m.atleast(e.k, e.xs.map((x) => build(m, x)));
    case 'restrict':
      return m.restrict(build(m, e.a), e.v, e.value);
  }
}

const bits = (s: number) => Array.from({ length: NV }, (_, v) => (s >>> v) & 1);

describe('manager operations vs truth tables', () => {
  // Oracle: direct evaluation of each expression at all 2^6 states (common practice, no source).
  it('and, or, not, ite, atleast and restrict agree with direct evaluation in any order', () => {
    fc.assert(
      fc.property(exprArb, permutation(NV), (e, order) => {
        const m = new BddManager(order);
        const node = build(m, e);
        for (let s = 0; s < 2 ** NV; s++) expect(m.evaluate(node, bits(s))).toBe(evalExpr(e, s));
      }),
      { numRuns: 300, seed: 5 },
    );
  });

  it('is canonical: equal functions are the same node', () => {
    fc.assert(
      fc.property(exprArb, exprArb, (e1, e2) => {
        const m = new BddManager(NV);
        const a = build(m, e1);
        const b = build(m, e2);
        let same = true;
        for (let s = 0; s < 2 ** NV && same; s++) same = evalExpr(e1, s) === evalExpr(e2, s);
        expect(a === b).toBe(same);
      }),
      { numRuns: 300, seed: 9 },
    );
    const m = new BddManager(3);
    const [a, b, c] = [0, 1, 2].map((i) => m.variable(i)) as [number, number, number];
    // Distribution and De Morgan (common practice, no source).
    expect(m.and(a, m.or(b, c))).toBe(m.or(m.and(a, b), m.and(a, c)));
    expect(m.not(m.and(a, b))).toBe(m.or(m.not(a), m.not(b)));
    expect(m.or(a, m.not(a))).toBe(TRUE);
    expect(m.and(a, m.not(a))).toBe(FALSE);
  });

  it('throws NodeBudgetExceeded with the count reached when the budget runs out', () => {
    const m = new BddManager(12, { maxNodes: 20 });
    let caught: unknown;
    try {
      // A k-out-of-n function has k·(n−k+1) = 42 internal nodes in any order (common practice,
      // no source; the compile test below checks the formula for 8-of-16).
      m.atleast(6, Array.from({ length: 12 }, (_, i) => m.variable(i)));
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(NodeBudgetExceeded);
    const err = caught as NodeBudgetExceeded;
    expect(err.limit).toBe(20);
    expect(err.reached).toBe(20);
    expect(m.nodeCount).toBe(20);
  });
});

describe('compile', () => {
  const v = (index: number) => ({ kind: 'var', index }) as const;
  const g = (index: number) => ({ kind: 'gate', index }) as const;

  it('passes the node budget through and reports it as NodeBudgetExceeded', () => {
    const n = 16;
    const graph: LogicGraph = {
      variables: Array.from({ length: n }, (_, i) => `e${i}`),
      gates: [{ id: 'vote', op: 'atleast', k: 8, inputs: Array.from({ length: n }, (_, i) => v(i)) }],
    };
    expect(() => compile(graph, { maxNodes: 30 })).toThrow(NodeBudgetExceeded);
    // With room to spare it compiles; the 8-of-16 diagram alone has 8·9 = 72 nodes (below).
    const c = compile(graph, { maxNodes: 1000 });
    expect(c.manager.size(c.gateRoots[0]!)).toBe(72);
  });

  it('restrict agrees with enumeration with the variable held true or false', () => {
    const arb = graphWithProbabilities({ maxVars: 9, maxGates: 9, negation: true }).chain((x) =>
      fc.record({ which: fc.nat(x.graph.variables.length - 1), value: fc.boolean() }).map((r) => ({ ...x, ...r })),
    );
    fc.assert(
      fc.property(arb, ({ graph, p, which, value }) => {
        const c = compile(graph);
        const top = graph.gates.length - 1;
        const r = c.manager.restrict(c.gateRoots[top]!, which, value);
        const held = Float64Array.from(p);
        held[which] = value ? 1 : 0;
        expect(Math.abs(probability(c.manager, r, p) - bruteProbabilities(graph, held)[top]!)).toBeLessThanOrEqual(1e-12);
      }),
      { numRuns: 120, seed: 13 },
    );
  });

  it('fixed (house events) agrees with enumeration with those events held constant', () => {
    const arb = graphWithProbabilities({ maxVars: 9, maxGates: 9, negation: true }).chain((x) =>
      fc
        .array(fc.tuple(fc.nat(x.graph.variables.length - 1), fc.boolean()), { maxLength: 3 })
        .map((pairs) => ({ ...x, fixed: new Map(pairs) })),
    );
    fc.assert(
      fc.property(arb, ({ graph, p, fixed }) => {
        const c = compile(graph, { fixed });
        const brute = bruteProbabilities(graph, p, fixed);
        graph.gates.forEach((_, gi) => {
          expect(Math.abs(probability(c.manager, c.gateRoots[gi]!, p) - brute[gi]!)).toBeLessThanOrEqual(1e-12);
        });
      }),
      { numRuns: 120, seed: 17 },
    );
  });

  it('builds a shared subtree once', () => {
    const graph: LogicGraph = {
      variables: ['a', 'b', 'c'],
      gates: [
        { id: 'top', op: 'or', inputs: [g(1), g(2)] },
        { id: 'left', op: 'and', inputs: [g(3), v(0)] },
        { id: 'right', op: 'and', inputs: [g(3), v(1)] },
        { id: 'shared', op: 'or', inputs: [v(1), v(2)] },
      ],
    };
    const c = compile(graph);
    const m = c.manager;
    // The shared gate's root is the very node the parents were built from.
    expect(c.gateRoots[1]).toBe(m.and(c.gateRoots[3]!, m.variable(0)));
    expect(c.node(g(3))).toBe(c.gateRoots[3]);
    expect(c.negationFree).toBe(true);
  });

  it('knows when every node it made is monotone, and the relaxation is then the node itself', () => {
    // A graph without not-gates builds only monotone functions (common practice, no source:
    // AND, OR and k-out-of-n of monotone functions are monotone).
    const coherent: LogicGraph = {
      variables: ['a', 'b', 'c'],
      gates: [{ id: 'vote', op: 'atleast', k: 2, inputs: [v(0), v(1), v(2)] }],
    };
    const c1 = compile(coherent);
    expect(c1.manager.everyNodeMonotone).toBe(true);
    expect(c1.manager.monotoneRelaxation(c1.gateRoots[0]!)).toBe(c1.gateRoots[0]);
    const withNot: LogicGraph = {
      variables: ['a', 'b'],
      gates: [
        { id: 'top', op: 'and', inputs: [v(0), g(1)] },
        { id: 'nb', op: 'not', inputs: [v(1)] },
      ],
    };
    const c2 = compile(withNot);
    const m = c2.manager;
    expect(m.everyNodeMonotone).toBe(false);
    // a ∧ ¬b relaxes to a (the negative literal dropped).
    expect(m.monotoneRelaxation(c2.gateRoots[0]!)).toBe(m.variable(0));
  });

  it('rejects malformed graphs with LogicGraphError', () => {
    const base = { variables: ['a', 'b'] };
    const bad: LogicGraph[] = [
      { ...base, gates: [{ id: 'x', op: 'and', inputs: [g(1)] }, { id: 'y', op: 'or', inputs: [g(0)] }] },
      { ...base, gates: [{ id: 'x', op: 'atleast', k: 3, inputs: [v(0), v(1)] }] },
      { ...base, gates: [{ id: 'x', op: 'or', inputs: [v(5)] }] },
      { ...base, gates: [{ id: 'x', op: 'not', inputs: [v(0), v(1)] }] },
      { ...base, gates: [{ id: 'x', op: 'or', inputs: [] }] },
    ];
    for (const graph of bad) expect(() => compile(graph)).toThrow(LogicGraphError);
    const ok: LogicGraph = { ...base, gates: [{ id: 'x', op: 'or', inputs: [v(0), v(1)] }] };
    expect(() => compile(ok, { order: [0, 0] })).toThrow(LogicGraphError);
    expect(() => compile(ok, { order: [1] })).toThrow(LogicGraphError);
  });
});

describe('variable-ordering heuristic', () => {
  // The heuristic's own definition (order.ts): depth-first from the tops, inputs in written
  // order, each event placed where first met, unreached events last.
  it('places events depth-first where first met', () => {
    const graph: LogicGraph = {
      variables: ['a', 'b', 'c', 'd', 'e', 'unused'],
      gates: [
        { id: 'top', op: 'or', inputs: [{ kind: 'gate', index: 1 }, { kind: 'var', index: 4 }, { kind: 'gate', index: 2 }] },
        { id: 'g1', op: 'and', inputs: [{ kind: 'var', index: 3 }, { kind: 'var', index: 1 }] },
        { id: 'g2', op: 'and', inputs: [{ kind: 'var', index: 1 }, { kind: 'var', index: 0 }, { kind: 'var', index: 2 }] },
      ],
    };
    expect(variableOrder(graph)).toEqual([3, 1, 4, 0, 2, 5]);
    expect(compile(graph).order).toEqual([3, 1, 4, 0, 2, 5]);
  });
});
