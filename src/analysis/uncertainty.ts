/**
 * Uncertainty analysis: Monte Carlo (or Latin hypercube) propagation of the parameters' stated
 * uncertainty to the top-event probabilities (NUREG/CR-6823 §6.3; NUREG-0492 ch. XI on propagating
 * distributions through a fault tree). Each trial draws every uncertain parameter once
 * (`ParameterSampler`), evaluates the events of the base case through a prepared plan
 * (`EventPlan`) and the tops through the prepared diagram pass, all without re-reading or
 * re-building anything. Seeded by settings.seed: the same study gives the same numbers.
 */
import { flattenDiagram } from '../logic/flat-diagram.js';
import type { Study } from '../study/types.js';
import type { Stage } from './analyze.js';
import { baseCase } from './case.js';
import { CaseQuantifier } from './case-quantifier.js';
import { commonCauseOf } from './common-cause.js';
import { notSampledWarning } from './input-warnings.js';
import { parametersSampled } from './event-plan.js';
import { derivedRecipe, sectionValue, type DerivedRecipe } from './outcome-quantities.js';
import type { QuantityUncertainty, Results, UncertaintyResult } from './results.js';
import { sampleQuantile } from '../reliability/distributions.js';
import { ParameterSampler, latinHypercubeColumns } from './sampling.js';
import { meanAndSd, quantileSorted, sortedCopy, summarize } from './statistics.js';
import { CHUNK, runParallel } from './parallel-trials.js';
import { DEFAULT_BATCH, TrialError, TrialRunner, trialSink, type TrialJob, type TrialSink } from './trials.js';

export interface UncertaintyOptions {
  progress?: (label: string, done: number, total: number) => void;
  /** Overrides settings.samples (the benchmark). */
  samples?: number;
  /** Trials per diagram pass (trials.ts); no number depends on it. */
  batch?: number;
  /** Threads to run the trials on (parallel-trials.ts), this one included; 1 (the default) runs them here. No number depends on it. */
  threads?: number;
  /** Also quantify the event trees, failure modes and gate counts in every trial (default true). */
  outcomes?: boolean;
}

/** Trials between progress reports. */
const PROGRESS_EVERY = 1000;

/** The raw trial values, top by top, with the sampler's bookkeeping. */
export interface MonteCarloRun {
  /** values[t] = that top's probability in each trial. */
  values: Float64Array[];
  /** The derived quantities' recipe and their values per trial (derived[q][trial]), when the study has any. */
  recipe?: DerivedRecipe;
  derived: Float64Array[];
  samples: number;
  method: 'monte-carlo' | 'latin-hypercube';
  sampled: string[];
  held: { key: string; reason: string }[];
  clippedTrials: number;
  /** Chunks of trials the worker threads ran (the benchmark prints it; never in the results). */
  workerChunks: number;
}

/** The plain-data job of a study's trials (trials.ts): the base-case diagram of the tops and, with `outcomes`, of the derived quantities. */
export function trialJob(study: Study, quantifier: CaseQuantifier, samples: number, outcomes = true): TrialJob {
  const { compiled } = quantifier.diagram(baseCase());
  const topRoots = quantifier.model.topGates.map((g) => compiled.gateRoots[g]!);
  const derived = outcomes ? derivedRecipe(study, quantifier.model, compiled) : undefined;
  // The diagram's variables: the events, then the common-cause expansion's shared events (common-cause.ts).
  const variables = commonCauseOf(study).variableCount;
  const job: TrialJob = {
    study,
    diagram: flattenDiagram(compiled.manager, [...topRoots, ...(derived?.roots ?? [])], variables),
    topCount: topRoots.length,
    samples,
  };
  if (derived) job.recipe = derived.recipe;
  if (study.settings.sampling === 'latin-hypercube') {
    const dimensions = new ParameterSampler(study, parametersSampled(study)).dimensions;
    job.columns = latinHypercubeColumns(study.settings.seed, samples, dimensions, true);
  }
  return job;
}

/** Runs the trials; undefined when no parameter states a samplable uncertainty or samples is 0. */
export function monteCarlo(study: Study, quantifier: CaseQuantifier, options: UncertaintyOptions = {}): MonteCarloRun | undefined {
  const samples = options.samples ?? study.settings.samples;
  const sampler = new ParameterSampler(study, parametersSampled(study));
  if (sampler.varying.size === 0 || !(samples > 0)) return undefined;
  const job = trialJob(study, quantifier, samples, options.outcomes !== false);
  const derived = job.recipe;
  const method = study.settings.sampling;
  const label = method === 'latin-hypercube' ? 'Latin hypercube' : 'Monte Carlo';
  let reported = 0;
  const progress = (done: number) => {
    if (!options.progress) return;
    while (reported + PROGRESS_EVERY <= done) {
      reported += PROGRESS_EVERY;
      options.progress(label, reported, samples);
    }
  };
  const batch = options.batch ?? DEFAULT_BATCH;
  const threads = options.threads ?? 1;
  let sink: TrialSink;
  let workerChunks = 0;
  if (threads > 1 && samples >= 2 * CHUNK) {
    ({ sink, workerChunks } = runParallel(job, { threads, batch, onProgress: progress }));
  } else {
    sink = trialSink(job);
    let done = 0;
    try {
      new TrialRunner(job, batch).run(0, samples, sink, (count) => progress((done += count)));
    } catch (err) {
      throw err instanceof TrialError ? err.error : err;
    }
  }
  options.progress?.(label, samples, samples);
  const rows = (flat: Float64Array, count: number) => Array.from({ length: count }, (_, k) => flat.subarray(k * samples, (k + 1) * samples));
  let clippedTrials = 0;
  for (let t = 0; t < samples; t++) clippedTrials += sink.clipped[t]!;
  const run: MonteCarloRun = {
    values: rows(sink.tops, job.topCount),
    derived: rows(sink.derived, derived?.quantities.length ?? 0),
    samples,
    method,
    sampled: [...sampler.varying].sort((a, b) => a - b).map((i) => study.parameters[i]!.key),
    held: sampler.held,
    clippedTrials,
    workerChunks,
  };
  if (derived) run.recipe = derived;
  return run;
}

