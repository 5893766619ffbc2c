/**
 * Applying changes of NEW to OLD one at a time, to see what each does to the answer.
 *
 * A change that can be applied alone ("a unit") is one of: a parameter whose value changed; a
 * basic event redefined (model, class, which parameters it uses, its dates, a switch state); a gate
 * re-wired or redefined; a top event moved to another gate; a common-cause group changed or added;
 * a setting; the snapshot date. When a re-wired gate (or a redefined event) needs nodes or numbers
 * that OLD does not have, they are brought in from NEW with it; everything OLD already has keeps
 * OLD's definition, so the unit shows that change and no other. Removed gates and events are not
 * units of their own: they drop out through the re-wiring of their parents.
 *
 * Pure: studies in, a new study out (OLD is never modified).
 */
import { yearsBetween } from '../reliability/units.js';
import type { BasicEvent, Study } from '../study/types.js';
import type { StudyDiff } from './study-diff.js';

export type Unit =
  | { kind: 'parameter'; key: string }
  | { kind: 'event'; id: string }
  | { kind: 'gate'; id: string }
  | { kind: 'top'; id: string }
  | { kind: 'common-cause'; id: string }
  | { kind: 'setting'; name: string }
  | { kind: 'as_of' };

/** A stable id for a unit, used in comparison.json and the report. */
export function unitId(u: Unit): string {
  switch (u.kind) {
    case 'parameter':
      return `parameter:${u.key}`;
    case 'setting':
      return `setting:${u.name}`;
    case 'as_of':
      return 'as_of';
    default:
      return `${u.kind}:${u.id}`;
  }
}

/** Settings that cannot change any probability of the point estimate (they steer other analyses or only list cut sets). */
const SETTINGS_WITHOUT_POINT_EFFECT = new Set(['samples', 'seed', 'horizon', 'sensitivity_factor', 'sampling']);

/**
 * The units of a diff, in report order: parameters, events, gates, tops, common cause, settings,
 * snapshot date. Changes that move no number (titles, sources, notes, uncertainty alone) are not
 * units: they cannot move the point estimate.
 */
export function unitsOf(diff: StudyDiff): Unit[] {
  const units: Unit[] = [];
  for (const p of diff.data.parameters.changed) if (p.aspects.includes('value')) units.push({ kind: 'parameter', key: p.key });
  for (const e of diff.logic.events.changed) if (e.aspects.some((a) => a !== 'title' && a !== 'assumptions')) units.push({ kind: 'event', id: e.id });
  for (const g of diff.logic.gates.changed) if (!g.reordered_only && g.aspects.some((a) => a !== 'title')) units.push({ kind: 'gate', id: g.id });
  for (const t of diff.logic.tops.changed) if (t.aspects.includes('gate')) units.push({ kind: 'top', id: t.id });
  for (const c of diff.logic.common_cause.changed) if (c.aspects.some((a) => a !== 'title')) units.push({ kind: 'common-cause', id: c.id });
  for (const c of diff.logic.common_cause.added) units.push({ kind: 'common-cause', id: c.id });
  for (const c of diff.logic.common_cause.removed) units.push({ kind: 'common-cause', id: c.id });
  for (const s of diff.data.settings) if (!SETTINGS_WITHOUT_POINT_EFFECT.has(s.name)) units.push({ kind: 'setting', name: s.name });
  if (diff.meta.some((m) => m.field === 'as_of' && m.changed)) units.push({ kind: 'as_of' });
  return units;
}

