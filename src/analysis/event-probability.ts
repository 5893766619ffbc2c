/**
 * Basic-event probabilities for a case: each event's model fields looked up through the case
 * (scenario overrides, sampled values), its age moved to the case's year, then the failure model.
 */
import { modelProbability } from '../reliability/models/index.js';
import type { Study } from '../study/types.js';
import { ageInCase, fieldValue, type Case } from './case.js';
import { commonCauseOf } from './common-cause.js';

/** Parameter value by key: the study's own, unless a sampler supplies another. */
export type ParameterValues = (key: string) => number;

export function studyValues(study: Study): ParameterValues {
  const byKey = new Map(study.parameters.map((p) => [p.key, p.value]));
  return (key) => byKey.get(key)!;
}

export interface EventEvaluation {
  /**
   * One entry per variable of the logic model, the vector the decision diagrams take: the study's
   * events in study order, then the common-cause expansion's shared events (common-cause.ts). A
   * common-cause member's entry is its independent part; without groups this equals `total`.
   */
  probability: Float64Array;
  /** Each study event's own model probability (a common-cause member's total Q_t), study order. */
  total: Float64Array;
  /** Field values each event used, for the report. */
  used: Record<string, number>[];
  ages: (number | undefined)[];
}

export function evaluateEvents(study: Study, c: Case, values: ParameterValues = studyValues(study)): EventEvaluation {
  const n = study.events.length;
  const probability = new Float64Array(n);
  const used: Record<string, number>[] = [];
  const ages: (number | undefined)[] = [];
  study.events.forEach((e, i) => {
    const fields: Record<string, number> = {};
    for (const field of Object.keys(e.fields)) fields[field] = fieldValue(e, field, c, values)!;
    const age = ageInCase(study, e, c);
    const on = c.switches.get(e.id) ?? e.on;
    const q = modelProbability(e.model, fields, {
      ...(age !== undefined ? { ageYears: age } : {}),
      exerciseBasis: study.settings.exercise_basis,
      ...(on !== undefined ? { on } : {}),
    });
    if (!(q >= 0 && q <= 1)) {
      throw new Error(`event '${e.id}' (${e.model}) gave probability ${q} from ${JSON.stringify(fields)}`);
    }
    probability[i] = q;
    used.push(fields);
    ages.push(age);
  });
  const expanded = commonCauseOf(study).apply(probability, (key) => c.overrides.get(key) ?? values(key));
  return { probability: expanded, total: probability, used, ages };
}
