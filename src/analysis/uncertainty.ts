/**
 * Uncertainty analysis: Monte Carlo (or Latin hypercube) propagation of the parameters' stated
 * uncertainty to the top-event probabilities (NUREG/CR-6823 §6.3; NUREG-0492 ch. XI on propagating
 * distributions through a fault tree). Each trial draws every uncertain parameter once
 * (`ParameterSampler`), evaluates the events of the base case through a prepared plan
 * (`EventPlan`) and the tops through the prepared diagram pass, all without re-reading or
 * re-building anything. Seeded by settings.seed: the same study gives the same numbers.
 */
import type { Study } from '../study/types.js';
import { baseCase } from './case.js';
import type { CaseQuantifier } from './case-quantifier.js';
import { commonCauseOf } from './common-cause.js';
import { EventPlan, parametersRead } from './event-plan.js';
import type { UncertaintyResult } from './results.js';
import { ParameterSampler, uniformRows } from './sampling.js';
import { summarize } from './statistics.js';

export interface UncertaintyOptions {
  progress?: (label: string, done: number, total: number) => void;
  /** Overrides settings.samples (the benchmark). */
  samples?: number;
}

/** Trials between progress reports. */
const PROGRESS_EVERY = 1000;

/** The raw trial values, top by top, with the sampler's bookkeeping. */
export interface MonteCarloRun {
  /** values[t] = that top's probability in each trial. */
  values: Float64Array[];
  samples: number;
  method: 'monte-carlo' | 'latin-hypercube';
  sampled: string[];
  held: { key: string; reason: string }[];
  clippedTrials: number;
}

/** Runs the trials; undefined when no parameter states a samplable uncertainty or samples is 0. */
export function monteCarlo(study: Study, quantifier: CaseQuantifier, options: UncertaintyOptions = {}): MonteCarloRun | undefined {
  const samples = options.samples ?? study.settings.samples;
  const sampler = new ParameterSampler(study, parametersRead(study));
  if (sampler.varying.size === 0 || !(samples > 0)) return undefined;
  const c = baseCase();
  const plan = new EventPlan(study, c, sampler.varying);
  const { evaluator } = quantifier.diagram(c);
  const method = study.settings.sampling;
  const rows = uniformRows(study.settings.seed, method, samples, sampler.dimensions);
  const uniforms = new Float64Array(sampler.dimensions);
  const parameterValues = Float64Array.from(study.parameters, (p) => p.value);
  const eventProbability = new Float64Array(study.events.length);
  // The diagram's variables: the events, then the common-cause expansion's shared events (common-cause.ts).
  const expansion = commonCauseOf(study);
  const parameterIndex = new Map(study.parameters.map((p, i) => [p.key, i]));
  const variableProbability = new Float64Array(expansion.variableCount);
  const valueOf = (key: string): number => parameterValues[parameterIndex.get(key)!]!;
  const values = study.tops.map(() => new Float64Array(samples));
  const label = method === 'latin-hypercube' ? 'Latin hypercube' : 'Monte Carlo';
  for (let t = 0; t < samples; t++) {
    rows.row(t, uniforms);
    sampler.apply(uniforms, parameterValues, t);
    plan.evaluate(parameterValues, eventProbability);
    expansion.apply(eventProbability, valueOf, variableProbability);
    const tops = evaluator.evaluate(variableProbability);
    for (let k = 0; k < tops.length; k++) values[k]![t] = tops[k]!;
    if (options.progress && (t + 1) % PROGRESS_EVERY === 0) options.progress(label, t + 1, samples);
  }
  options.progress?.(label, samples, samples);
  return {
    values,
    samples,
    method,
    sampled: [...sampler.varying].sort((a, b) => a - b).map((i) => study.parameters[i]!.key),
    held: sampler.held,
    clippedTrials: sampler.clippedTrials,
  };
}

export function uncertainty(
  study: Study,
  quantifier: CaseQuantifier,
  options: UncertaintyOptions = {},
): { results: UncertaintyResult[]; held: { key: string; reason: string }[] } {
  const run = monteCarlo(study, quantifier, options);
  if (!run) return { results: [], held: new ParameterSampler(study, parametersRead(study)).held };
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
  return { results, held: run.held };
}
