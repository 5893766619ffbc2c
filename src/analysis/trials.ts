/**
 * Monte Carlo trials in blocks: everything a run of trials needs is one plain-data `TrialJob` (the
 * study, the decision diagram frozen into arrays, the recipe of the derived quantities), so a block
 * of trials can run here or on a worker thread from a copy. Within a block the trials go through in
 * batches: each trial's parameters are drawn and its events evaluated as before, then the diagram
 * pass runs once for the whole batch (one array over the batch per node, `BatchEvaluator`), then
 * each trial's derived quantities are computed. Nothing is allocated per trial (every array and
 * prepared function is made with the runner). No number depends on the batch or block a trial
 * falls in: a trial's uniforms depend only on the seed and its index (`uniformRows`), and every
 * other step is the same arithmetic on that trial's values alone.
 */
import { BatchEvaluator, type FlatDiagram } from '../logic/flat-diagram.js';
import type { Study } from '../study/types.js';
import { baseCase } from './case.js';
import { commonCauseOf } from './common-cause.js';
import { EventPlan, parametersSampled } from './event-plan.js';
import { DerivedEvaluator, type DerivedRecipe } from './outcome-quantities.js';
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
  /** Latin hypercube sampling: the run's columns (sampling.ts `latinHypercubeColumns`), drawn once, shared by the threads. */
  columns?: Float64Array;
}

/**
 * Where trials write their values, by absolute trial index (plain or shared memory):
 * tops[k·samples + t], derived[q·samples + t], clipped[t] = 1 when a sampled probability above 1
 * was set to 1 in trial t.
 */
export interface TrialSink {
  tops: Float64Array;
  derived: Float64Array;
  clipped: Uint8Array;
}

export function trialSink(job: TrialJob, shared = false): TrialSink {
  const n = job.samples;
  const f64 = (count: number) => (shared ? new Float64Array(new SharedArrayBuffer(count * 8)) : new Float64Array(count));
  return {
    tops: f64(job.topCount * n),
    derived: f64((job.recipe?.quantities.length ?? 0) * n),
    clipped: shared ? new Uint8Array(new SharedArrayBuffer(n)) : new Uint8Array(n),
  };
}

/** A failure in a trial: the trial's index and the error (a StudyError for an input the trial cannot evaluate). */
export class TrialError extends Error {
  constructor(
    readonly trial: number,
    readonly error: unknown,
  ) {
    super(error instanceof Error ? error.message : String(error));
  }
}

/**
 * Runs blocks of trials of one job; made once per thread (the sampler, event plan and diagram pass
 * are prepared once), then asked for blocks in increasing order.
 */
export class TrialRunner {
  private readonly B: number;
  private readonly sampler: ParameterSampler;
  private readonly plan: EventPlan;
  private readonly rows: ReturnType<typeof uniformRows>;
  private readonly evaluator: BatchEvaluator;
  private readonly derived: DerivedEvaluator | undefined;
  /** Parameter values, trial-major: lane b's vector at [b·P, (b + 1)·P), one view per lane. */
  private readonly parametersBatch: Float64Array;
  private readonly lanes: Float64Array[];

  constructor(
    private readonly job: TrialJob,
    batch = DEFAULT_BATCH,
  ) {
    const study = job.study;
    this.B = batch;
    this.sampler = new ParameterSampler(study, parametersSampled(study));
    this.plan = new EventPlan(study, baseCase(), this.sampler.varying);
    this.rows = uniformRows(study.settings.seed, study.settings.sampling, job.samples, this.sampler.dimensions, job.columns);
    this.evaluator = new BatchEvaluator(job.diagram, batch);
    this.derived = job.recipe ? new DerivedEvaluator(job.recipe) : undefined;
    const P = study.parameters.length;
    // Every lane starts at the study's values; a trial overwrites only the sampled ones.
    this.parametersBatch = new Float64Array(P * batch);
    this.lanes = [];
    for (let b = 0; b < batch; b++) {
      const lane = this.parametersBatch.subarray(b * P, (b + 1) * P);
      study.parameters.forEach((p, i) => (lane[i] = p.value));
      this.lanes.push(lane);
    }
  }

  /**
   * Trials [from, to) into the sink. `onBatch(count)` after each batch. A failing trial throws a
   * TrialError naming it; the trials before it in the block are written.
   */
  run(from: number, to: number, sink: TrialSink, onBatch?: (count: number) => void): void {
    const { study, diagram, topCount, samples } = this.job;
    const { B, sampler, plan, rows, evaluator, derived, parametersBatch, lanes } = this;
    const expansion = commonCauseOf(study);
    const P = study.parameters.length;
    const V = expansion.variableCount;
    const uniforms = new Float64Array(sampler.dimensions);
    const eventProbability = new Float64Array(study.events.length);
    const variableProbability = new Float64Array(V);
    const parameterIndex = new Map(study.parameters.map((p, i) => [p.key, i]));
    let lane = lanes[0]!;
    // The common-cause expansion reads its parameters (beta, …) by key, from the trial's lane.
    const valueOf = (key: string): number => lane[parameterIndex.get(key)!]!;
    const pBatch = new Float64Array(V * B);
    const rootsBatch = new Float64Array(diagram.roots.length * B);
    // A batch's derived quantities, quantity-major ([q·B + b]), copied to the sink in runs of
    // consecutive trials: the sink is quantity-major over the whole run, so writing it trial by
    // trial would touch a distant cache line for every quantity.
    const Q = this.job.recipe?.quantities.length ?? 0;
    const derivedBatch = new Float64Array(Q * B);

    let t = from;
    try {
      for (let t0 = from; t0 < to; t0 += B) {
        const count = Math.min(B, to - t0);
        for (let b = 0; b < count; b++) {
          t = t0 + b;
          lane = lanes[b]!;
          rows.row(t, uniforms);
          const before = sampler.clippedTrials;
          sampler.apply(uniforms, lane, t);
          if (sampler.clippedTrials !== before) sink.clipped[t] = 1;
          plan.evaluate(lane, eventProbability);
          expansion.apply(eventProbability, valueOf, variableProbability);
          for (let v = 0; v < V; v++) pBatch[v * B + b] = variableProbability[v]!;
        }
        evaluator.evaluate(pBatch, count, rootsBatch);
        copyRuns(rootsBatch, topCount, B, count, sink.tops, samples, t0);
        if (derived) {
          // Trial b's quantities from its roots (after the tops, stride B) and its own parameter values.
          for (let b = 0; b < count; b++) {
            t = t0 + b;
            derived.evaluate(rootsBatch, topCount * B + b, B, parametersBatch, b * P, derivedBatch, b, B);
          }
          copyRuns(derivedBatch, Q, B, count, sink.derived, samples, t0);
        }
        onBatch?.(count);
      }
    } catch (err) {
      throw new TrialError(t, err);
    }
  }
}

/** rows × count values from batch[k·B + b] to sink[k·samples + t0 + b]. */
function copyRuns(batch: Float64Array, rows: number, B: number, count: number, sink: Float64Array, samples: number, t0: number): void {
  for (let k = 0; k < rows; k++) {
    const from = k * B;
    const to = k * samples + t0;
    for (let b = 0; b < count; b++) sink[to + b] = batch[from + b]!;
  }
}
