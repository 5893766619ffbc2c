/**
 * How many of a set of n gates fail: the exact distribution P(exactly j of n), j = 0..n, from one
 * decision diagram (logic/count.ts), so power, controls and common-cause events that several gates
 * share are counted once; beside it the answer a spreadsheet gives by treating the gates as
 * independent, each with its own exact marginal: the binomial distribution when the marginals are
 * equal, the Poisson-binomial (the distribution of a sum of independent Bernoulli variables with
 * unequal probabilities) when they are not. The gap between the two is what sharing costs.
 */
import { countDistribution, probabilityPair } from '../logic/index.js';
import type { CompiledLogic } from '../logic/index.js';
import type { CountSet, Study } from '../study/types.js';
import { logicNode } from './logic-node.js';
import type { LogicModel } from './logic-model.js';
import type { GateCountResult } from './results.js';

/**
 * dist[j] = P(exactly j of independent events with probabilities p occur), j = 0..p.length, by the
 * usual one-event-at-a-time recursion dist'[j] = dist[j]·q + dist[j − 1]·p (sums of non-negative
 * terms only, so no cancellation). With equal p it is the binomial distribution. `q` are the
 * complements 1 − p computed without subtraction (from the diagram); without it 1 − p is formed,
 * which loses digits for marginals near 1 (1 − 0.99999999 keeps 8 digits of 16).
 */
export function poissonBinomial(p: readonly number[], q?: readonly number[]): number[] {
  const dist = new Array<number>(p.length + 1).fill(0);
  dist[0] = 1;
  p.forEach((pi, i) => {
    const qi = q ? q[i]! : 1 - pi;
    for (let j = i + 1; j >= 1; j--) dist[j] = dist[j]! * qi + dist[j - 1]! * pi;
    dist[0] = dist[0]! * qi;
  });
  return dist;
}

/** P(at least j), j = 0..n, as tail sums (each entry a sum of non-negative terms). */
export function tails(dist: readonly number[]): number[] {
  const out = new Array<number>(dist.length).fill(0);
  let s = 0;
  for (let j = dist.length - 1; j >= 0; j--) {
    s += dist[j]!;
    out[j] = s;
  }
  return out;
}

/** Marginals this close (relative) count as equal, so the binomial is named. */
const EQUAL = 1e-12;

export function gateCount(study: Study, model: LogicModel, compiled: CompiledLogic, p: Float64Array, set: CountSet): GateCountResult {
  const m = compiled.manager;
  const resolved = set.of.map((id) => ({ id, ...logicNode(study, model, compiled, id) }));
  const roots = resolved.map((r) => r.node);
  const exact = Array.from(countDistribution(m, roots, p));
  const pairs = roots.map((r) => probabilityPair(m, r, p));
  const marginals = pairs.map((x) => x.p);
  const independent = poissonBinomial(marginals, pairs.map((x) => x.q));
  const hi = Math.max(...marginals);
  const lo = Math.min(...marginals);
  const mean = (d: number[]) => d.reduce((s, x, j) => s + j * x, 0);
  const titleOf = (id: string, kind: string): string | undefined =>
    kind === 'gate' ? study.gates.find((g) => g.id === id)?.title : kind === 'top' ? study.tops.find((t) => t.id === id)?.title : study.events.find((e) => e.id === id)?.title;
  return {
    id: set.id,
    title: set.title,
    of: resolved.map((r, i) => {
      const title = titleOf(r.id, r.kind);
      return { id: r.id, kind: r.kind, ...(title ? { title } : {}), probability: marginals[i]! };
    }),
    exact,
    independent,
    independent_method: hi - lo <= EQUAL * hi ? 'binomial' : 'poisson-binomial',
    at_least: { exact: tails(exact), independent: tails(independent) },
    mean: { exact: mean(exact), independent: mean(independent) },
    bdd_nodes: m.size(m.exactlyAll(roots)),
  };
}

/**
 * The diagrams a count set's distribution is read from, appended to `roots`: "exactly j of the set
 * fail", j = 0..n (the same diagrams `countDistribution` evaluates), so a Monte Carlo trial gets
 * P(at least j) as `tails` of their probabilities, exactly as the section does at the base case.
 */
export function countRecipe(study: Study, model: LogicModel, compiled: CompiledLogic, set: CountSet, roots: number[]): { set: CountSet; exactly: number[] } {
  const nodes = set.of.map((id) => logicNode(study, model, compiled, id).node);
  const exactly = compiled.manager.exactlyAll(nodes).map((r) => {
    roots.push(r);
    return roots.length - 1;
  });
  return { set, exactly };
}
