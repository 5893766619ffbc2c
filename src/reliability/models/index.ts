/**
 * The failure models of a basic event (DESIGN.md "Models"), one entry point for the analysis:
 * `modelProbability(model, values, context)`. `values` holds the model's fields in canonical units
 * (years, per year, fractions), keyed by the study's field names (`rate`, `interval`,
 * `test_duration`, …). A missing required field is a programming error upstream (the study reader
 * checks them), so it throws; values outside their domain give NaN.
 */
import type { ModelKind } from '../../study/types.js';
import { fixedProbability, rateProbability, repairableUnavailability, switchProbability } from './simple.js';
import { demandProbability, testedUnavailability } from './tested.js';
import { weibullEventProbability } from './weibull.js';

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
  const need = (field: string): number => {
    const v = values[field];
    if (v === undefined) throw new Error(`model '${model}' needs '${field}'`);
    return v;
  };
  switch (model) {
    case 'fixed':
      return fixedProbability(need('probability'));
    case 'rate':
      return rateProbability(need('rate'), need('exposure'));
    case 'repairable':
      return repairableUnavailability(need('rate'), need('repair'));
    case 'tested':
      return testedUnavailability({
        rate: need('rate'),
        interval: need('interval'),
        testDuration: values['test_duration'],
        repair: values['repair'],
      });
    case 'demand':
      return demandProbability({ probability: need('probability'), rate: values['rate'], interval: values['interval'] });
    case 'weibull': {
      if (context.ageYears === undefined) throw new Error("model 'weibull' needs the age (context.ageYears)");
      return weibullEventProbability({
        shape: need('shape'),
        scale: need('scale'),
        location: values['location'],
        age: context.ageYears,
        exercise: values['exercise'],
        repair: values['repair'],
        basis: context.exerciseBasis,
      });
    }
    case 'switch':
      if (context.on === undefined) throw new Error("model 'switch' needs its state (context.on)");
      return switchProbability(context.on);
  }
}
