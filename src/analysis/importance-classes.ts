/**
 * Importance of a component class: all the basic events of the class taken together, the group
 * importance of W. E. Vesely et al., "Measures of Risk Importance and Their Applications",
 * NUREG/CR-3385 (US NRC 1983), applied to the set of events a class shares data with (which is
 * also the set that one change of the class's data — a better motor, a new brake type — moves).
 *
 * With P the top-event probability, P1 = P(top | every event of the class failed) and
 * P0 = P(top | every event of the class working):
 *   Birnbaum        I_B = P1 − P0
 *   Fussell–Vesely  FV  = (P − P0)/P   (the fraction of P that would go if the class never failed)
 *   RAW             = P1/P,   RRW = P/P0
 * For a single event these are the measures of `logic/importance.ts` (the tests check that).
 * With a common-cause group (common-cause.ts) a member's variable is only its independent part;
 * the class also holds every shared common-cause event whose members all belong to it (the four
 * motors' shared failure is a motor failure), so "all working" leaves no way for the class to fail.
 * A shared event that spans two classes belongs to neither.
 * P1 and P0 are exact conditional probabilities on the decision diagram: P is multilinear in the
 * event probabilities, so setting the class's probabilities to 1 (or 0) in one pass is conditioning
 * on them. FV's numerator P − P0 is not formed by that subtraction (which loses a small class's
 * share of a large P entirely) but, like the per-event FV, from local differences on the diagram
 * (ProbabilityEvaluator.groupReduction). In a coherent tree P0 ≤ P ≤ P1, so Birnbaum ≥ 0,
 * 0 ≤ FV ≤ 1 and RAW, RRW ≥ 1 hold exactly and are clamped against rounding. A ratio with a zero
 * denominator is Infinity, as for single events.
 */
import { ProbabilityEvaluator } from '../logic/index.js';
import type { Study } from '../study/types.js';
import { commonCauseOf } from './common-cause.js';
import type { ClassImportance } from './results.js';

/** Class id → indices of its basic events, in study order of first appearance. Switches are not components. */
export function classMembers(study: Study): Map<string, number[]> {
  const members = new Map<string, number[]>();
  study.events.forEach((e, i) => {
    if (!e.class || e.model === 'switch') return;
    const list = members.get(e.class) ?? [];
    list.push(i);
    members.set(e.class, list);
  });
  return members;
}

/** The logic-model variables a class pins: its events, and the shared common-cause events all of whose members are in it. */
function classVariables(study: Study, events: number[]): number[] {
  const inClass = new Set(events);
  const shared: number[] = [];
  for (const layout of commonCauseOf(study).groups) {
    for (const s of layout.shared) if (s.members.every((m) => inClass.has(m))) shared.push(s.variable);
  }
  return [...events, ...shared];
}

/**
 * Class importance for every top (outer array in study order of tops), ranked by FV (ties in
 * class order). Classes that cannot change a top (P1 = P0) are left out of its list.
 */
export function classImportance(study: Study, evaluator: ProbabilityEvaluator, p: Float64Array, coherent = false): ClassImportance[][] {
  const members = classMembers(study);
  const P = evaluator.evaluate(p);
  const perTop: ClassImportance[][] = study.tops.map(() => []);
  const pinned = Float64Array.from(p);
  for (const [cls, events] of members) {
    const vars = classVariables(study, events);
    for (const i of vars) pinned[i] = 1;
    const p1 = evaluator.evaluate(pinned);
    for (const i of vars) pinned[i] = 0;
    const p0 = evaluator.evaluate(pinned);
    for (const i of vars) pinned[i] = p[i]!;
    const inClass = new Uint8Array(p.length);
    for (const i of vars) inClass[i] = 1;
    const reduction = evaluator.groupReduction(p, inClass);
    study.tops.forEach((_, t) => {
      const base = P[t]!;
      let one = p1[t]!;
      let zero = p0[t]!;
      if (one === zero) return;
      let fv = base > 0 ? reduction[t]! / base : 0;
      if (coherent) {
        // P0 ≤ P ≤ P1 in a coherent tree: only rounding can say otherwise.
        zero = Math.min(zero, base);
        one = Math.max(one, base);
        fv = Math.min(1, Math.max(0, fv));
      }
      perTop[t]!.push({
        class: cls,
        events: events.map((i) => study.events[i]!.id),
        p_failed: one,
        p_working: zero,
        fussell_vesely: fv,
        birnbaum: one - zero,
        raw: base > 0 ? one / base : Infinity,
        rrw: zero > 0 ? base / zero : Infinity,
      });
    });
  }
  const order = new Map([...members.keys()].map((c, i) => [c, i]));
  for (const list of perTop) list.sort((a, b) => b.fussell_vesely - a.fussell_vesely || order.get(a.class)! - order.get(b.class)!);
  return perTop;
}
