/**
 * A case: the base study or a variation of it (a scenario, one sensitivity point, one Monte Carlo
 * trial, a forecast year). Cases never copy the study; they name only what differs.
 */
import { yearsBetween } from '../reliability/units.js';
import type { BasicEvent, Scenario, Study } from '../study/types.js';

export interface Case {
  /** `owner.field` → value in canonical units. An event key (`gate-1-motor.exercise`) beats the class key it inherits. */
  overrides: Map<string, number>;
  /** Switch event id → state. */
  switches: Map<string, boolean>;
  /** Years after `as_of` (the forecast moves this; ages grow with it). */
  years: number;
  /** Weibull event id → planned renewal date; the age restarts then. */
  renewals: Map<string, string>;
}

export function baseCase(): Case {
  return { overrides: new Map(), switches: new Map(), years: 0, renewals: new Map() };
}

export function scenarioCase(s: Scenario): Case {
  const c = baseCase();
  for (const x of s.set) c.overrides.set(x.key, x.value);
  for (const x of s.switches) c.switches.set(x.event, x.on);
  for (const x of s.renew) c.renewals.set(x.event, x.date);
  return c;
}

/** Value of one model field of an event in a case. */
export function fieldValue(event: BasicEvent, field: string, c: Case, paramValue: (key: string) => number): number | undefined {
  const key = event.fields[field];
  if (key === undefined) return undefined;
  return c.overrides.get(`${event.id}.${field}`) ?? c.overrides.get(key) ?? paramValue(key);
}

/** Age of a Weibull event at `years` after as_of, restarting at a planned renewal already passed. */
export function ageInCase(study: Study, event: BasicEvent, c: Case): number | undefined {
  if (event.ageYears === undefined) return undefined;
  const renewal = c.renewals.get(event.id);
  if (renewal !== undefined) {
    const since = yearsBetween(study.meta.as_of, renewal);
    if (since <= c.years) return c.years - since;
  }
  return event.ageYears + c.years;
}
