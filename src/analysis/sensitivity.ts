/**
 * One-at-a-time sensitivity of the top-event probabilities:
 *  - every parameter a basic event reads, moved to the low and then the high end of its range, all
 *    others at their values: the data of a tornado chart, sorted by swing. The range is the one
 *    stated in the study (`range:`); without one, a fitted shape or scale takes its life-data fit's
 *    two-sided bounds (each end one-sided at the fit's confidence); otherwise the value is divided
 *    and multiplied by settings.sensitivity_factor (probabilities capped at 1). Each row says which
 *    (`range_source`, `range_basis`);
 *  - the exercise interval: every `exercise` field of the study set together to weekly, monthly,
 *    quarterly and yearly, beside the base case.
 * An end that falls outside the parameter's domain (the study reader's own rule, `checkDomain`: a
 * shape of zero, a value × factor that overflows) is not evaluated; the parameter is listed as
 * skipped, with why.
 *
 * How a point is quantified without re-quantifying the diagram: the top probability is linear in
 * each variable's probability, P = p·P(top | x) + (1 − p)·P(top | ¬x) (Shannon expansion), and the
 * two conditionals of every variable come from one upward and one downward pass (logic/importance.ts,
 * the same passes as Birnbaum importance). A parameter end that moves one variable is therefore one
 * multiply-add; one that moves several (a class field read by many events, a common-cause
 * factor, a member's total that moves its shared events) is one full bottom-up pass.
 */
import { DAYS_PER_YEAR } from '../reliability/units.js';
import { evaluateEvent, EventProbabilityError, eventsReading } from './event-probability.js';
import { commonCauseOf } from './common-cause.js';
import { StudyError } from '../study/errors.js';
import { checkDomain } from '../study/quantities.js';
import type { FitSpec, Parameter, Study } from '../study/types.js';
import { importance } from '../logic/index.js';
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

/** Where a tornado range came from (results contract: `range_source`). */
export type RangeSource = 'stated' | 'fit' | 'default-factor';

export interface SensitivityRange {
  low: number;
  high: number;
  source: RangeSource;
  /** In words, for the appendix: "stated range", "fit bounds (each one-sided 90 %)", "default factor ×/÷ 2". */
  basis: string;
}

/** A level such as 0.9 as "90", 0.975 as "97.5". */
function percent(level: number): string {
  return String(Number((level * 100).toPrecision(6)));
}

/** The low and high values of a parameter for the tornado, and where they came from. */
export function sensitivityRange(p: Parameter, factor: number, fits: readonly FitSpec[] = []): SensitivityRange {
  if (p.range) return { low: p.range[0], high: p.range[1], source: 'stated', basis: 'stated range' };
  const fit = p.fit === undefined ? undefined : fits.find((f) => f.id === p.fit)?.result;
  const bound = fit && (p.field === 'shape' || p.field === 'scale') ? fit.bounds.fisher[p.field] : undefined;
  // A fit whose information matrix gave no usable bounds falls back to the default factor.
  if (bound && Number.isFinite(bound.lower) && Number.isFinite(bound.upper) && bound.lower > 0 && bound.upper > bound.lower) {
    return { low: bound.lower, high: bound.upper, source: 'fit', basis: `fit bounds (each one-sided ${percent(fit!.bounds.level)} %)` };
  }
  const low = p.value / factor;
  const high = p.value * factor;
  return { low, high: p.quantity === 'probability' ? Math.min(1, high) : high, source: 'default-factor', basis: `default factor ×/÷ ${factor}` };
}

/** The low and high values of a parameter for the tornado (see sensitivityRange). */
export function sensitivityBounds(p: Parameter, factor: number, fits: readonly FitSpec[] = []): [number, number] {
  const r = sensitivityRange(p, factor, fits);
  return [r.low, r.high];
}

function withOverrides(entries: [string, number][]): Case {
  const c = baseCase();
  for (const [k, v] of entries) c.overrides.set(k, v);
  return c;
}

/**
 * Top probabilities at cases that differ from the base case by parameter overrides only, using the
 * base case's conditionals P(top | x), P(top | ¬x) where a case moves a single variable.
 */
class OneAtATime {
  private readonly baseEvents: Float64Array;
  private readonly conditionals: { onTrue: Float64Array; onFalse: Float64Array }[];

