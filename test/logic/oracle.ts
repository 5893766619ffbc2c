/**
 * Independent oracle for the Boolean core: plain enumeration of all 2^n states of a LogicGraph,
 * evaluating the gates directly from their definitions (no decision diagram involved).
 * Source: /work/shared/reference/README.md, "Independent oracle" — for trees of up to ~20 basic
 * events, enumerate all 2^n states; the exact probability must match to 1e-12 absolute.
 */
import fc from 'fast-check';
import type { LogicGate, LogicGraph, NodeRef } from '../../src/logic/graph.js';

/** Gate values at one state (bit v of `state` = variable v), gates in an order inputs-first. */
export function evaluateGates(graph: LogicGraph, state: number, fixed?: ReadonlyMap<number, boolean>): Uint8Array {
  const values = new Uint8Array(graph.gates.length);
  const done = new Uint8Array(graph.gates.length);
  const varValue = (v: number): number => {
    const f = fixed?.get(v);
    if (f !== undefined) return f ? 1 : 0;
    return (state >>> v) & 1;
  };
  const refValue = (r: NodeRef): number => {
    if (r.kind === 'const') return r.value ? 1 : 0;
    if (r.kind === 'var') return varValue(r.index);
    return gateValue(r.index);
  };
  const gateValue = (g: number): number => {
    if (done[g]) return values[g]!;
    const gate = graph.gates[g]!;
    const ins = gate.inputs.map(refValue);
    const trues = ins.reduce((a, b) => a + b, 0);
    let v: number;
    switch (gate.op) {
      case 'or':
        v = trues > 0 ? 1 : 0;
        break;
      case 'and':
        v = trues === ins.length ? 1 : 0;
        break;
      case 'atleast':
        v = trues >= gate.k! ? 1 : 0;
        break;
      case 'not':
        v = 1 - ins[0]!;
        break;
    }
    values[g] = v;
    done[g] = 1;
    return v;
  };
  for (let g = 0; g < graph.gates.length; g++) gateValue(g);
  return values;
}

/** Probability of a state: Π p or (1 − p) per variable. */
export function stateProbability(state: number, p: ArrayLike<number>): number {
  let pr = 1;
  for (let v = 0; v < p.length; v++) pr *= (state >>> v) & 1 ? p[v]! : 1 - p[v]!;
  return pr;
}

/** P(gate true) for every gate, by enumerating all 2^n states (Neumaier-compensated sums). */
export function bruteProbabilities(graph: LogicGraph, p: ArrayLike<number>, fixed?: ReadonlyMap<number, boolean>): number[] {
  const n = graph.variables.length;
  const sums = new Float64Array(graph.gates.length);
  const comp = new Float64Array(graph.gates.length);
  for (let s = 0; s < 2 ** n; s++) {
    const pr = stateProbability(s, p);
    if (pr === 0) continue;
    const vals = evaluateGates(graph, s, fixed);
    for (let g = 0; g < vals.length; g++) {
      if (!vals[g]) continue;
      const t = sums[g]! + pr;
      comp[g] += Math.abs(sums[g]!) >= pr ? sums[g]! - t + pr : pr - t + sums[g]!;
      sums[g] = t;
    }
  }
  return Array.from(sums, (s, g) => s + comp[g]!);
}

/**
 * Minimal "true sets" of a gate: minimal S such that S true and every other variable false makes
 * the gate true (for a coherent gate these are its minimal cut sets; with negation, those of the
 * monotone relaxation). Computed by closing the true sets upward over all subsets and keeping
 * the sets none of whose one-smaller subsets is in the closure.
 */
export function bruteMinimalSets(graph: LogicGraph, gate: number): number[][] {
  const n = graph.variables.length;
  const N = 2 ** n;
  const up = new Uint8Array(N);
  for (let s = 0; s < N; s++) up[s] = evaluateGates(graph, s)[gate]!;
  // Upward closure, by increasing popcount order is implied by increasing s when adding a bit.
  for (let v = 0; v < n; v++) for (let s = 0; s < N; s++) if (s & (1 << v) && up[s ^ (1 << v)]) up[s] = 1;
  const out: number[][] = [];
  for (let s = 0; s < N; s++) {
    if (!up[s]) continue;
    let minimal = true;
    for (let v = 0; v < n && minimal; v++) if (s & (1 << v) && up[s ^ (1 << v)]) minimal = false;
    if (!minimal) continue;
    const vars: number[] = [];
    for (let v = 0; v < n; v++) if (s & (1 << v)) vars.push(v);
    out.push(vars);
  }
  return out;
}