/** Mean, median, 5th and 95th percentiles (Hyndman–Fan 7, statistics.ts) and sd of each derived quantity, beside its section's value. */
export function outcomeUncertainty(run: MonteCarloRun, sections: Pick<Results, 'event_trees' | 'failure_modes' | 'gate_counts'>): QuantityUncertainty[] {
  if (!run.recipe) return [];
  return run.recipe.quantities.map((q, k) => {
    const values = run.derived[k]!;
    const sorted = sortedCopy(values);
    const { mean, sd } = meanAndSd(values);
    return {
      kind: q.kind,
      owner: q.owner,
      id: q.id,
      point: sectionValue(sections, q),
      mean,
      median: quantileSorted(sorted, 0.5),
      p05: quantileSorted(sorted, 0.05),
      p95: quantileSorted(sorted, 0.95),
      sd,
    };
  });
}

export function uncertainty(
  study: Study,
  quantifier: CaseQuantifier,
  options: UncertaintyOptions = {},
): { results: UncertaintyResult[]; held: { key: string; reason: string }[]; run?: MonteCarloRun } {
  const run = monteCarlo(study, quantifier, options);
  if (!run) return { results: [], held: new ParameterSampler(study, parametersSampled(study)).held };
  const results = study.tops.map((top, k): UncertaintyResult => {
    const s = summarize(run.values[k]!);
    return {
      top: top.id,
      samples: run.samples,
      seed: study.settings.seed,
      method: run.method,
      mean: s.mean,
      median: s.median,
      p05: s.p05,
      p95: s.p95,
      sd: s.sd,
      standard_error: s.standard_error,
      convergence: s.convergence,
      histogram: s.histogram,
      cdf: s.cdf,
      sampled_parameters: run.sampled,
      held_parameters: run.held,
      clipped_trials: run.clippedTrials,
    };
  });
  return { results, held: run.held, run };
}

/**
 * The uncertainty stage, after the shared-causes stage so the derived quantities' sections (their
 * base-case values) exist: the tops' uncertainty and, from the same trials, the outcomes'.
 */
export const uncertaintyStage: Stage = (ctx) => {
  const { study } = ctx;
  const quantifier = new CaseQuantifier(study, ctx.model, ctx.compiled);
  const options: UncertaintyOptions = {};
  if (ctx.options.progress) options.progress = ctx.options.progress;
  if (ctx.options.threads !== undefined) options.threads = ctx.options.threads;
  const u = uncertainty(study, quantifier, options);
  const out: Partial<Results> = {};
  if (u.results.length > 0) out.uncertainty = u.results;
  const outcomes = u.run ? outcomeUncertainty(u.run, ctx.results) : [];
  if (outcomes.length > 0) out.outcome_uncertainty = outcomes;
  const warnings: Results['warnings'] = [];
  for (const h of u.held) warnings.push(notSampledWarning(study, h));
  if (u.run && u.run.clippedTrials > 0) warnings.push(clippedWarning(study, u.run));
  if (warnings.length > 0) out.warnings = [...ctx.results.warnings, ...warnings];
  return out;
};

/**
 * The warning for trials in which a sampled probability came out above 1 and was set to 1: how many
 * trials, and which sampled probabilities can exceed 1 (their distribution reaches above 1), so the
 * reader knows the tail was cut and where to state a bounded distribution (beta, or a normal with max: 1).
 */
function clippedWarning(study: Study, run: MonteCarloRun): Results['warnings'][number] {
  const sampled = new Set(run.sampled);
  const able = study.parameters.filter(
    (p) => sampled.has(p.key) && p.quantity === 'probability' && p.uncertainty && p.uncertainty.kind !== 'fit' && sampleQuantile(p.uncertainty, LARGEST_UNIFORM) > 1,
  );
  const share = ((100 * run.clippedTrials) / run.samples).toPrecision(2);
  const which = able.length > 0 ? `: ${able.map((p) => `'${p.key}'`).join(', ')} can exceed 1` : '';
  const w: Results['warnings'][number] = {
    code: 'sampled-probability-clipped',
    message:
      `in ${run.clippedTrials.toLocaleString('en-US')} of ${run.samples.toLocaleString('en-US')} Monte Carlo trials (${share} %) a sampled probability was above 1 and was set to 1${which}; ` +
      'the upper tail of the uncertainty is cut there (a beta distribution, or a normal with max: 1, stays within 0 to 1)',
  };
  const first = able[0];
  if (first) w.at = { file: first.at.file, line: first.at.line };
  return w;
}

/** The largest uniform the generator gives (random.ts: 1 − 2^-53). */
const LARGEST_UNIFORM = 1 - 2 ** -53;
