/**
 * Minimal cut sets and a rigorous upper bound on the top probability WITHOUT a decision diagram:
 * the fallback for models whose diagram outgrows the node budget (settings.on_node_budget: bounds).
 *
 * Method: top-down expansion of the gate graph into products of basic events (the classical
 * "MOCUS" reading of a fault tree, NUREG-0492 Fault Tree Handbook ch. VII), depth first, with the
 * probability cutoff and the maximum order applied while expanding. A partial product keeps the
 * events chosen so far and the obligations still to meet; an AND adds all its inputs as
 * obligations, an OR branches on its inputs, a k-out-of-n vote branches on including or skipping
 * one input at a time. The probability of the chosen events only falls as events are added, so a
 * partial product below the cutoff (or above the order limit) can hold no kept cut set and is
 * dropped. The products that meet every obligation are cut sets; those containing another are
 * removed, leaving the minimal ones above the cutoff.
 *
 * The bound. Every completion of a dropped partial product lies inside the event "all its chosen
 * events occur", so the kept cut sets together with the chosen-event sets of every dropped partial
 * product cover the top event. Those are all increasing events of independent basic events, so by
 * the Esary–Proschan inequality (the min-cut upper bound, NUREG-0492 ch. XI; it holds for any cover
 * by increasing events, by the Harris–FKG inequality) P(top) ≤ 1 − Π(1 − P(Cᵢ)) over the whole
 * cover. That is the number reported: an upper bound even though sets were cut off. It is formed
 * as −expm1(Σ log1p(−P)) so a bound of 1e-18 keeps its digits.
 *
 * Negation. A `not` is pushed down to the basic events (De Morgan; ¬atleast(k of n) =
 * atleast(n − k + 1 of the negated inputs)) and a negated basic event is then replaced by `true`.
 * The result is a monotone function that is true wherever the model is, so its cut sets are cut
 * sets of a relaxation and the bound stays an upper bound; `coherent` is then false. (For a model
 * that is already coherent nothing is relaxed.)
 *
 * Pure: no file system, clock or randomness.
 */
import type { LogicGraph, NodeRef } from './graph.js';
import { LogicGraphError } from './errors.js';
import type { CutSet } from './cutsets.js';

export interface TopDownOptions {
  /** Keep cut sets with probability ≥ cutoff (default 0: keep all). */
  cutoff?: number;
  /** Keep cut sets of at most this many events (default: no limit). */
  maxOrder?: number;
  /** Variables held at a constant value (house events): variable index → value. */
  fixed?: ReadonlyMap<number, boolean>;
  /** Expansion steps allowed before giving up (default 20,000,000: about 15 s; a 20,000-event tree at cutoff 1e-12 takes 5 million). */
  maxSteps?: number;
}

export interface TopDownResult {
  /** Minimal cut sets above the cutoff, largest probability first; ties by variable indices. */
  sets: CutSet[];
  /** Σ P over the kept sets (the rare-event approximation of what was kept). */
  rareEvent: number;
  /** 1 − Π(1 − P) over the kept sets and the dropped partial products: P(top) ≤ upperBound. */
  upperBound: number;
  /** Partial products dropped by the cutoff or the order limit. */
  droppedTerms: number;
  /** Σ P(chosen events) over the dropped partial products: an upper bound on the mass they could hold. */
  droppedProbability: number;
  /** False when negated events were relaxed to `true` (the sets are those of a monotone relaxation). */
  coherent: boolean;
  /** Expansion steps used. */
  steps: number;
}

/** Thrown when the expansion needs more steps than allowed (a raised cutoff or a lower order helps). */
export class ExpansionBudgetExceeded extends Error {
  constructor(readonly steps: number) {
    super(`top-down cut-set expansion stopped after ${steps} steps`);
    this.name = 'ExpansionBudgetExceeded';
  }
}

/** Something the partial product still has to make true. */
type Obligation =
  | { kind: 'ref'; ref: NodeRef; neg: boolean }
  /** At least k of gate's inputs from index `from` on (each negated when `neg`). */
  | { kind: 'vote'; gate: number; k: number; from: number; neg: boolean };

interface Term {
  /** Chosen basic events (positive literals), in the order chosen. */
  events: number[];
  prob: number;
  pending: Obligation[];
}

