/**
 * The decision-diagram node of an id that counts and event trees may name: a gate, a top (its
 * gate) or a basic event. A common-cause member reads as the OR of its independent part and its
 * shared events, exactly as the gates that use it do; a switch reads as its base-case constant.
 */
import type { CompiledLogic } from '../logic/index.js';
import type { Study } from '../study/types.js';
import type { LogicModel } from './logic-model.js';

export type LogicKind = 'gate' | 'top' | 'event';

export function logicNode(study: Study, model: LogicModel, compiled: CompiledLogic, id: string): { node: number; kind: LogicKind } {
  const g = model.gate.get(id);
  if (g !== undefined) return { node: compiled.gateRoots[g]!, kind: 'gate' };
  const top = study.tops.find((t) => t.id === id);
  if (top) return { node: compiled.gateRoots[model.gate.get(top.gate)!]!, kind: 'top' };
  const mg = model.memberGate.get(id);
  if (mg !== undefined) return { node: compiled.gateRoots[mg]!, kind: 'event' };
  const v = model.variable.get(id);
  if (v === undefined) throw new Error(`'${id}' is no gate, top or basic event of the model`);
  return { node: compiled.node({ kind: 'var', index: v }), kind: 'event' };
}
