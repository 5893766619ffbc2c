/**
 * Study → the logic engine's plain graph. Basic events become variables (in study order), gates keep
 * their ids, and each top points at its gate. This is the one place that maps study words
 * (any/all/atleast/not) to Boolean operators.
 */
import type { LogicGate, LogicGraph, NodeRef } from '../logic/graph.js';
import type { Study } from '../study/types.js';
import { commonCauseOf, type CommonCauseExpansion } from './common-cause.js';

export interface LogicModel {
  graph: LogicGraph;
  /** Variable index by basic-event id. */
  variable: Map<string, number>;
  /** Gate index by gate id. */
  gate: Map<string, number>;
  /** Gate index of each top, in study order. */
  topGates: number[];
  /**
   * The common-cause expansion (common-cause.ts): its events are variables after the study's
   * events, and each group member's uses read the gate in `memberGate` (member id → gate index,
   * gates after the study's), OR(independent part, shared events containing it).
   */
  commonCause: CommonCauseExpansion;
  memberGate: Map<string, number>;
}

const OP = { any: 'or', all: 'and', atleast: 'atleast', not: 'not' } as const;

export function buildLogicModel(study: Pick<Study, 'events' | 'gates' | 'tops'> & Partial<Pick<Study, 'commonCause'>>): LogicModel {
  const variable = new Map(study.events.map((e, i) => [e.id, i]));
  const gate = new Map(study.gates.map((g, i) => [g.id, i]));
  const commonCause = commonCauseOf(study);
  commonCause.addedIds.forEach((id, k) => variable.set(id, study.events.length + k));
  const memberGate = new Map<string, number>();
  for (const i of commonCause.memberOf.keys()) memberGate.set(study.events[i]!.id, study.gates.length + memberGate.size);
  const ref = (id: string): NodeRef => {
    const g = gate.get(id);
    if (g !== undefined) return { kind: 'gate', index: g };
    const mg = memberGate.get(id);
    if (mg !== undefined) return { kind: 'gate', index: mg };
    return { kind: 'var', index: variable.get(id)! };
  };
  const gates: LogicGate[] = study.gates.map((g) => {
    const out: LogicGate = { id: g.id, op: OP[g.op], inputs: g.inputs.map(ref) };
    if (g.k !== undefined) out.k = g.k;
    return out;
  });
  for (const [id] of memberGate) {
    const i = variable.get(id)!;
    const inputs: NodeRef[] = [{ kind: 'var', index: i }, ...commonCause.sharedWith(i).map((s): NodeRef => ({ kind: 'var', index: s.variable }))];
    gates.push({ id: `${id}/any-cause`, op: 'or', inputs });
  }
  return {
    graph: { variables: [...study.events.map((e) => e.id), ...commonCause.addedIds], gates },
    variable,
    gate,
    topGates: study.tops.map((t) => gate.get(t.gate)!),
    commonCause,
    memberGate,
  };
}
