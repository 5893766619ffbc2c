/**
 * The failure models of a basic event (DESIGN.md "Models"), one entry point for the analysis:
 * `modelProbability(model, values, context)`. `values` holds the model's fields in canonical units
 * (years, per year, fractions), keyed by the study's field names (`rate`, `interval`,
 * `test_duration`, …). A missing required field is a programming error upstream (the study reader
 * checks them), so it throws; values outside their domain give NaN.
 */
import type { ModelKind } from '../../study/types.js';
import { fixedProbability, rateProbability, repairableUnavailability, switchProbability } from './simple.js';
import { demandProbabilityOf, hiddenFailureFraction, testedUnavailabilityOf } from './tested.js';
import { weibullConditionalFailure, weibullEventProbabilityOf, weibullHazard } from './weibull.js';

export * from './simple.js';
export * from './tested.js';
export * from './weibull.js';

export interface ModelContext {
  /** Weibull: age at the date of interest, years. */
  ageYears?: number;
  /** Weibull with `exercise`: end-of-interval (default) or interval-average probability. */
  exerciseBasis?: 'end' | 'average';
  /** Switch: the state. */
  on?: boolean;
}

export function modelProbability(
  model: ModelKind,
  values: Readonly<Record<string, number>>,
  context: ModelContext = {},
): number {
  // Positional calls and no closure: this runs for every event of every Monte Carlo trial.
  switch (model) {
    case 'fixed':
      return fixedProbability(required(model, values, 'probability'));
    case 'rate':
      return rateProbability(required(model, values, 'rate'), required(model, values, 'exposure'));
    case 'repairable':
      return repairableUnavailability(required(model, values, 'rate'), required(model, values, 'repair'));
    case 'tested':
      return testedUnavailabilityOf(required(model, values, 'rate'), required(model, values, 'interval'), values['test_duration'], values['repair']);
    case 'demand':
      return demandProbabilityOf(required(model, values, 'probability'), values['rate'], values['interval']);
    case 'weibull': {
      if (context.ageYears === undefined) throw new Error("model 'weibull' needs the age (context.ageYears)");
      return weibullEventProbabilityOf(
        required(model, values, 'shape'),
        required(model, values, 'scale'),
        values['location'] ?? 0,
        context.ageYears,
        values['exercise'],
        values['repair'],
        context.exerciseBasis ?? 'end',
      );
    }
    case 'switch':
      if (context.on === undefined) throw new Error("model 'switch' needs its state (context.on)");
      return switchProbability(context.on);
  }
}

/** A model's required field; its absence is a programming error upstream (the reader checks fields). */
function required(model: ModelKind, values: Readonly<Record<string, number>>, field: string): number {
  const v = values[field];
  if (v === undefined) throw new Error(`model '${model}' needs '${field}'`);
  return v;
}

/**
 * Why a model's value was capped or is degenerate, in words; undefined when it was not. The models
 * keep a probability within [0, 1] by capping, and a value capped at 1 looks like a result; the
 * analysis turns each note into a `probability-capped` warning so the cap is never silent.
 */
export function modelCapNote(model: ModelKind, values: Readonly<Record<string, number>>, context: ModelContext = {}): string | undefined {
  if (model === 'tested') {
    const rate = values['rate']!;
    const interval = values['interval']!;
    const x = rate * interval;
    const test = values['test_duration'] ?? 0;
    const repair = values['repair'] ?? 0;
    const sum = hiddenFailureFraction(x) + test / interval + (-Math.expm1(-x) * repair) / interval;
    if (!(sum > 1)) return undefined;
    if (test >= interval) return `the test lasts as long as its interval or longer (test_duration ≥ interval), so the unavailability is 1`;
    return `the unavailability terms add up to ${Number(sum.toPrecision(4))}, above 1; the probability is capped at 1`;
  }
  if (model === 'weibull' && values['repair'] !== undefined && values['repair'] > 0) {
    const age = context.ageYears ?? 0;
    const shape = values['shape']!;
    const scale = values['scale']!;
    const location = values['location'] ?? 0;
    const exercise = values['exercise'];
    if (exercise === undefined || exercise === 0) {
      if (weibullHazard(age, shape, scale, location) === Infinity) {
        return `at age ${age === 0 ? '0' : Number(age.toPrecision(4))} a shape below 1 has an infinite hazard, so the repaired form gives probability exactly 1 (it falls quickly with age)`;
      }
      return undefined;
    }
    const found = weibullConditionalFailure(age, exercise, shape, scale, location) / exercise;
    if (found * values['repair'] > 1) return `the repair term (failures found per unit time × repair time = ${Number((found * values['repair']).toPrecision(4))}) is above 1 and is capped at 1`;
  }
  return undefined;
}
