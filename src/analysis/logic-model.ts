/**
 * Study → the logic engine's plain graph. Basic events become variables (in study order), gates keep
 * their ids, and each top points at its gate. This is the one place that maps study words
 * (any/all/atleast/not) to Boolean operators.
 */
import type { LogicGate, LogicGraph, NodeRef } from '../logic/graph.js';
import type { Study } from '../study/types.js';

export interface LogicModel {
  graph: LogicGraph;
  /** Variable index by basic-event id. */
  variable: Map<string, number>;
  /** Gate index by gate id. */
  gate: Map<string, number>;
  /** Gate index of each top, in study order. */
  topGates: number[];
}

const OP = { any: 'or', all: 'and', atleast: 'atleast', not: 'not' } as const;

export function buildLogicModel(study: Pick<Study, 'events' | 'gates' | 'tops'>): LogicModel {
  const variable = new Map(study.events.map((e, i) => [e.id, i]));
  const gate = new Map(study.gates.map((g, i) => [g.id, i]));
  const ref = (id: string): NodeRef => {
    const g = gate.get(id);
    if (g !== undefined) return { kind: 'gate', index: g };
    return { kind: 'var', index: variable.get(id)! };
  };
  const gates: LogicGate[] = study.gates.map((g) => {
    const out: LogicGate = { id: g.id, op: OP[g.op], inputs: g.inputs.map(ref) };
    if (g.k !== undefined) out.k = g.k;
    return out;
  });
  return {
    graph: { variables: study.events.map((e) => e.id), gates },
    variable,
    gate,
    topGates: study.tops.map((t) => gate.get(t.gate)!),
  };
}
