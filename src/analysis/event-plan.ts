/**
 * `evaluateEvents` prepared for one case and many parameter vectors (Monte Carlo trials): every
 * lookup that does not change between trials — which parameter feeds which field through the
 * case's overrides (`fieldValue`), each event's age (`ageInCase`), switch states — is resolved once,
 * and each trial only copies the varying parameters into the model's field values and calls the
 * model prepared for them (`prepareModel`, the path `modelProbability` itself takes). Two further
 * savings, neither of which changes a number:
 *  - events that read no varying parameter are computed once;
 *  - events with the same model, the same parameter sources, the same age and state (the gates'
 *    identical components of one class) are computed once per trial and the value shared.
 * It gives each study event's own probability (`EventEvaluation.total`); the common-cause
 * expansion to the logic model's variables is applied after it, as in `evaluateEvents`. The test
 * suite holds it equal to `evaluateEvents` value for value.
 */
import { modelProbability, prepareModel, type ModelContext } from '../reliability/models/index.js';
import type { BasicEvent, Study } from '../study/types.js';
import { ageInCase, fieldValue, type Case } from './case.js';
import { EventProbabilityError } from './event-probability.js';

interface Group {
  /** The model prepared for the group's fields and context (`prepareModel`). */
  probability: (values: ArrayLike<number>) => number;
  /** Field names, and their values in that order, rewritten in place each trial (no allocation). */
  names: string[];
  args: Float64Array;
  /** Fields fed by a varying parameter: position in `args` and parameter index. */
  varyingAt: Int32Array;
  varyingSources: Int32Array;
  /** Events (indices) that share this group's probability. */
  events: Int32Array;
  /** The first event of the group, for messages. */
  event: BasicEvent;
}

export class EventPlan {
  /** Probabilities of the events that read no varying parameter, and the starting point of `out`. */
  private readonly fixedProbability: Float64Array;
  private readonly groups: Group[] = [];

  /**
   * @param varying parameter indices (into study.parameters) whose values change between trials;
   *                every other parameter keeps the study's value (or the case's override).
   */
  constructor(study: Study, c: Case, varying: ReadonlySet<number>) {
    const index = new Map(study.parameters.map((p, i) => [p.key, i]));
    const value = (key: string): number => study.parameters[index.get(key)!]!.value;
    const n = study.events.length;
    this.fixedProbability = new Float64Array(n);
    const bySignature = new Map<string, { group: Group; events: number[] }>();
    study.events.forEach((e, i) => {
      const fields: Record<string, number> = {};
      const varyingFields: string[] = [];
      const varyingSources: number[] = [];
      let signature = `${e.model}`;
      for (const field of Object.keys(e.fields)) {
        let readKey: string | undefined;
        const v = fieldValue(e, field, c, (key) => {
          readKey = key;
          return value(key);
        })!;
        const source = readKey === undefined ? undefined : index.get(readKey);
        if (source !== undefined && varying.has(source)) {
          varyingFields.push(field);
          varyingSources.push(source);
          signature += `|${field}=p${source}`;
        } else {
          signature += `|${field}=${v}`;
        }
        fields[field] = v;
      }
      const age = ageInCase(study, e, c);
      const on = c.switches.get(e.id) ?? e.on;
      const context: ModelContext = { exerciseBasis: study.settings.exercise_basis };
      if (age !== undefined) context.ageYears = age;
      if (on !== undefined) context.on = on;
      if (varyingFields.length === 0) {
        this.fixedProbability[i] = checked(e, modelProbability(e.model, fields, context), fields);
        return;
      }
      signature += `|age=${age}|on=${on}`;
      const found = bySignature.get(signature);
      if (found) {
        found.events.push(i);
        return;
      }
      const names = Object.keys(fields);
      bySignature.set(signature, {
        group: {
          probability: prepareModel(e.model, names, context),
          names,
          args: Float64Array.from(names, (f) => fields[f]!),
          varyingAt: Int32Array.from(varyingFields, (f) => names.indexOf(f)),
          varyingSources: Int32Array.from(varyingSources),
          events: new Int32Array(0),
          event: e,
        },
        events: [i],
      });
    });
    for (const { group, events } of bySignature.values()) {
      group.events = Int32Array.from(events);
      this.groups.push(group);
    }
  }

  /** Events that are recomputed per trial (after sharing), for the benchmark's figures. */
  get groupCount(): number {
    return this.groups.length;
  }

  /**
   * Each study event's own probability (study order, before any common-cause expansion) for one vector of parameter values (indexed like
   * study.parameters; only the varying entries are read), written into `out`.
   */
  evaluate(values: ArrayLike<number>, out: Float64Array): Float64Array {
    out.set(this.fixedProbability);
    const groups = this.groups;
    for (let g = 0; g < groups.length; g++) {
      const group = groups[g]!;
      const args = group.args;
      const at = group.varyingAt;
      const sources = group.varyingSources;
      for (let k = 0; k < at.length; k++) args[at[k]!] = values[sources[k]!]!;
      const q = group.probability(args);
      if (!(q >= 0 && q <= 1)) throw new EventProbabilityError(group.event, q, Object.fromEntries(group.names.map((f, k) => [f, args[k]!])));
      const ev = group.events;
      for (let k = 0; k < ev.length; k++) out[ev[k]!] = q;
    }
    return out;
  }
}

/** The same check, and the same error, as evaluateEvents. */
function checked(event: BasicEvent, q: number, fields: Record<string, number>): number {
  if (!(q >= 0 && q <= 1)) throw new EventProbabilityError(event, q, { ...fields });
  return q;
}

/** Keys of the parameters some basic event reads through its fields (the others cannot move a probability). */
export function parametersRead(study: Study): Set<string> {
  const read = new Set<string>();
  for (const e of study.events) for (const key of Object.values(e.fields)) read.add(key);
  // Common-cause parameters (beta, …) move the expansion's probabilities (common-cause.ts).
  for (const g of study.commonCause) for (const key of Object.values(g.fields)) read.add(key);
  return read;
}

/**
 * The keys of `parametersRead` and those an event tree or a failure-mode set reads: its load
 * ranges, plain branch numbers and the modes' own numbers move the sequences, outcomes and
 * combined modes (outcome-quantities.ts), so the Monte Carlo samples them too.
 */
export function parametersSampled(study: Study): Set<string> {
  const read = parametersRead(study);
  for (const t of study.eventTrees ?? []) {
    for (const r of t.load.ranges) for (const key of r.aep ?? [r.frequency!]) read.add(key);
    for (const h of t.headings) {
      if (h.fails.kind === 'probability') read.add(h.fails.key);
      if (h.fails.kind === 'by-range') for (const key of h.fails.keys) read.add(key);
    }
  }
  for (const set of study.failureModes ?? []) {
    for (const m of set.modes) {
      if (m.basis.kind === 'probability') read.add(m.basis.key);
      if (m.basis.kind === 'by-range') for (const key of m.basis.keys) read.add(key);
    }
  }
  return read;
}