/** Whether a gate's function is monotone: f(S) ≤ f(S ∪ {v}) for all S, v. */
export function bruteIsMonotone(graph: LogicGraph, gate: number): boolean {
  const n = graph.variables.length;
  const N = 2 ** n;
  const f = new Uint8Array(N);
  for (let s = 0; s < N; s++) f[s] = evaluateGates(graph, s)[gate]!;
  for (let s = 0; s < N; s++) for (let v = 0; v < n; v++) if (!(s & (1 << v)) && f[s]! > f[s | (1 << v)]!) return false;
  return true;
}

export interface RandomTreeOptions {
  minVars?: number;
  maxVars: number;
  maxGates?: number;
  negation: boolean;
}

/**
 * Random LogicGraphs: variables used by several gates (shared events), gates used by several
 * parents (shared subtrees), OR/AND/voting and optionally NOT. The last gate is the top and the
 * graph is acyclic because a gate only uses earlier gates.
 */
export function randomGraph(opts: RandomTreeOptions): fc.Arbitrary<LogicGraph> {
  const ops = opts.negation ? (['or', 'and', 'atleast', 'not'] as const) : (['or', 'and', 'atleast'] as const);
  const refArb = fc.record({ gate: fc.boolean(), idx: fc.nat() });
  const gateArb = fc.record({
    op: fc.constantFrom(...ops),
    k: fc.nat(),
    inputs: fc.array(refArb, { minLength: 1, maxLength: 5 }),
  });
  return fc
    .record({
      nv: fc.integer({ min: opts.minVars ?? 1, max: opts.maxVars }),
      gates: fc.array(gateArb, { minLength: 1, maxLength: opts.maxGates ?? 10 }),
    })
    .map(({ nv, gates }) => {
      const out: LogicGate[] = gates.map((g, gi) => {
        let inputs: NodeRef[] = g.inputs.map((r) =>
          r.gate && gi > 0 ? { kind: 'gate', index: r.idx % gi } : { kind: 'var', index: r.idx % nv },
        );
        if (g.op === 'not') inputs = inputs.slice(0, 1);
        const gate: LogicGate = { id: `g${gi}`, op: g.op, inputs };
        if (g.op === 'atleast') gate.k = 1 + (g.k % inputs.length);
        return gate;
      });
      return { variables: Array.from({ length: nv }, (_, i) => `e${i}`), gates: out };
    });
}

/** Probabilities mixing ordinary values with the awkward ones: 0, 1, tiny, nearly 1. */
export function probabilityVector(n: number): fc.Arbitrary<Float64Array> {
  const one = fc.oneof(
    { weight: 6, arbitrary: fc.double({ min: 0, max: 1, noNaN: true }) },
    { weight: 2, arbitrary: fc.double({ min: 1e-6, max: 1e-2, noNaN: true }) },
    { weight: 1, arbitrary: fc.constantFrom(0, 1, 1e-15, 1 - 1e-12, 0.5) },
  );
  return fc.array(one, { minLength: n, maxLength: n }).map((a) => Float64Array.from(a));
}

/** A graph together with a probability vector for it. */
export function graphWithProbabilities(opts: RandomTreeOptions): fc.Arbitrary<{ graph: LogicGraph; p: Float64Array }> {
  return randomGraph(opts).chain((graph) => probabilityVector(graph.variables.length).map((p) => ({ graph, p })));
}

/** A random permutation of 0..n−1 drawn by fast-check (for explicit variable orders). */
export function permutation(n: number): fc.Arbitrary<number[]> {
  return fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: n, maxLength: n }).map((keys) =>
    keys.map((k, i) => [k, i] as const).sort((a, b) => a[0] - b[0] || a[1] - b[1]).map(([, i]) => i),
  );
}
