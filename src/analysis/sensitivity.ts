/**
 * One-at-a-time sensitivity of the top-event probabilities:
 *  - every parameter a basic event reads, moved to the low and then the high end of its `range`
 *    (or, without one, divided and multiplied by settings.sensitivity_factor, probabilities capped
 *    at 1), all others at their values: the data of a tornado chart, sorted by swing;
 *  - the exercise interval: every `exercise` field of the study set together to weekly, monthly,
 *    quarterly and yearly, beside the base case.
 * Each point is a case (parameter overrides) quantified on the base diagram. An end that falls
 * outside the parameter's domain (the study reader's own rule, `checkDomain`: a shape of zero, a
 * value × factor that overflows) is not evaluated; the parameter is listed as skipped, with why.
 */
import { DAYS_PER_YEAR } from '../reliability/units.js';
import { EventProbabilityError } from './event-probability.js';
import { StudyError } from '../study/errors.js';
import { checkDomain } from '../study/quantities.js';
import type { Parameter, Study } from '../study/types.js';
import { baseCase, type Case } from './case.js';
import type { CaseQuantifier } from './case-quantifier.js';
import type { SensitivityResult } from './results.js';
import { parametersRead } from './event-plan.js';
import { ratio } from './scenarios.js';

/** The exercise intervals of the curve, in years. */
export const EXERCISE_POINTS: readonly { label: string; years: number }[] = [
  { label: 'weekly', years: 7 / DAYS_PER_YEAR },
  { label: 'monthly', years: 1 / 12 },
  { label: 'quarterly', years: 0.25 },
  { label: 'yearly', years: 1 },
];

/** The low and high values of a parameter for the tornado. */
export function sensitivityBounds(p: Parameter, factor: number): [number, number] {
  if (p.range) return [p.range[0], p.range[1]];
  const low = p.value / factor;
  const high = p.value * factor;
  return [low, p.quantity === 'probability' ? Math.min(1, high) : high];
}

function withOverrides(entries: [string, number][]): Case {
  const c = baseCase();
  for (const [k, v] of entries) c.overrides.set(k, v);
  return c;
}

export function sensitivity(study: Study, quantifier: CaseQuantifier, base: Float64Array): SensitivityResult[] {
  const read = parametersRead(study);
  const params = study.parameters.filter((p) => read.has(p.key));
  const factor = study.settings.sensitivity_factor;
  const skipped: { key: string; reason: string }[] = [];
  const inDomain = (p: Parameter, v: number): boolean => {
    try {
      checkDomain(p.field, p.quantity, v, p.at, `'${p.key}'`);
      return true;
    } catch (err) {
      if (!(err instanceof StudyError)) throw err;
      skipped.push({ key: p.key, reason: `${p.value} ÷/× ${factor} gives ${v}, outside its domain (${err.hint ?? 'see the study reader'})` });
      return false;
    }
  };
  const evaluable = params.filter((p) => {
    const [low, high] = sensitivityBounds(p, factor);
    return inDomain(p, low) && inDomain(p, high);
  });
  const points = evaluable.flatMap((p) => {
    const [lowValue, highValue] = sensitivityBounds(p, factor);
    try {
      return [{ key: p.key, lowValue, highValue, low: quantifier.tops(withOverrides([[p.key, lowValue]])), high: quantifier.tops(withOverrides([[p.key, highValue]])) }];
    } catch (err) {
      // An end that passes the domain checks but that the model cannot evaluate (overflow) is skipped, with why.
      if (!(err instanceof EventProbabilityError)) throw err;
      skipped.push({ key: p.key, reason: `${lowValue} to ${highValue}: ${err.message}` });
      return [];
    }
  });

  const exerciseKeys = params.filter((p) => p.field === 'exercise');
  const curve: { label: string; years?: number; base?: true; probability: Float64Array }[] = [];
  if (exerciseKeys.length > 0) {
    const values = new Set(exerciseKeys.map((p) => p.value));
    const common = values.size === 1 ? [...values][0]! : undefined;
    curve.push({ label: 'as studied', ...(common !== undefined ? { years: common } : {}), base: true, probability: base });
    for (const x of EXERCISE_POINTS) {
      curve.push({ label: x.label, years: x.years, probability: quantifier.tops(withOverrides(exerciseKeys.map((p) => [p.key, x.years]))) });
    }
  }

  const order = new Map(params.map((p, i) => [p.key, i]));
  return study.tops.map((top, t) => {
    const tornado = points.map((x) => ({
      key: x.key,
      low_value: x.lowValue,
      high_value: x.highValue,
      low: x.low[t]!,
      high: x.high[t]!,
      base: base[t]!,
      swing: x.high[t]! - x.low[t]!,
    }));
    // Widest swing first; equal swings in study order, so the table is stable.
    tornado.sort((a, b) => Math.abs(b.swing) - Math.abs(a.swing) || order.get(a.key)! - order.get(b.key)!);
    return {
      top: top.id,
      tornado,
      skipped,
      exercise_curve: curve.map((x) => ({
        label: x.label,
        ...(x.years !== undefined ? { years: x.years } : {}),
        ...(x.base ? { base: true as const } : {}),
        probability: x.probability[t]!,
        ratio: ratio(x.probability[t]!, base[t]!),
      })),
    };
  });
}
