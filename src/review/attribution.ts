/**
 * What moved the answer: start from OLD, apply each change alone and recompute every top's exact
 * probability; then all of them together. The single effects need not multiply or add up to the
 * total, because changes interact (a change to a component matters more or less depending on what
 * else changed in the same cut sets); the report says so.
 *
 * Only the point estimate is recomputed for each change (the decision diagram and the event
 * probabilities, exactly as the analysis computes them), not the sensitivity or uncertainty
 * analyses, which would multiply the cost by the number of changes for no extra insight.
 */
import { baseCase } from '../analysis/case.js';
import { evaluateEvents } from '../analysis/event-probability.js';
import { buildLogicModel } from '../analysis/logic-model.js';
import { boundTops, compileBaseCase } from '../analysis/quantify.js';
import type { Results } from '../analysis/results.js';
import { probability } from '../logic/index.js';
import { StudyError, StudyErrors } from '../study/errors.js';
import type { Study } from '../study/types.js';
import { applyUnits, unitId, unitsOf, type Unit } from './apply.js';
import { unitLabel } from './describe.js';
import type { StudyDiff } from './study-diff.js';

export interface TopEffect {
  id: string;
  /** OLD's exact probability. */
  base: number;
  /** With this change alone. */
  value: number;
  /** value / base (absent when base is 0). */
  ratio?: number;
}

export interface Effect {
  id: string;
  unit: Unit;
  /** The change in words (describe.ts). */
  label: string;
  tops: TopEffect[];
  /** Set when the change could not be applied alone (e.g. a re-wiring that would leave a loop). */
  error?: string;
}

export interface Attribution {
  /** Tops present in both revisions: the ones every effect is measured on. */
  tops: string[];
  /** One per change that can be applied alone, largest effect first. */
  effects: Effect[];
  /** All changes together: NEW's own exact probabilities. */
  together: { id: string; old: number; new: number; ratio?: number }[];
  /**
   * Whether applying all the single changes to OLD at once gives NEW's numbers (to 1e-9 relative):
   * true means the list of changes accounts for the whole difference.
   */
  reproduces_new: boolean;
  /** Largest relative difference between "all applied to OLD" and NEW. */
  reproduction_gap: number;
  /**
   * Whether the point estimate recomputed here equals the analysis's own numbers for OLD and NEW
   * (to 1e-12 relative); false would mean the analysis gained a step this module does not repeat.
   */
  consistent: boolean;
}

/**
 * Top probabilities by top id, computed as the analysis's point estimate computes them: exact from
 * the decision diagram, or the cut-set bound when the diagram outgrew its budget and the study
 * allows bounds (then only the bound is computed, as `analyze` does).
 */
export function pointTops(study: Study): Map<string, number> {
  const model = buildLogicModel(study);
  const base = baseCase();
  const p = evaluateEvents(study, base).probability;
  const compiled = compileBaseCase(study, model, base.switches);
  const out = new Map<string, number>();
  if (!compiled) {
    for (const t of boundTops(study, model, base.switches, p)) out.set(t.id, t.probability.exact);
    return out;
  }
  study.tops.forEach((t, i) => out.set(t.id, probability(compiled.manager, compiled.gateRoots[model.topGates[i]!]!, p)));
  return out;
}

export function attribute(oldStudy: Study, newStudy: Study, diff: StudyDiff, oldResults: Results, newResults: Results): Attribution {
  const newTopIds = new Set(newStudy.tops.map((t) => t.id));
  const tops = oldStudy.tops.map((t) => t.id).filter((id) => newTopIds.has(id));
  const oldP = pointTops(oldStudy);
  const newP = pointTops(newStudy);
  const analysed = (r: Results) => new Map(r.tops.map((t) => [t.id, t.probability.exact]));
  const consistent = close(oldP, analysed(oldResults), 1e-12) && close(newP, analysed(newResults), 1e-12);

  const units = unitsOf(diff);
  const effects: Effect[] = units.map((unit) => {
    const id = unitId(unit);
    const label = unitLabel(unit, diff);
    try {
      const p = pointTops(applyUnits(oldStudy, newStudy, [unit]));
      return { id, unit, label, tops: tops.map((t) => topEffect(t, oldP.get(t)!, p.get(t)!)) };
    } catch (err) {
      return { id, unit, label, tops: [], error: describe(err) };
    }
  });
  effects.sort((a, b) => magnitude(b) - magnitude(a));

  let reproduces = false;
  let gap = 0;
  try {
    const all = pointTops(applyUnits(oldStudy, newStudy, units));
    for (const t of tops) gap = Math.max(gap, relative(all.get(t)!, newP.get(t)!));
    reproduces = gap <= 1e-9;
  } catch {
    reproduces = false;
    gap = Infinity;
  }
  const together = tops.map((t) => {
    const o = oldP.get(t)!;
    const n = newP.get(t)!;
    return { id: t, old: o, new: n, ...(o > 0 ? { ratio: n / o } : {}) };
  });
  return { tops, effects, together, reproduces_new: reproduces, reproduction_gap: gap, consistent };
}

function topEffect(id: string, base: number, value: number): TopEffect {
  return { id, base, value, ...(base > 0 ? { ratio: value / base } : {}) };
}

/** Size of an effect for ordering: the largest |log ratio| over the tops (a change to or from 0 counts as huge). */
function magnitude(e: Effect): number {
  if (e.error) return -1;
  let m = 0;
  for (const t of e.tops) {
    if (t.base === t.value) continue;
    const r = t.base > 0 && t.value > 0 ? Math.abs(Math.log(t.value / t.base)) : Infinity;
    m = Math.max(m, r);
  }
  return m;
}

function relative(a: number, b: number): number {
  if (a === b) return 0;
  return Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b));
}

function close(a: Map<string, number>, b: Map<string, number>, tol: number): boolean {
  for (const [id, x] of a) {
    const y = b.get(id);
    if (y === undefined || relative(x, y) > tol) return false;
  }
  return true;
}

function describe(err: unknown): string {
  if (err instanceof StudyErrors) return err.errors.map((e) => e.message).join('; ');
  if (err instanceof StudyError) return err.message;
  return err instanceof Error ? err.message : String(err);
}