export function topDownCutSets(graph: LogicGraph, gate: number, p: ArrayLike<number>, options: TopDownOptions = {}): TopDownResult {
  const nv = graph.variables.length;
  const ng = graph.gates.length;
  if (!Number.isInteger(gate) || gate < 0 || gate >= ng) throw new LogicGraphError(`gate index ${gate} does not exist`);
  if (p.length < nv) throw new LogicGraphError(`${p.length} probabilities for ${nv} variables`);
  const cutoff = options.cutoff ?? 0;
  const maxOrder = options.maxOrder ?? Infinity;
  const maxSteps = options.maxSteps ?? 20_000_000;
  const fixed = options.fixed ?? new Map<number, boolean>();

  let steps = 0;
  let relaxed = false;
  let droppedTerms = 0;
  let droppedProbability = 0;
  let logDropped = 0;
  const found = new Map<string, number[]>();

  const drop = (prob: number) => {
    droppedTerms++;
    droppedProbability += prob;
    logDropped += Math.log1p(-prob);
  };

  const stack: Term[] = [{ events: [], prob: 1, pending: [{ kind: 'ref', ref: { kind: 'gate', index: gate }, neg: false }] }];
  while (stack.length > 0) {
    const term = stack.pop()!;
    // Settle every obligation that needs no branching; stop at the first that does.
    let alive = true;
    let branchAt = -1;
    for (let i = 0; alive && i < term.pending.length; ) {
      if (++steps > maxSteps) throw new ExpansionBudgetExceeded(steps);
      const ob = term.pending[i]!;
      const r = settle(ob, term);
      if (r === 'dead') alive = false;
      else if (r === 'done') term.pending.splice(i, 1);
      else if (r === 'branch') {
        if (branchAt < 0 || branchCount(term.pending[branchAt]!) > branchCount(ob)) branchAt = i;
        i++;
      } else {
        // Replaced by simpler obligations (already spliced in); look at position i again.
      }
      if (alive && (term.prob < cutoff || term.events.length > maxOrder)) {
        drop(term.prob);
        alive = false;
      }
    }
    if (!alive) continue;
    if (term.pending.length === 0) {
      const vars = [...term.events].sort((a, b) => a - b);
      found.set(vars.join(','), vars);
      continue;
    }
    // Branch on the obligation with the fewest alternatives; push in reverse so the first is expanded first.
    const ob = term.pending[branchAt]!;
    const rest = term.pending.filter((_, j) => j !== branchAt);
    const alternatives = branches(ob);
    for (let a = alternatives.length - 1; a >= 0; a--) {
      stack.push({ events: [...term.events], prob: term.prob, pending: [...alternatives[a]!, ...rest] });
    }
  }

  const sets = minimal([...found.values()]).map((vars) => ({ vars, probability: product(vars, p) }));
  sets.sort((a, b) => b.probability - a.probability || lexicographic(a.vars, b.vars));
  let rareEvent = 0;
  let logKept = 0;
  for (const s of sets) {
    rareEvent += s.probability;
    logKept += Math.log1p(-s.probability);
  }
  const total = logKept + logDropped;
  return {
    sets,
    rareEvent,
    upperBound: total === -Infinity ? 1 : -Math.expm1(total),
    droppedTerms,
    droppedProbability,
    coherent: !relaxed,
    steps,
  };

  /**
   * Apply one obligation to the term if that needs no branching: 'done' (met, remove it), 'dead'
   * (cannot be met), 'replaced' (turned into simpler obligations in place), or 'branch'.
   */
  function settle(ob: Obligation, term: Term): 'done' | 'dead' | 'replaced' | 'branch' {
    const i = term.pending.indexOf(ob);
    if (ob.kind === 'vote') {
      const inputs = graph.gates[ob.gate]!.inputs;
      const left = inputs.length - ob.from;
      if (ob.k <= 0) return 'done';
      if (left < ob.k) return 'dead';
      if (left === ob.k) {
        // Every remaining input is needed: an AND of them.
        term.pending.splice(i, 1, ...inputs.slice(ob.from).map((ref): Obligation => ({ kind: 'ref', ref, neg: ob.neg })));
        return 'replaced';
      }
      return 'branch';
    }
    const { ref, neg } = ob;
    if (ref.kind === 'const') return ref.value !== neg ? 'done' : 'dead';
    if (ref.kind === 'var') {
      if (!Number.isInteger(ref.index) || ref.index < 0 || ref.index >= nv) throw new LogicGraphError(`variable index ${ref.index} does not exist`);
      const f = fixed.get(ref.index);
      if (f !== undefined) return f !== neg ? 'done' : 'dead';
      if (neg) {
        // A negated basic event: relaxed to true (see the header).
        relaxed = true;
        return 'done';
      }
      if (!term.events.includes(ref.index)) {
        term.events.push(ref.index);
        term.prob *= p[ref.index]!;
      }
      return 'done';
    }
    if (!Number.isInteger(ref.index) || ref.index < 0 || ref.index >= ng) throw new LogicGraphError(`gate index ${ref.index} does not exist`);
    const g = graph.gates[ref.index]!;
    if (g.inputs.length === 0) throw new LogicGraphError(`gate ${g.id} has no inputs`);
    const sub = (r: NodeRef, n: boolean): Obligation => ({ kind: 'ref', ref: r, neg: n });
    switch (g.op) {
      case 'not':
        if (g.inputs.length !== 1) throw new LogicGraphError(`not-gate ${g.id} must have exactly one input`);
        term.pending.splice(i, 1, sub(g.inputs[0]!, !neg));
        return 'replaced';
      case 'and':
      case 'or': {
        // AND, or a negated OR (De Morgan): every input (negated with the gate) must hold.
        if ((g.op === 'and') !== neg) {
          term.pending.splice(i, 1, ...g.inputs.map((r) => sub(r, neg)));
          return 'replaced';
        }
        if (g.inputs.length === 1) {
          term.pending.splice(i, 1, sub(g.inputs[0]!, neg));
          return 'replaced';
        }
        // An OR already met by an event the term holds: the other branches only give supersets.
        if (!neg && g.inputs.some((r) => r.kind === 'var' && term.events.includes(r.index))) return 'done';
        return 'branch';
      }
      case 'atleast': {
        const k = g.k;
        if (k === undefined || !Number.isInteger(k) || k < 1 || k > g.inputs.length) {
          throw new LogicGraphError(`voting gate ${g.id} needs 1 ≤ k ≤ ${g.inputs.length}, got ${String(k)}`);
        }
        // ¬(at least k of n) = at least n − k + 1 of the negated inputs.
        term.pending.splice(i, 1, { kind: 'vote', gate: ref.index, k: neg ? g.inputs.length - k + 1 : k, from: 0, neg });
        return 'replaced';
      }
      default:
        throw new LogicGraphError(`gate ${g.id} has unknown operation ${String(g.op)}`);
    }
  }

  function branchCount(ob: Obligation): number {
    if (ob.kind === 'vote') return 2;
    return ob.ref.kind === 'gate' ? graph.gates[ob.ref.index]!.inputs.length : 1;
  }

  /** The alternatives of a branching obligation, each a list of obligations that replace it. */
  function branches(ob: Obligation): Obligation[][] {
    if (ob.kind === 'vote') {
      const input = graph.gates[ob.gate]!.inputs[ob.from]!;
      return [
        [{ kind: 'ref', ref: input, neg: ob.neg }, { ...ob, k: ob.k - 1, from: ob.from + 1 }],
        [{ ...ob, from: ob.from + 1 }],
      ];
    }
    const g = graph.gates[(ob.ref as { index: number }).index]!;
    // An OR, or a negated AND: one input (negated with the gate) suffices.
    return g.inputs.map((r) => [{ kind: 'ref', ref: r, neg: ob.neg }]);
  }
}

