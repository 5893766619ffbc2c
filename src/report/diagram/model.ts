import type { Results } from '../../analysis/results.js';

/**
 * The logic model as the diagrams need it: every id resolved to a gate or an event, with the label
 * and the (already computed) probability to print. Built from `Results` only.
 */

export type GateOp = 'any' | 'all' | 'atleast' | 'not';

export interface DiagramGate {
  kind: 'gate';
  id: string;
  title?: string;
  op: GateOp;
  k?: number;
  inputs: string[];
  probability?: number;
}

export interface DiagramEvent {
  kind: 'event';
  id: string;
  title: string;
  /** Switch events are house events (a state set per scenario, not a failure). */
  house: boolean;
  on?: boolean;
  probability?: number;
  /** Member of this common-cause group: drawn with a mark, `probability` its own total. */
  commonCause?: string;
  /** A common-cause member's independent part (what its id stands for in the logic). */
  independent?: number;
}

/** An id the logic refers to that neither the gates nor the events define (drawn, not hidden). */
export interface DiagramMissing {
  kind: 'missing';
  id: string;
}

export type DiagramNode = DiagramGate | DiagramEvent | DiagramMissing;

export interface DiagramTop {
  id: string;
  title: string;
  gate: string;
  probability?: number;
}

export interface DiagramModel {
  tops: DiagramTop[];
  node(id: string): DiagramNode;
  /** Gate ids in the order the study lists them. */
  gateIds: string[];
  eventIds: string[];
}

export function diagramModel(results: Results): DiagramModel {
  // Per-gate probabilities: any top may carry them; a gate's probability does not depend on the top.
  const gateProbability = new Map<string, number>();
  for (const top of results.tops) {
    for (const [id, p] of Object.entries(top.gate_probabilities ?? {})) {
      if (!gateProbability.has(id)) gateProbability.set(id, p);
    }
    // The top event is its gate's output, so its exact value is that gate's probability.
    if (!gateProbability.has(top.gate) && top.probability.basis === 'exact') gateProbability.set(top.gate, top.probability.exact);
  }
  const nodes = new Map<string, DiagramNode>();
  for (const e of results.events) {
    nodes.set(e.id, {
      kind: 'event',
      id: e.id,
      title: e.title,
      house: e.model === 'switch',
      ...(e.on !== undefined ? { on: e.on } : {}),
      // A common-cause member stands in the logic for its independent part; the diagram prints
      // the component's own total (labelled so) with the independent part under it, and the mark
      // says the group adds shared events to it.
      probability: e.common_cause_role === 'independent' && e.total_probability !== undefined ? e.total_probability : e.probability,
      ...(e.common_cause_role === 'independent' && e.common_cause_group ? { commonCause: e.common_cause_group, independent: e.probability } : {}),
    });
  }
  for (const g of results.logic.gates) {
    const p = gateProbability.get(g.id);
    nodes.set(g.id, {
      kind: 'gate',
      id: g.id,
      ...(g.title ? { title: g.title } : {}),
      op: g.op,
      ...(g.k !== undefined ? { k: g.k } : {}),
      inputs: g.inputs,
      ...(p !== undefined ? { probability: p } : {}),
    });
  }
  const topProbability = new Map(results.tops.map((t) => [t.id, t.probability.exact]));
  return {
    tops: results.logic.tops.map((t) => {
      const p = topProbability.get(t.id);
      return { id: t.id, title: t.title, gate: t.gate, ...(p !== undefined ? { probability: p } : {}) };
    }),
    node: (id) => nodes.get(id) ?? { kind: 'missing', id },
    gateIds: results.logic.gates.map((g) => g.id),
    eventIds: results.events.map((e) => e.id),
  };
}

/** How a gate is named in words (legend, captions, the label of an untitled gate). */
export function gateWords(gate: DiagramGate): string {
  switch (gate.op) {
    case 'any':
      return 'OR gate';
    case 'all':
      return 'AND gate';
    case 'atleast':
      return `${gate.k ?? '?'}/${gate.inputs.length} voting gate`;
    case 'not':
      return 'NOT gate';
  }
}
