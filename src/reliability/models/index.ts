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
  const fields = Object.keys(values);
  return prepareModel(model, fields, context)(fields.map((f) => values[f]!));
}

/**
 * `modelProbability` prepared for one model, one list of field names and one context, as a function
 * of the fields' values in that order (`values[k]` is field `fields[k]`): the field lookups and the
 * checks of what is required are done here once, and each evaluation is one positional call. The
 * Monte Carlo evaluates an event this way in every trial; modelProbability is the same path, once.
 */
export function prepareModel(model: ModelKind, fields: readonly string[], context: ModelContext = {}): (values: ArrayLike<number>) => number {
  const at = (field: string): number => fields.indexOf(field);
  const need = (field: string): number => {
    const k = at(field);
    if (k < 0) throw new Error(`model '${model}' needs '${field}'`);
    return k;
  };
  const optional = (v: ArrayLike<number>, k: number): number | undefined => (k < 0 ? undefined : v[k]);
  switch (model) {
    case 'fixed': {
      const p = need('probability');
      return (v) => fixedProbability(v[p]!);
    }
    case 'rate': {
      const rate = need('rate');
      const exposure = need('exposure');
      return (v) => rateProbability(v[rate]!, v[exposure]!);
    }
    case 'repairable': {
      const rate = need('rate');
      const repair = need('repair');
      return (v) => repairableUnavailability(v[rate]!, v[repair]!);
    }
    case 'tested': {
      const rate = need('rate');
      const interval = need('interval');
      const test = at('test_duration');
      const repair = at('repair');
      return (v) => testedUnavailabilityOf(v[rate]!, v[interval]!, optional(v, test), optional(v, repair));
    }
    case 'demand': {
      const p = need('probability');
      const rate = at('rate');
      const interval = at('interval');
      return (v) => demandProbabilityOf(v[p]!, optional(v, rate), optional(v, interval));
    }
    case 'weibull': {
      if (context.ageYears === undefined) throw new Error("model 'weibull' needs the age (context.ageYears)");
      const age = context.ageYears;
      const basis = context.exerciseBasis ?? 'end';
      const shape = need('shape');
      const scale = need('scale');
      const location = at('location');
      const exercise = at('exercise');
      const repair = at('repair');
      return (v) => weibullEventProbabilityOf(v[shape]!, v[scale]!, location < 0 ? 0 : v[location]!, age, optional(v, exercise), optional(v, repair), basis);
    }
    case 'switch': {
      if (context.on === undefined) throw new Error("model 'switch' needs its state (context.on)");
      const on = context.on;
      return () => switchProbability(on);
    }
  }
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
