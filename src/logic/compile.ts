/**
 * LogicGraph → decision diagrams: one BDD root per gate, each built once from the roots of its
 * inputs, so a subtree used by several parents is computed a single time.
 */
import { BddManager, FALSE, TRUE } from './bdd.js';
import { LogicGraphError } from './errors.js';
import type { LogicGraph, NodeRef } from './graph.js';
import { variableOrder } from './order.js';

export interface CompileOptions {
  /** order[level] = variable index; overrides the heuristic (order.ts). A permutation of all variables. */
  order?: readonly number[];
  /** Internal-node budget of the manager; exceeding it throws NodeBudgetExceeded. */
  maxNodes?: number;
  /** Variables held at a constant value (house events): variable index → value. */
  fixed?: ReadonlyMap<number, boolean>;
  /** Garbage collection during the build (BddManagerOptions.collection); default `auto`. */
  collection?: 'auto' | 'always' | 'never';
}

export interface CompiledLogic {
  readonly manager: BddManager;
  /** gateRoots[g] = BDD node of gate g. */
  readonly gateRoots: Int32Array;
  /** order[level] = variable index. */
  readonly order: number[];
  /** Internal nodes the manager holds after compiling: the live ones, unless collection was off. */
  readonly nodeCount: number;
  /** True when no gate is a not-gate, so every gate's function is monotone (coherent). */
  readonly negationFree: boolean;
  /** The BDD node of any reference (variable, gate or constant), with `fixed` applied. */
  node(ref: NodeRef): number;
}

export function compile(graph: LogicGraph, options: CompileOptions = {}): CompiledLogic {
  const nv = graph.variables.length;
  const ng = graph.gates.length;
  const order = options.order ? [...options.order] : variableOrder(graph);
  if (order.length !== nv) throw new LogicGraphError(`order has ${order.length} entries for ${nv} variables`);
  let manager: BddManager;
  try {
    manager = new BddManager(order, {
      ...(options.maxNodes === undefined ? {} : { maxNodes: options.maxNodes }),
      ...(options.collection === undefined ? {} : { collection: options.collection }),
    });
  } catch (e) {
    if (e instanceof RangeError) throw new LogicGraphError(e.message);
    throw e;
  }
  const fixed = options.fixed ?? new Map<number, boolean>();
  for (const v of fixed.keys()) {
    if (!Number.isInteger(v) || v < 0 || v >= nv) throw new LogicGraphError(`fixed variable ${v} does not exist`);
  }
  const varNode = new Int32Array(nv);
  for (let v = 0; v < nv; v++) {
    const f = fixed.get(v);
    varNode[v] = f === undefined ? manager.variable(v) : f ? TRUE : FALSE;
  }

  const gateRoots = new Int32Array(ng).fill(-1);
  const refNode = (ref: NodeRef, from: string): number => {
    if (ref.kind === 'const') return ref.value ? TRUE : FALSE;
    if (ref.kind === 'var') {
      if (!Number.isInteger(ref.index) || ref.index < 0 || ref.index >= nv) {
        throw new LogicGraphError(`gate ${from} uses variable index ${ref.index}, which does not exist`);
      }
      return varNode[ref.index]!;
    }
    if (!Number.isInteger(ref.index) || ref.index < 0 || ref.index >= ng) {
      throw new LogicGraphError(`gate ${from} uses gate index ${ref.index}, which does not exist`);
    }
    return gateRoots[ref.index]!;
  };

  // Every id held across manager calls is in varNode or gateRoots, so the manager may collect
  // garbage between and inside gate builds and renumber both arrays in place.
  manager.collecting([varNode, gateRoots], () => {
    buildAll(graph, manager, gateRoots, refNode);
    // One last collection: the table then holds the live diagrams only.
    if (manager.collectionMode !== 'never') manager.collect();
  });

  return {
    manager,
    gateRoots,
    order,
    nodeCount: manager.nodeCount,
    negationFree: graph.gates.every((g) => g.op !== 'not'),
    node: (ref: NodeRef) => refNode(ref, 'reference'),
  };
}

/** Builds every gate after its inputs: a post-order over the gate graph, with a safe point after each gate. */
function buildAll(graph: LogicGraph, manager: BddManager, gateRoots: Int32Array, refNode: (ref: NodeRef, from: string) => number): void {
  const ng = graph.gates.length;
  // Post-order with an explicit stack (0 = new, 1 = on the path, 2 = built).
  const state = new Uint8Array(ng);
  for (let start = 0; start < ng; start++) {
    if (state[start] === 2) continue;
    const stack = [start];
    while (stack.length > 0) {
      const g = stack[stack.length - 1]!;
      if (state[g] === 2) {
        stack.pop();
        continue;
      }
      const gate = graph.gates[g]!;
      if (state[g] === 0) {
        state[g] = 1;
        for (const ref of gate.inputs) {
          if (ref.kind !== 'gate') continue;
          if (!Number.isInteger(ref.index) || ref.index < 0 || ref.index >= ng) {
            throw new LogicGraphError(`gate ${gate.id} uses gate index ${ref.index}, which does not exist`);
          }
          if (state[ref.index] === 1) throw new LogicGraphError(`gate ${gate.id} is part of a cycle`);
          if (state[ref.index] === 0) stack.push(ref.index);
        }
        continue;
      }
      // All inputs are built (an input still on the path would have been reported as a cycle).
      for (const ref of gate.inputs) {
        if (ref.kind === 'gate' && state[ref.index] === 1 && ref.index !== g) {
          throw new LogicGraphError(`gate ${gate.id} is part of a cycle`);
        }
      }
      gateRoots[g] = buildGate(manager, gate.id, gate.op, gate.k, gate.inputs.map((r) => refNode(r, gate.id)));
      state[g] = 2;
      stack.pop();
      manager.safePoint();
    }
  }
}

function buildGate(m: BddManager, id: string, op: string, k: number | undefined, inputs: number[]): number {
  if (inputs.length === 0) throw new LogicGraphError(`gate ${id} has no inputs`);
  switch (op) {
    case 'or':
      return m.orAll(inputs);
    case 'and':
      return m.andAll(inputs);
    case 'not':
      if (inputs.length !== 1) throw new LogicGraphError(`not-gate ${id} must have exactly one input`);
      return m.not(inputs[0]!);
    case 'atleast':
      if (k === undefined || !Number.isInteger(k) || k < 1 || k > inputs.length) {
        throw new LogicGraphError(`voting gate ${id} needs 1 ≤ k ≤ ${inputs.length}, got ${String(k)}`);
      }
      return m.atleast(k, inputs);
    default:
      throw new LogicGraphError(`gate ${id} has unknown operation ${op}`);
  }
}
