/**
 * Seeded synthetic fault trees for benchmarks (an invented structure, not any real system).
 *
 * Shape: basic events are grouped into small leaf gates (2–5 inputs), gates are grouped again
 * level by level until one top remains. Gate kinds are drawn as a practitioner's tree tends to
 * have them: mostly OR, some AND (redundancy) and 2-out-of-n voting, both thinning out with
 * height so the top collects the ways whole systems fail. About `sharedFraction`
 * of the events are also used by one or two other leaf gates close by in the tree — the way a
 * shared supply or control feeds neighbouring trains — and a handful of "site" events (say, the
 * external supply) are used by gates far apart. Probabilities are log-uniform in
 * [1e-5, 1e-2], a realistic range for demand failures and unavailabilities.
 *
 * Same options, same tree: all randomness comes from the seeded generator below.
 */
import type { LogicGate, LogicGraph, NodeRef } from '../src/logic/graph.js';

export interface SyntheticOptions {
  /** Number of basic events. */
  events: number;
  /** Fraction of events used by more than one gate (default 0.3). */
  sharedFraction?: number;
  /** Events shared by gates far apart in the tree (default 4). */
  siteEvents?: number;
  /** Seed of the generator (default 1). */
  seed?: number;
  /** Probability range, log-uniform (default [1e-5, 1e-2]). */
  probabilityRange?: [number, number];
}

export interface SyntheticTree {
  graph: LogicGraph;
  /** p[v] = probability of event v. */
  p: Float64Array;
  /** Gate index of the top. */
  top: number;
  /** Events actually used by two or more gates. */
  sharedEvents: number;
}

/** A small, fast, seeded 32-bit generator (mulberry32); returns numbers in [0, 1). */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export function syntheticTree(options: SyntheticOptions): SyntheticTree {
  const n = options.events;
  const shared = options.sharedFraction ?? 0.3;
  const site = Math.min(options.siteEvents ?? 4, n);
  const [pLo, pHi] = options.probabilityRange ?? [1e-5, 1e-2];
  const rnd = seededRandom(options.seed ?? 1);
  const int = (lo: number, hi: number): number => lo + Math.floor(rnd() * (hi - lo + 1));

  const variables = Array.from({ length: n }, (_, i) => `e${i}`);
  const p = new Float64Array(n);
  for (let i = 0; i < n; i++) p[i] = Math.exp(Math.log(pLo) + rnd() * (Math.log(pHi) - Math.log(pLo)));

  const gates: LogicGate[] = [];
  const makeGate = (inputs: NodeRef[], height: number): number => {
    const r = rnd();
    let gate: LogicGate;
    const id = `g${gates.length}`;
    // Height 0 groups a component's failure modes and local redundancy, height 1 makes trains
    // (mostly OR), height 2 makes systems from redundant trains (AND or voting), height 3 has a
    // few systems backing each other up, higher gates collect the ways systems fail (OR).
    // Share of AND and of voting by height:
    const andShare = [0.3, 0.1, 0.65, 0.1][height] ?? 0;
    const voteShare = [0.1, 0.05, 0.35][height] ?? 0;
    if (inputs.length >= 3 && r < voteShare) gate = { id, op: 'atleast', k: 2, inputs };
    else if (r < voteShare + andShare) gate = { id, op: 'and', inputs };
    else gate = { id, op: 'or', inputs };
    gates.push(gate);
    return gates.length - 1;
  };

  // Leaf gates over consecutive events.
  const leafOf = new Int32Array(n);
  const leaves: number[] = [];
  for (let i = 0; i < n; ) {
    const size = Math.min(int(2, 5), n - i);
    const inputs: NodeRef[] = [];
    for (let j = 0; j < size; j++) {
      inputs.push({ kind: 'var', index: i + j });
      leafOf[i + j] = leaves.length;
    }
    leaves.push(makeGate(inputs, 0));
    i += size;
  }

  // Local sharing: an event also feeds one or two leaf gates a few gates away.
  const uses = new Int32Array(n).fill(1);
  const target = Math.round(shared * n);
  let sharedCount = 0;
  for (let v = 0; v < n && sharedCount < target; v++) {
    if (rnd() >= shared * 1.05) continue;
    const extra = rnd() < 0.8 ? 1 : 2;
    for (let e = 0; e < extra; e++) {
      const offset = int(1, 6) * (rnd() < 0.5 ? -1 : 1);
      const li = leafOf[v]! + offset;
      if (li < 0 || li >= leaves.length) continue;
      const gate = gates[leaves[li]!]!;
      if (gate.inputs.some((r) => r.kind === 'var' && r.index === v)) continue;
      gate.inputs.push({ kind: 'var', index: v });
      if (gate.op === 'atleast') gate.k = Math.min(gate.k ?? 2, gate.inputs.length);
      uses[v] = uses[v]! + 1;
    }
    if (uses[v]! > 1) sharedCount++;
  }

  // Upper levels: group consecutive gates until one remains.
  let level = leaves;
  let height = 0;
  while (level.length > 1) {
    height++;
    const next: number[] = [];
    for (let i = 0; i < level.length; ) {
      const size = Math.min(int(2, 5), level.length - i);
      if (size === 1) {
        next.push(level[i]!);
        i += 1;
        continue;
      }
      const inputs: NodeRef[] = level.slice(i, i + size).map((g) => ({ kind: 'gate', index: g }));
      next.push(makeGate(inputs, height));
      i += size;
    }
    level = next;
  }
  const top = level[0]!;

  // Site events: each is used by a few OR leaf gates spread over the whole tree.
  for (let s = 0; s < site; s++) {
    const v = int(0, n - 1);
    for (let k = 0; k < 3; k++) {
      const gate = gates[leaves[int(0, leaves.length - 1)]!]!;
      if (gate.op !== 'or' || gate.inputs.some((r) => r.kind === 'var' && r.index === v)) continue;
      gate.inputs.push({ kind: 'var', index: v });
      uses[v] = uses[v]! + 1;
    }
  }

  let sharedEvents = 0;
  for (let v = 0; v < n; v++) if (uses[v]! > 1) sharedEvents++;
  return { graph: { variables, gates }, p, top, sharedEvents };
}
