/**
 * The logic engine's input: a Boolean model as plain data.
 *
 * Variables are basic events, referred to by index into `variables`. Gates refer to variables,
 * to other gates (by index into `gates`) or to constants. The graph must be acyclic; the study
 * reader guarantees that before it builds one. Nothing here knows about files, units or sources.
 */
export type NodeRef =
  | { kind: 'var'; index: number }
  | { kind: 'gate'; index: number }
  | { kind: 'const'; value: boolean };

/** any = OR, all = AND, atleast = k-out-of-n voting, not = negation of its single input. */
export type GateOp = 'or' | 'and' | 'atleast' | 'not';

export interface LogicGate {
  id: string;
  op: GateOp;
  /** Only for `atleast`: how many inputs must be true. 1 ≤ k ≤ inputs.length. */
  k?: number;
  inputs: NodeRef[];
}

export interface LogicGraph {
  /** Basic-event ids; a variable's index is its position here. */
  variables: string[];
  gates: LogicGate[];
}
