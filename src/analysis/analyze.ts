/**
 * The analysis stage: Study in, Results out. The point estimate comes first; each further analysis
 * (a "stage") reads the shared context and adds its own section to the results. A stage whose inputs
 * the study does not provide adds nothing. Pure apart from the optional progress callback.
 */
import type { Study } from '../study/types.js';
import type { CompiledLogic } from '../logic/index.js';
import { baseCase } from './case.js';
import { driversStage } from './drivers-stage.js';
import { evaluateEvents, EventProbabilityError, type EventEvaluation } from './event-probability.js';
import { fitsStage } from './fits.js';
import { buildLogicModel, type LogicModel } from './logic-model.js';
import { boundTops, boundWarning, cappedWarnings, compileBaseCase, quantifyTops } from './quantify.js';
import { describeStudy } from './results-parts.js';
import { sharedCauseStage } from './shared-cause-stage.js';
import { uncertaintyStage } from './uncertainty.js';
import { capWarnings } from './input-warnings.js';
import { extrapolation } from '../study/fits.js';
import type { EventResult, Results } from './results.js';

export interface AnalyzeOptions {
  /** Called now and then during long analyses (Monte Carlo): what, how far, out of how many. */
  progress?: (label: string, done: number, total: number) => void;
  /** Threads for the Monte Carlo trials (default 1: this thread only); the numbers never depend on it. */
  threads?: number;
}

/** What every stage may read: the study, its logic, the compiled base case and its numbers. */
export interface AnalysisContext {
  study: Study;
  model: LogicModel;
  compiled: CompiledLogic;
  base: EventEvaluation;
  results: Results;
  options: AnalyzeOptions;
}

/** A further analysis: reads the context, returns the results sections it fills. */
export type Stage = (ctx: AnalysisContext) => Partial<Results>;

/** The stages, in the order they run; later issues add theirs here. */
const STAGES: Stage[] = [fitsStage, driversStage, sharedCauseStage, uncertaintyStage];

export function analyze(study: Study, options: AnalyzeOptions = {}): Results {
  const model = buildLogicModel(study);
  const base = baseCase();
  const evaluation = asInputError(() => evaluateEvents(study, base));
  // Undefined when the diagram outgrew max_nodes and the study allows cut-set bounds instead.
  const compiled = compileBaseCase(study, model, base.switches);
  const tops = compiled ? quantifyTops(study, model, compiled, evaluation.probability) : boundTops(study, model, base.switches, evaluation.probability);
  const parts = describeStudy(study);
  const results: Results = {
    format: parts.format,
    tool: parts.tool,
    study: parts.study,
    inputs: parts.inputs,
    settings: parts.settings,
    logic: parts.logic,
    sources: parts.sources,
    assumptions: parts.assumptions,
    events: eventResults(study, evaluation),
    parameters: parts.parameters,
    tops,
    warnings: [...parts.warnings, ...capWarnings(study, evaluation), ...cappedWarnings(tops)],
  };
  if (!compiled) {
    // Every further stage re-evaluates the diagram; without one the results stop at the bounds.
    results.warnings.push(boundWarning(study));
    return results;
  }
  const ctx: AnalysisContext = { study, model, compiled, base: evaluation, results, options };
  for (const stage of STAGES) Object.assign(results, asInputError(() => stage(ctx)));
  return results;
}

/** A model that cannot evaluate the study's numbers (its own, or ones it samples) is an input error. */
function asInputError<T>(fn: () => T): T {
  try {
    return fn();
  } catch (err) {
    if (err instanceof EventProbabilityError) throw err.toStudyError();
    throw err;
  }
}

function eventResults(study: Study, evaluation: EventEvaluation): EventResult[] {
  return study.events.map((e, i) => {
    const r: EventResult = {
      id: e.id,
      title: e.title,
      model: e.model,
      probability: evaluation.probability[i]!,
      parameters: evaluation.used[i]!,
      parameter_keys: { ...e.fields },
      assumptions: e.assumptions,
    };
    if (e.class) r.class = e.class;
    const age = evaluation.ages[i];
    if (age !== undefined) r.age_years = age;
    if (e.installed) r.installed = e.installed;
    if (e.renewed) r.renewed = e.renewed;
    if (e.on !== undefined) r.on = e.on;
    const x = extrapolation(study, e);
    if (x) r.extrapolated = x;
    return r;
  });
}
