/**
 * Uncertainty analysis: Monte Carlo (or Latin hypercube) propagation of the parameters' stated
 * uncertainty to the top-event probabilities (NUREG/CR-6823 §6.3; NUREG-0492 ch. XI on propagating
 * distributions through a fault tree). Each trial draws every uncertain parameter once
 * (`ParameterSampler`), evaluates the events of the base case through a prepared plan
 * (`EventPlan`) and the tops through the prepared diagram pass, all without re-reading or
 * re-building anything. Seeded by settings.seed: the same study gives the same numbers.
 */
import { notSampledWarning } from './input-warnings.js';
import { flattenDiagram } from '../logic/flat-diagram.js';
import type { Study } from '../study/types.js';
import type { Stage } from './analyze.js';
import { baseCase } from './case.js';
import { CaseQuantifier } from './case-quantifier.js';
import { commonCauseOf } from './common-cause.js';
import { parametersSampled } from './event-plan.js';
import { derivedRecipe, sectionValue, type DerivedRecipe } from './outcome-quantities.js';
import type { QuantityUncertainty, Results, UncertaintyResult } from './results.js';
import { ParameterSampler } from './sampling.js';
import { meanAndSd, quantileSorted, sortedCopy, summarize } from './statistics.js';
import { runTrials, type TrialJob } from './trials.js';

export interface UncertaintyOptions {
  progress?: (label: string, done: number, total: number) => void;
  /** Overrides settings.samples (the benchmark). */
  samples?: number;
  /** Trials per diagram pass (trials.ts); no number depends on it. */
  batch?: number;
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
}

/** Runs the trials; undefined when no parameter states a samplable uncertainty or samples is 0. */
export function monteCarlo(study: Study, quantifier: CaseQuantifier, options: UncertaintyOptions = {}): MonteCarloRun | undefined {
  const samples = options.samples ?? study.settings.samples;
  const sampler = new ParameterSampler(study, parametersSampled(study));
  if (sampler.varying.size === 0 || !(samples > 0)) return undefined;
  const { compiled } = quantifier.diagram(baseCase());
  const topRoots = quantifier.model.topGates.map((g) => compiled.gateRoots[g]!);
  const derived = options.outcomes === false ? undefined : derivedRecipe(study, quantifier.model, compiled);
  // The diagram's variables: the events, then the common-cause expansion's shared events (common-cause.ts).
  const variables = commonCauseOf(study).variableCount;
  const job: TrialJob = {
    study,
    diagram: flattenDiagram(compiled.manager, [...topRoots, ...(derived?.roots ?? [])], variables),
    topCount: topRoots.length,
    samples,
  };
  if (derived) job.recipe = derived.recipe;
  const method = study.settings.sampling;
  const label = method === 'latin-hypercube' ? 'Latin hypercube' : 'Monte Carlo';
  let reported = 0;
  const block = runTrials(job, 0, samples, {
    ...(options.batch !== undefined ? { batch: options.batch } : {}),
    onBatch: (done) => {
      if (!options.progress) return;
      while (reported + PROGRESS_EVERY <= done) {
        reported += PROGRESS_EVERY;
        options.progress(label, reported, samples);
      }
    },
  });
  options.progress?.(label, samples, samples);
  const run: MonteCarloRun = {
    values: block.tops,
    derived: block.derived,
    samples,
    method,
    sampled: [...sampler.varying].sort((a, b) => a - b).map((i) => study.parameters[i]!.key),
    held: sampler.held,
    clippedTrials: block.clippedTrials,
  };
  if (derived) run.recipe = derived.recipe;
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
  const u = uncertainty(study, quantifier, ctx.options.progress ? { progress: ctx.options.progress } : {});
  const out: Partial<Results> = {};
  if (u.results.length > 0) out.uncertainty = u.results;
  const outcomes = u.run ? outcomeUncertainty(u.run, ctx.results) : [];
  if (outcomes.length > 0) out.outcome_uncertainty = outcomes;
  if (u.held.length > 0) {
    out.warnings = [...ctx.results.warnings, ...u.held.map((h) => notSampledWarning(study, h))];
  }
  return out;
};