/** OLD with the given units of NEW applied. */
export function applyUnits(oldStudy: Study, newStudy: Study, units: Unit[]): Study {
  const s: Study = {
    ...oldStudy,
    meta: { ...oldStudy.meta },
    settings: { ...oldStudy.settings },
    tops: [...oldStudy.tops],
    gates: [...oldStudy.gates],
    events: [...oldStudy.events],
    parameters: [...oldStudy.parameters],
    commonCause: [...oldStudy.commonCause],
  };
  // Look-ups by id, both sides: a study of thousands of events with hundreds of changed ones
  // would otherwise search the arrays once per change (quadratic).
  const fromNew = byId(newStudy);
  const pull = makePuller(s, fromNew);
  // The snapshot date first, so events brought in later take their age at the date in force.
  if (units.some((u) => u.kind === 'as_of')) s.meta.as_of = newStudy.meta.as_of;
  for (const u of units) {
    switch (u.kind) {
      case 'parameter': {
        const np = fromNew.parameters.get(u.key);
        const i = pull.at.parameters.get(u.key);
        if (np && i !== undefined) s.parameters[i] = np;
        break;
      }
      case 'event': {
        const ne = fromNew.events.get(u.id);
        const i = pull.at.events.get(u.id);
        if (ne && i !== undefined) {
          s.events[i] = ne;
          pull.parametersOf(ne);
        }
        break;
      }
      case 'gate': {
        const ng = fromNew.gates.get(u.id);
        const i = pull.at.gates.get(u.id);
        if (ng && i !== undefined) {
          s.gates[i] = ng;
          for (const input of ng.inputs) pull.node(input);
        }
        break;
      }
      case 'top': {
        const nt = newStudy.tops.find((t) => t.id === u.id);
        const i = s.tops.findIndex((t) => t.id === u.id);
        if (nt && i >= 0) {
          s.tops[i] = nt;
          pull.node(nt.gate);
        }
        break;
      }
      case 'common-cause': {
        const ng = newStudy.commonCause.find((g) => g.id === u.id);
        const i = s.commonCause.findIndex((g) => g.id === u.id);
        if (!ng) {
          if (i >= 0) s.commonCause.splice(i, 1);
          break;
        }
        if (i >= 0) s.commonCause[i] = ng;
        else s.commonCause.push(ng);
        for (const key of Object.values(ng.fields)) pull.parameter(key);
        break;
      }
      case 'setting':
        (s.settings as unknown as Record<string, unknown>)[u.name] = newStudy.settings[u.name as keyof Study['settings']];
        break;
      case 'as_of':
        break;
    }
  }
  // Ages follow the snapshot date in force and each event's own dates.
  s.events = s.events.map((e) => withAge(e, s.meta.as_of));
  return s;
}

function withAge(e: BasicEvent, asOf: string): BasicEvent {
  if (e.ageYears === undefined) return e;
  const since = e.renewed ?? e.installed;
  if (!since) return e;
  const age = yearsBetween(since, asOf);
  return age === e.ageYears ? e : { ...e, ageYears: age };
}

/** A study's gates, events and parameters by id (key). */
function byId(study: Study) {
  return {
    gates: new Map(study.gates.map((g) => [g.id, g])),
    events: new Map(study.events.map((e) => [e.id, e])),
    parameters: new Map(study.parameters.map((p) => [p.key, p])),
  };
}

/**
 * Bringing nodes and numbers that OLD lacks in from NEW (never replacing what OLD has). `at` holds
 * the position of every gate, event and parameter of the study being built, kept up to date as
 * they are brought in.
 */
function makePuller(s: Study, fromNew: ReturnType<typeof byId>) {
  const at = {
    gates: new Map(s.gates.map((g, i) => [g.id, i])),
    events: new Map(s.events.map((e, i) => [e.id, i])),
    parameters: new Map(s.parameters.map((p, i) => [p.key, i])),
  };
  const parameter = (key: string) => {
    if (at.parameters.has(key)) return;
    const np = fromNew.parameters.get(key);
    if (np) at.parameters.set(key, s.parameters.push(np) - 1);
  };
  const parametersOf = (e: BasicEvent) => {
    for (const key of Object.values(e.fields)) parameter(key);
  };
  // With an explicit stack: a chain of new gates thousands deep is a valid study.
  const node = (first: string): void => {
    const todo = [first];
    while (todo.length > 0) {
      const id = todo.pop()!;
      if (at.gates.has(id) || at.events.has(id)) continue;
      const ng = fromNew.gates.get(id);
      if (ng) {
        at.gates.set(id, s.gates.push(ng) - 1);
        // Reversed, so the inputs are brought in in their written order, as a recursion would.
        for (let k = ng.inputs.length - 1; k >= 0; k--) todo.push(ng.inputs[k]!);
        continue;
      }
      const ne = fromNew.events.get(id);
      if (ne) {
        at.events.set(id, s.events.push(ne) - 1);
        parametersOf(ne);
      }
    }
  };
  return { parameter, parametersOf, node, at };
}
