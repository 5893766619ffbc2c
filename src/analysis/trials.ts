/**
 * Monte Carlo trials in blocks: everything a run of trials needs is one plain-data `TrialJob` (the
 * study, the decision diagram frozen into arrays, the recipe of the derived quantities), so a block
 * of trials can run here or on a worker thread from a copy. Within a block the trials go through in
 * batches: each trial's parameters are drawn and its events evaluated as before, then the diagram
 * pass runs once for the whole batch (one array over the batch per node, `BatchEvaluator`), then
 * each trial's derived quantities are computed. No number depends on the batch or block a trial
 * falls in: a trial's uniforms depend only on the seed and its index (`uniformRows`), and every
 * other step is the same arithmetic on that trial's values alone.
 */
import { BatchEvaluator, type FlatDiagram } from '../logic/flat-diagram.js';
import type { Study } from '../study/types.js';
import { baseCase } from './case.js';
import { commonCauseOf } from './common-cause.js';
import { EventPlan, parametersSampled } from './event-plan.js';
import { derivedValues, type DerivedRecipe } from './outcome-quantities.js';
import { ParameterSampler, uniformRows } from './sampling.js';

/** Trials evaluated together in one diagram pass. */
export const DEFAULT_BATCH = 64;

export interface TrialJob {
  study: Study;
  /** Roots: the tops (study order), then the roots the recipe indexes. */
  diagram: FlatDiagram;
  topCount: number;
  recipe?: DerivedRecipe;
  /** Trials in the whole run (Latin hypercube strata depend on it). */
  samples: number;
}

/** The values of trials [from, to). */
export interface TrialBlock {
  from: number;
  to: number;
  /** tops[k][t − from]: top k in trial t. */
  tops: Float64Array[];
  /** derived[q][t − from]: the recipe's quantity q in trial t. */
  derived: Float64Array[];
  /** Trials in which a sampled probability above 1 was set to 1. */
  clippedTrials: number;
}

export interface BlockOptions {
  batch?: number;
  /** Called after each batch with the number of trials of this block done so far. */
  onBatch?: (done: number) => void;
}

export function runTrials(job: TrialJob, from: number, to: number, options: BlockOptions = {}): TrialBlock {
  const { study, diagram, topCount, recipe } = job;
  const B = options.batch ?? DEFAULT_BATCH;
  const n = to - from;
  const sampler = new ParameterSampler(study, parametersSampled(study));
  const plan = new EventPlan(study, baseCase(), sampler.varying);
  const expansion = commonCauseOf(study);
  const rows = uniformRows(study.settings.seed, study.settings.sampling, job.samples, sampler.dimensions, from);
  const evaluator = new BatchEvaluator(diagram, B);

  const P = study.parameters.length;
  const V = expansion.variableCount;
  const uniforms = new Float64Array(sampler.dimensions);
  const parameterValues = Float64Array.from(study.parameters, (p) => p.value);
  const eventProbability = new Float64Array(study.events.length);
  const variableProbability = new Float64Array(V);
  const parameterIndex = new Map(study.parameters.map((p, i) => [p.key, i]));
  const valueOf = (key: string): number => parameterValues[parameterIndex.get(key)!]!;
  const pBatch = new Float64Array(V * B);
  const rootsBatch = new Float64Array(diagram.roots.length * B);

  // The derived quantities of trial b read that trial's parameter values after the batch's pass.
  const Q = recipe?.quantities.length ?? 0;
  const parametersBatch = recipe ? new Float64Array(P * B) : new Float64Array(0);
  let offset = 0;
  const batchValueOf = (key: string): number => parametersBatch[offset + parameterIndex.get(key)!]!;
  const rootP = new Float64Array(recipe?.rootCount ?? 0);
  const quantities = new Float64Array(Q);

  const tops = Array.from({ length: topCount }, () => new Float64Array(n));
  const derived = Array.from({ length: Q }, () => new Float64Array(n));
  for (let t0 = from; t0 < to; t0 += B) {
    const count = Math.min(B, to - t0);
    for (let b = 0; b < count; b++) {
      rows.row(t0 + b, uniforms);
      sampler.apply(uniforms, parameterValues, t0 + b);
      plan.evaluate(parameterValues, eventProbability);
      expansion.apply(eventProbability, valueOf, variableProbability);
      for (let v = 0; v < V; v++) pBatch[v * B + b] = variableProbability[v]!;
      if (recipe) parametersBatch.set(parameterValues, b * P);
    }
    evaluator.evaluate(pBatch, count, rootsBatch);
    const at = t0 - from;
    for (let k = 0; k < topCount; k++) tops[k]!.set(rootsBatch.subarray(k * B, k * B + count), at);
    if (recipe) {
      for (let b = 0; b < count; b++) {
        for (let j = 0; j < rootP.length; j++) rootP[j] = rootsBatch[(topCount + j) * B + b]!;
        offset = b * P;
        derivedValues(recipe, rootP, batchValueOf, quantities);
        for (let q = 0; q < Q; q++) derived[q]![at + b] = quantities[q]!;
      }
    }
    options.onBatch?.(at + count);
  }
  return { from, to, tops, derived, clippedTrials: sampler.clippedTrials };
}
