/**
 * The forecast: top-event probabilities for each whole year 0 … settings.horizon after as_of, as
 * the ages of the Weibull components grow (`Case.years`), for the base case and for every scenario
 * that plans a renewal (its age restarts on the renewal date, `ageInCase`). The other parts of such a
 * scenario (set values, switches) apply throughout, since the scenario is one plan.
 * Non-ageing models (fixed, rate, tested, …) keep their values: their data say nothing of age.
 */
import { parseDate } from '../reliability/units.js';
import type { Study } from '../study/types.js';
import { baseCase, scenarioCase, type Case } from './case.js';
import type { CaseQuantifier } from './case-quantifier.js';
import type { ForecastResult } from './results.js';

export function forecast(study: Study, quantifier: CaseQuantifier): ForecastResult[] {
  const horizon = Math.max(0, Math.floor(study.settings.horizon));
  const series = (title: string | undefined, id: string | undefined, make: () => Case): ForecastResult => {
    const years: ForecastResult['years'] = [];
    for (let k = 0; k <= horizon; k++) {
      const c = make();
      c.years = k;
      const p = quantifier.tops(c);
      const tops: Record<string, number> = {};
      study.tops.forEach((t, i) => (tops[t.id] = p[i]!));
      years.push({ year: k, date: yearsAfter(study.meta.as_of, k), tops });
    }
    const out: ForecastResult = { years };
    if (id !== undefined) out.scenario = id;
    if (title !== undefined) out.title = title;
    return out;
  };
  const out = [series(undefined, undefined, baseCase)];
  for (const s of study.scenarios) {
    if (s.renew.length > 0) out.push(series(s.title, s.id, () => scenarioCase(s)));
  }
  return out;
}

/** The ISO date k whole years after `date` (same month and day; 29 February becomes 28 February in a common year). */
export function yearsAfter(date: string, k: number): string {
  const d = parseDate(date);
  if (!d.ok) return date;
  const year = d.value.year + k;
  const leap = (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0;
  const day = d.value.month === 2 && d.value.day === 29 && !leap ? 28 : d.value.day;
  return `${String(year).padStart(4, '0')}-${String(d.value.month).padStart(2, '0')}-${String(day).padStart(2, '0')}`;
}
