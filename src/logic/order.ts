/**
 * The variable-ordering heuristic used when the caller gives no order.
 *
 * Depth-first, left-most: walk the graph from its tops (gates no other gate uses, in index order),
 * visiting a gate's inputs in the order they are written, and give each basic event the next level
 * the first time the walk meets it. Events that several subtrees share therefore sit where the
 * first of those subtrees put them, and the events of one subtree occupy one contiguous block of
 * levels, so a module (a subtree sharing nothing with the rest) costs only its own diagram.
 *
 * Weighted variant: at each gate, visit the inputs with smaller subtrees first (ties: written
 * order). The diagram of an OR/AND over operands in disjoint blocks is the
 * sum of their sizes whatever the block order, but a shared event met early in a small input is
 * placed high, close to the other subtrees that use it, which keeps the stretch of levels over
 * which the diagram must "remember" that event short. On the seeded synthetic trees of
 * bench/synthetic.ts it gave diagrams no larger than the plain walk (see the benchmark).
 *
 * Variables no gate reaches go last, in index order. Both variants are deterministic.
 */
import type { LogicGraph } from './graph.js';
import { LogicGraphError } from './errors.js';

export type OrderHeuristic = 'depth-first' | 'weighted';

/** A variable order (order[level] = variable index) for the graph. */
export function variableOrder(graph: LogicGraph, heuristic: OrderHeuristic = 'depth-first'): number[] {
  const nv = graph.variables.length;
  const ng = graph.gates.length;
  const used = new Uint8Array(ng);
  for (const gate of graph.gates) {
    for (const ref of gate.inputs) {
      if (ref.kind === 'gate') {
        if (!Number.isInteger(ref.index) || ref.index < 0 || ref.index >= ng) {
          throw new LogicGraphError(`gate ${gate.id} uses gate index ${ref.index}, which does not exist`);
        }
        used[ref.index] = 1;
      }
    }
  }
  const weight = heuristic === 'weighted' ? inputWeights(graph) : null;

  const placed = new Uint8Array(nv);
  const visited = new Uint8Array(ng);
  const order: number[] = [];
  const place = (v: number): void => {
    if (!Number.isInteger(v) || v < 0 || v >= nv) throw new LogicGraphError(`variable index ${v} does not exist`);
    if (!placed[v]) {
      placed[v] = 1;
      order.push(v);
    }
  };
  // Explicit stack of (gate, next input position): trees can be deeper than the call stack.
  const stackGate: number[] = [];
  const stackPos: number[] = [];
  const inputsOf = (g: number): readonly { kind: string; index?: number }[] => {
    const inputs = graph.gates[g]!.inputs;
    if (!weight) return inputs;
    const idx = inputs.map((_, i) => i);
    const w = (i: number): number => {
      const r = inputs[i]!;
      return r.kind === 'gate' ? weight[r.index]! : r.kind === 'var' ? 1 : 0;
    };
    idx.sort((a, b) => w(a) - w(b) || a - b);
    return idx.map((i) => inputs[i]!);
  };
  const sortedInputs = new Map<number, readonly { kind: string; index?: number }[]>();
  for (let top = 0; top < ng; top++) {
    if (used[top] || visited[top]) continue;
    visited[top] = 1;
    stackGate.push(top);
    stackPos.push(0);
    while (stackGate.length > 0) {
      const t = stackGate.length - 1;
      const g = stackGate[t]!;
      let inputs = sortedInputs.get(g);
      if (!inputs) {
        inputs = inputsOf(g);
        sortedInputs.set(g, inputs);
      }
      const pos = stackPos[t]!;
      if (pos >= inputs.length) {
        stackGate.pop();
        stackPos.pop();
        sortedInputs.delete(g);
        continue;
      }
      stackPos[t] = pos + 1;
      const ref = inputs[pos]!;
      if (ref.kind === 'var') place(ref.index!);
      else if (ref.kind === 'gate' && !visited[ref.index!]) {
        visited[ref.index!] = 1;
        stackGate.push(ref.index!);
        stackPos.push(0);
      }
    }
  }
  // Gates only reachable through a cycle are never visited from a top; compile() reports cycles.
  for (let v = 0; v < nv; v++) if (!placed[v]) order.push(v);
  return order;
}

/**
 * Size of each gate's subtree, counted bottom-up as event occurrences (a shared subtree counts once
 * per use). Exact distinct-event counts on a shared graph would need a set per gate; the heuristic
 * only needs "small or large", which this measures cheaply. Capped so huge trees stay exact integers.
 */
function inputWeights(graph: LogicGraph): Float64Array {
  const ng = graph.gates.length;
  // -1 not seen, -2 expanded (its inputs are being sized), >= 0 done.
  const w = new Float64Array(ng).fill(-1);
  const CAP = 1e12;
  for (let start = 0; start < ng; start++) {
    if (w[start] !== -1) continue;
    const stack = [start];
    while (stack.length > 0) {
      const g = stack[stack.length - 1]!;
      if (w[g]! >= 0) {
        stack.pop();
        continue;
      }
      const inputs = graph.gates[g]!.inputs;
      if (w[g] === -1) {
        w[g] = -2;
        for (const ref of inputs) if (ref.kind === 'gate' && w[ref.index] === -1) stack.push(ref.index);
        continue;
      }
      let sum = 0;
      for (const ref of inputs) {
        if (ref.kind === 'var') sum += 1;
        // An input still at -2 here is an ancestor: a cycle, which compile() reports; skip it.
        else if (ref.kind === 'gate' && w[ref.index]! >= 0) sum += w[ref.index]!;
      }
      w[g] = Math.min(sum, CAP);
      stack.pop();
    }
  }
  return w;
}