function product(vars: readonly number[], p: ArrayLike<number>): number {
  let prob = 1;
  for (const v of vars) prob *= p[v]!;
  return prob;
}

function lexicographic(a: readonly number[], b: readonly number[]): number {
  for (let i = 0; i < Math.min(a.length, b.length); i++) if (a[i] !== b[i]) return a[i]! - b[i]!;
  return a.length - b.length;
}

/** The sets that contain no other set of the list (each set sorted ascending, no duplicates). */
function minimal(sets: number[][]): number[][] {
  const bySize = [...sets].sort((a, b) => a.length - b.length || lexicographic(a, b));
  const kept: number[][] = [];
  // For each event, the kept sets holding it: a set is subsumed when some kept set is hit |T| times.
  const holding = new Map<number, number[]>();
  const hits = new Map<number, number>();
  // The empty set (the top holds whatever happens) is in every set; sorted by size it comes first.
  const emptyKept = bySize.length > 0 && bySize[0]!.length === 0;
  for (const s of bySize) {
    hits.clear();
    let subsumed = emptyKept && s.length > 0;
    for (const v of s) {
      if (subsumed) break;
      for (const t of holding.get(v) ?? []) {
        const h = (hits.get(t) ?? 0) + 1;
        hits.set(t, h);
        if (h === kept[t]!.length) {
          subsumed = true;
          break;
        }
      }
    }
    if (subsumed) continue;
    const id = kept.length;
    kept.push(s);
    for (const v of s) {
      const list = holding.get(v);
      if (list) list.push(id);
      else holding.set(v, [id]);
    }
  }
  return kept;
}