  constructor(
    private readonly quantifier: CaseQuantifier,
    private readonly base: Float64Array,
  ) {
    const { compiled } = quantifier.diagram(baseCase());
    this.baseEvents = quantifier.baseEvents;
    this.conditionals = quantifier.model.topGates.map((g) => {
      const imp = importance(compiled.manager, compiled.gateRoots[g]!, this.baseEvents);
      return { onTrue: imp.conditionalTrue, onFalse: imp.conditionalFalse };
    });
  }

  tops(c: Case): Float64Array {
    const single = this.singleEvent(c);
    if (single) return this.moveOne(single.variable, single.probability);
    const p = this.quantifier.events(c);
    const base = this.baseEvents;
    let moved = -1;
    for (let v = 0; v < p.length; v++) {
      if (p[v] === base[v]) continue;
      if (moved >= 0) return this.quantifier.topsAt(c, p);
      moved = v;
    }
    if (moved < 0) return Float64Array.from(this.base);
    return this.moveOne(moved, p[moved]!);
  }

  /**
   * The common case, found without evaluating every event: one override read by one event outside
   * any common-cause group, so that event's variable is the only one that can move.
   */
  private singleEvent(c: Case): { variable: number; probability: number } | undefined {
    const study = this.quantifier.study;
    if (c.overrides.size !== 1 || c.switches.size > 0 || c.renewals.size > 0 || c.years !== 0) return undefined;
    const readers = eventsReading(study, c.overrides.keys().next().value!);
    if (readers.length !== 1 || commonCauseOf(study).memberOf.has(readers[0]!)) return undefined;
    return { variable: readers[0]!, probability: evaluateEvent(study, readers[0]!, c).probability };
  }

  /** Top probabilities with variable `moved` at probability pv and every other at its base value. */
  private moveOne(moved: number, pv: number): Float64Array {
    if (pv === this.baseEvents[moved]) return Float64Array.from(this.base);
    return Float64Array.from(this.conditionals, (x, t) => {
      const p1 = x.onTrue[moved]!;
      const p0 = x.onFalse[moved]!;
      // A top that does not depend on the variable keeps its base value exactly (no rounding).
      return p1 === p0 ? this.base[t]! : pv * p1 + (1 - pv) * p0;
    });
  }
}

export function sensitivity(study: Study, quantifier: CaseQuantifier, base: Float64Array): SensitivityResult[] {
  const read = parametersRead(study);
  const params = study.parameters.filter((p) => read.has(p.key));
  const factor = study.settings.sensitivity_factor;
  const rangeOf = (p: Parameter): SensitivityRange => sensitivityRange(p, factor, study.fits);
  const skipped: { key: string; reason: string }[] = [];
  const inDomain = (p: Parameter, v: number): boolean => {
    try {
      checkDomain(p.field, p.quantity, v, p.at, `'${p.key}'`);
      return true;
    } catch (err) {
      if (!(err instanceof StudyError)) throw err;
      const r = rangeOf(p);
      const how = r.source === 'default-factor' ? `${p.value} ÷/× ${factor} gives ${v}` : `the ${r.basis} end ${v} is`;
      skipped.push({ key: p.key, reason: `${how}, outside its domain (${err.hint ?? 'see the study reader'})` });
      return false;
    }
  };
  const evaluable = params.filter((p) => {
    const r = rangeOf(p);
    return inDomain(p, r.low) && inDomain(p, r.high);
  });
  const oneAtATime = new OneAtATime(quantifier, base);
  const points = evaluable.flatMap((p) => {
    const r = rangeOf(p);
    try {
      return [{ key: p.key, range: r, low: oneAtATime.tops(withOverrides([[p.key, r.low]])), high: oneAtATime.tops(withOverrides([[p.key, r.high]])) }];
    } catch (err) {
      // An end that passes the domain checks but that the model cannot evaluate (overflow) is skipped, with why.
      if (!(err instanceof EventProbabilityError)) throw err;
      skipped.push({ key: p.key, reason: `${r.low} to ${r.high}: ${err.message}` });
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
      low_value: x.range.low,
      high_value: x.range.high,
      low: x.low[t]!,
      high: x.high[t]!,
      base: base[t]!,
      swing: x.high[t]! - x.low[t]!,
      range_source: x.range.source,
      range_basis: x.range.basis,
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
