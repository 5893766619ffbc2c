/**
 * Basic-event probabilities for a case: each event's model fields looked up through the case
 * (scenario overrides, sampled values), its age moved to the case's year, then the failure model.
 */
import { modelProbability } from '../reliability/models/index.js';
import { StudyError } from '../study/errors.js';
import type { BasicEvent, Study } from '../study/types.js';
import { ageInCase, fieldValue, type Case } from './case.js';
import { commonCauseOf } from './common-cause.js';

/** Parameter value by key: the study's own, unless a sampler supplies another. */
export type ParameterValues = (key: string) => number;

const STUDY_VALUES = new WeakMap<Study, ParameterValues>();

/** The study's own parameter values; the lookup is built once per study. */
export function studyValues(study: Study): ParameterValues {
  let values = STUDY_VALUES.get(study);
  if (!values) {
    const byKey = new Map(study.parameters.map((p) => [p.key, p.value]));
    values = (key) => byKey.get(key)!;
    STUDY_VALUES.set(study, values);
  }
  return values;
}

const READERS = new WeakMap<Study, Map<string, number[]>>();

/** Events (by index) that read each override key: a parameter key, or an event's own `event.field`. */
function readersOf(study: Study): Map<string, number[]> {
  let readers = READERS.get(study);
  if (!readers) {
    readers = new Map();
    const add = (key: string, i: number) => readers!.set(key, [...(readers!.get(key) ?? []), i]);
    study.events.forEach((e, i) => {
      for (const [field, key] of Object.entries(e.fields)) {
        add(key, i);
        if (key !== `${e.id}.${field}`) add(`${e.id}.${field}`, i);
      }
    });
    READERS.set(study, readers);
  }
  return readers;
}

/**
 * The events a case can change when it differs from the base case only by parameter overrides;
 * undefined when it also moves time, renews or switches (then every event is evaluated again).
 */
function touchedBy(study: Study, c: Case): Set<number> | undefined {
  if (c.years !== 0 || c.renewals.size > 0 || c.switches.size > 0) return undefined;
  const readers = readersOf(study);
  const touched = new Set<number>();
  for (const key of c.overrides.keys()) for (const i of readers.get(key) ?? []) touched.add(i);
  return touched;
}

/**
 * A failure model gave no probability for the numbers it was handed: values that pass every domain
 * check can still be out of reach of double precision (a Weibull shape of 1e300). From the study's
 * own values this is an input problem; from a sensitivity point, a point that cannot be evaluated.
 */
export class EventProbabilityError extends Error {
  constructor(
    readonly event: BasicEvent,
    readonly value: number,
    readonly fields: Record<string, number>,
  ) {
    super(`event '${event.id}' (${event.model} model) gives no probability (${value}) from ${JSON.stringify(fields)}`);
    this.name = 'EventProbabilityError';
  }

  toStudyError(): StudyError {
    return new StudyError(this.message, this.event.at, 'parameter values within the range double-precision arithmetic can evaluate (check for extreme magnitudes)');
  }
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

/**
 * Event probabilities of a case. With `base` (the base case's evaluation, from the study's own
 * values), a case that only overrides parameters re-evaluates just the events that read them:
 * one-at-a-time sensitivity of a large study touches a handful of events per point, not all.
 */
export function evaluateEvents(study: Study, c: Case, values?: ParameterValues, base?: EventEvaluation): EventEvaluation {
  const touched = base && values === undefined ? touchedBy(study, c) : undefined;
  const lookup = values ?? studyValues(study);
  const n = study.events.length;
  const probability = touched ? Float64Array.from(base!.total) : new Float64Array(n);
  const used: Record<string, number>[] = touched ? [...base!.used] : [];
  const ages: (number | undefined)[] = touched ? [...base!.ages] : [];
  // With `touched`, only those events are evaluated again (one-at-a-time sensitivity of a large
  // study touches one or a few per point; walking all of them per point was quadratic).
  const indices: Iterable<number> = touched ? [...touched].sort((a, b) => a - b) : study.events.keys();
  for (const i of indices) {
    const one = evaluateEvent(study, i, c, lookup);
    probability[i] = one.probability;
    used[i] = one.fields;
    ages[i] = one.age;
  }
  const expanded = commonCauseOf(study).apply(probability, (key) => c.overrides.get(key) ?? lookup(key));
  return { probability: expanded, total: probability, used, ages };
}

/** One event's model probability in a case, with the field values and age it used. */
export function evaluateEvent(study: Study, i: number, c: Case, lookup: ParameterValues = studyValues(study)): { probability: number; fields: Record<string, number>; age: number | undefined } {
  const e = study.events[i]!;
  const fields: Record<string, number> = {};
  for (const field of Object.keys(e.fields)) fields[field] = fieldValue(e, field, c, lookup)!;
  const age = ageInCase(study, e, c);
  const on = c.switches.get(e.id) ?? e.on;
  const q = modelProbability(e.model, fields, {
    ...(age !== undefined ? { ageYears: age } : {}),
    exerciseBasis: study.settings.exercise_basis,
    ...(on !== undefined ? { on } : {}),
  });
  if (!(q >= 0 && q <= 1)) throw new EventProbabilityError(e, q, fields);
  return { probability: q, fields, age };
}

/** Indices of the events that read an override key (a parameter key, or an event's own `event.field`). */
export function eventsReading(study: Study, key: string): readonly number[] {
  return readersOf(study).get(key) ?? [];
}
