/**
 * The study's scenarios (logic.yaml `scenarios:`), each quantified at as_of and set beside the
 * base case as a ratio. A scenario that sets switches gets its own diagram (switches are constants
 * in the diagram); one that only sets parameters reuses the base diagram. Planned renewals take
 * effect on their dates, so a renewal after as_of changes nothing here: the forecast shows it.
 */
import type { Study } from '../study/types.js';
import { scenarioCase } from './case.js';
import type { CaseQuantifier } from './case-quantifier.js';
import type { ScenarioResult } from './results.js';

export function scenarios(study: Study, quantifier: CaseQuantifier, base: Float64Array): ScenarioResult[] {
  return study.scenarios.map((s) => {
    const tops = quantifier.tops(scenarioCase(s));
    return {
      id: s.id,
      title: s.title,
      set: s.set.map((x) => ({ key: x.key, value: x.value, written: x.written })),
      switches: s.switches.map((x) => ({ event: x.event, on: x.on })),
      renew: s.renew.map((x) => ({ event: x.event, date: x.date })),
      tops: study.tops.map((top, t) => ({
        id: top.id,
        probability: tops[t]!,
        base: base[t]!,
        ratio: ratio(tops[t]!, base[t]!),
      })),
    };
  });
}

/** a/b, with 0/0 = 1 (no change) and a/0 = Infinity for a > 0. */
export function ratio(a: number, b: number): number {
  if (b > 0) return a / b;
  return a > 0 ? Infinity : 1;
}
