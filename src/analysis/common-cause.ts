/**
 * Common-cause expansion of the parametric models of NUREG/CR-5485 (US NRC 1998, "Guidelines on
 * Modeling Common-Cause Failures in Probabilistic Risk Assessment"): a group of m like members,
 * each with total failure probability Q_t, becomes
 *   - one independent event per member, keeping the member's own id (the usual convention: the
 *     component's basic event now stands for its independent failure), of probability Q_1, and
 *   - one common-cause event per subset of two or more members, of probability Q_k for a subset
 *     of k members,
 * and every place the logic uses a member reads OR(its independent event, every common-cause event
 * whose subset contains it). The logic model (logic-model.ts) makes that replacement before
 * compiling, so every top, cut set, importance measure, count and event-tree sequence sees it.
 *
 * Q_k = f_k · Q_t with, for a group of m (C(a, b) the binomial coefficient):
 *   beta factor          f_1 = 1 − β, f_m = β, f_k = 0 for 1 < k < m;
 *   multiple Greek letter f_k = Π_{i=1..k} ρ_i · (1 − ρ_{k+1}) / C(m−1, k−1),
 *                        ρ_1 = 1, ρ_2 = β, ρ_3 = γ, ρ_4 = δ, ρ_{m+1} = 0;
 *   alpha factor, non-staggered testing  f_k = k / C(m−1, k−1) · α_k / α_t,  α_t = Σ_k k·α_k;
 *   alpha factor, staggered testing      f_k = α_k / C(m−1, k−1).
 * In every form Σ_k C(m−1, k−1) f_k = 1: to first order a member still fails with probability Q_t.
 * The beta factor's subsets of 2..m−1 members have Q_k = 0 by the method's definition, so they are
 * not made (the layout depends only on the method, never on parameter values, so every case of a
 * study has the same variables).
 *
 * Members with unequal Q_t (motors of different ages): NUREG/CR-5485's formulas assume a
 * symmetric group. Rule used here, and why: each member's independent event keeps its own
 * f_1 · Q_t,i (its own age and data), and every common-cause event uses f_k · Q̄ with Q̄ the
 * arithmetic mean of the members' Q_t. The group's parameters are estimated from pooled data of
 * like components, for which Q̄ is the estimate of the per-member total; and because everything is
 * linear in Q_t, the sum over members of (independent + every shared event containing it) equals
 * Σ Q_t,i exactly, i.e. the expected number of member failures is kept, while each member's own
 * first-order total moves to f_1·Q_t,i + (1 − f_1)·Q̄ (towards the mean). The analysis warns when
 * the members differ, and the appendix states the rule.
 */
import type { CommonCauseGroup, Study } from '../study/types.js';

/** Binomial coefficient C(n, k); exact in doubles for the group sizes used here. */
export function choose(n: number, k: number): number {
  if (k < 0 || k > n) return 0;
  let c = 1;
  for (let i = 1; i <= k; i++) c = (c * (n - k + i)) / i;
  return Math.round(c);
}

/**
 * factors[k] for k = 1..m (factors[0] = 0): the probability of one specific common-cause event of
 * k members (k = 1: a member's independent failure) as a fraction of the members' total Q_t.
 * `params` holds the method's parameters by field name (beta; beta, gamma, delta; alpha1…alphaM).
 */
export function ccfFactors(
  method: CommonCauseGroup['method'],
  testing: CommonCauseGroup['testing'],
  m: number,
  params: Readonly<Record<string, number>>,
): number[] {
  if (!Number.isInteger(m) || m < 2) throw new RangeError(`a common-cause group needs two or more members, got ${m}`);
  const need = (field: string): number => {
    const v = params[field];
    if (v === undefined) throw new RangeError(`the ${method} method needs '${field}'`);
    return v;
  };
  const f = new Array<number>(m + 1).fill(0);
  switch (method) {
    case 'beta': {
      const beta = need('beta');
      f[1] = 1 - beta;
      f[m] = beta;
      return f;
    }
    case 'mgl': {
      const names = ['beta', 'gamma', 'delta'];
      if (m - 1 > names.length) throw new RangeError(`the multiple Greek letter method here takes at most ${names.length + 1} members`);
      // rho[1] = 1, rho[2..m] = beta, gamma, delta, rho[m+1] = 0.
      const rho = [0, 1, ...names.slice(0, m - 1).map(need), 0];
      let product = 1;
      for (let k = 1; k <= m; k++) {
        product *= rho[k]!;
        f[k] = (product * (1 - rho[k + 1]!)) / choose(m - 1, k - 1);
      }
      return f;
    }
    case 'alpha': {
      const alpha = Array.from({ length: m + 1 }, (_, k) => (k === 0 ? 0 : need(`alpha${k}`)));
      if (testing === 'staggered') {
        for (let k = 1; k <= m; k++) f[k] = alpha[k]! / choose(m - 1, k - 1);
        return f;
      }
      let alphaT = 0;
      for (let k = 1; k <= m; k++) alphaT += k * alpha[k]!;
      for (let k = 1; k <= m; k++) f[k] = ((k / choose(m - 1, k - 1)) * alpha[k]!) / alphaT;
      return f;
    }
  }
}

/** One common-cause event of the expansion: a subset of two or more members of a group. */
export interface SharedCauseEvent {
  id: string;
  group: string;
  /** Positions (0-based) of the members in the group's list. */
  positions: number[];
  /** Study-event indices of those members. */
  members: number[];
  /** Variable index in the logic model. */
  variable: number;
}

export interface GroupLayout {
  group: CommonCauseGroup;
  /** Study-event index of each member, in the group's order. */
  members: number[];
  /** Subsets of two or more members, by size then by positions. */
  shared: SharedCauseEvent[];
}

/** Id of the shared event of a subset: `<group>/ccf-1-3` for the first and third members. */
export function sharedEventId(group: string, positions: readonly number[]): string {
  return `${group}/ccf-${positions.map((p) => p + 1).join('-')}`;
}

/** Per-group numbers of one evaluation, for the results and the warning on unequal members. */
export interface GroupNumbers {
  factors: number[];
  parameters: Record<string, number>;
  totals: number[];
  /** Q̄: the mean of the members' totals, used for every shared event. */
  reference: number;
}

/**
 * The layout of a study's expansion: which variables it adds after the study's basic events, and
 * how to compute their probabilities for any case.
 */
export class CommonCauseExpansion {
  readonly groups: GroupLayout[];
  /** Ids of the added variables, in variable order (they follow the study's events). */
  readonly addedIds: string[] = [];
  /** Study events + added events. */
  readonly variableCount: number;
  /** Study-event index of a member → its group and position. */
  readonly memberOf = new Map<number, { group: GroupLayout; position: number }>();

  constructor(study: Pick<Study, 'events'> & Partial<Pick<Study, 'commonCause'>>) {
    const index = new Map(study.events.map((e, i) => [e.id, i]));
    const n = study.events.length;
    this.groups = (study.commonCause ?? []).map((group) => {
      const members = group.members.map((id) => {
        const i = index.get(id);
        if (i === undefined) throw new RangeError(`common-cause group '${group.id}' names unknown event '${id}'`);
        return i;
      });
      const layout: GroupLayout = { group, members, shared: [] };
      const m = members.length;
      const sizes = group.method === 'beta' ? [m] : Array.from({ length: m - 1 }, (_, i) => i + 2);
      for (const size of sizes) {
        for (const positions of subsetsOfSize(m, size)) {
          const id = sharedEventId(group.id, positions);
          layout.shared.push({ id, group: group.id, positions, members: positions.map((p) => members[p]!), variable: n + this.addedIds.length });
          this.addedIds.push(id);
        }
      }
      members.forEach((i, position) => {
        if (this.memberOf.has(i)) throw new RangeError(`event '${study.events[i]!.id}' is in two common-cause groups`);
        this.memberOf.set(i, { group: layout, position });
      });
      return layout;
    });
    this.variableCount = n + this.addedIds.length;
  }

  /** Shared events whose subset contains the member at study-event index `i`. */
  sharedWith(i: number): SharedCauseEvent[] {
    const m = this.memberOf.get(i);
    if (!m) return [];
    return m.group.shared.filter((s) => s.positions.includes(m.position));
  }

  /** The numbers of one group for the members' totals and the parameter values. */
  numbers(layout: GroupLayout, total: ArrayLike<number>, value: (key: string) => number): GroupNumbers {
    const g = layout.group;
    const parameters: Record<string, number> = {};
    for (const [field, key] of Object.entries(g.fields)) parameters[field] = value(key);
    const factors = ccfFactors(g.method, g.testing, layout.members.length, parameters);
    const totals = layout.members.map((i) => total[i]!);
    const reference = totals.reduce((s, q) => s + q, 0) / totals.length;
    return { factors, parameters, totals, reference };
  }

  /**
   * Probabilities of every variable of the logic model from the study events' own (total)
   * probabilities: a member's entry becomes its independent part f_1·Q_t,i, and each added event
   * gets f_k·Q̄. `value` gives a parameter's value by key (the case's, or a sampled one).
   */
  apply(total: ArrayLike<number>, value: (key: string) => number, out: Float64Array = new Float64Array(this.variableCount)): Float64Array {
    // The arithmetic of `numbers` (Q̄ summed in member order from 0), without its per-call
    // objects: this runs in every Monte Carlo trial.
    for (let i = 0; i < total.length; i++) out[i] = total[i]!;
    for (let g = 0; g < this.groups.length; g++) {
      const layout = this.groups[g]!;
      const factors = this.factorsOf(g, value);
      const members = layout.members;
      let sum = 0;
      for (let k = 0; k < members.length; k++) sum += total[members[k]!]!;
      const reference = sum / members.length;
      for (let k = 0; k < members.length; k++) out[members[k]!] = factors[1]! * total[members[k]!]!;
      for (let k = 0; k < layout.shared.length; k++) {
        const s = layout.shared[k]!;
        out[s.variable] = factors[s.positions.length]! * reference;
      }
    }
    return out;
  }

  /** Per group: its fields and keys, and the parameter values and factors last computed (trials mostly repeat them). */
  private readonly lastFactors: { fields: [string, string][]; values: Float64Array; factors: number[] | undefined }[] = [];

  /** ccfFactors of group g at the parameter values `value` gives, reusing the last result when the values are the same. */
  private factorsOf(g: number, value: (key: string) => number): number[] {
    const group = this.groups[g]!.group;
    let memo = this.lastFactors[g];
    if (!memo) {
      const fields = Object.entries(group.fields);
      memo = { fields, values: new Float64Array(fields.length), factors: undefined };
      this.lastFactors[g] = memo;
    }
    let same = memo.factors !== undefined;
    for (let k = 0; k < memo.fields.length; k++) {
      const v = value(memo.fields[k]![1]);
      if (!Object.is(v, memo.values[k])) same = false;
      memo.values[k] = v;
    }
    if (same) return memo.factors!;
    const parameters: Record<string, number> = {};
    memo.fields.forEach(([field], k) => (parameters[field] = memo.values[k]!));
    memo.factors = ccfFactors(group.method, group.testing, this.groups[g]!.members.length, parameters);
    return memo.factors;
  }
}

/** All k-subsets of 0..m−1 as increasing position lists, in lexicographic order. */
export function subsetsOfSize(m: number, k: number): number[][] {
  const out: number[][] = [];
  const pick: number[] = [];
  const walk = (from: number): void => {
    if (pick.length === k) {
      out.push([...pick]);
      return;
    }
    for (let i = from; i <= m - (k - pick.length); i++) {
      pick.push(i);
      walk(i + 1);
      pick.pop();
    }
  };
  walk(0);
  return out;
}

const cache = new WeakMap<object, CommonCauseExpansion>();

/** The study's expansion, built once per study object (the logic model and every case share it). */
export function commonCauseOf(study: Pick<Study, 'events'> & Partial<Pick<Study, 'commonCause'>>): CommonCauseExpansion {
  let e = cache.get(study);
  if (!e) {
    e = new CommonCauseExpansion(study);
    cache.set(study, e);
  }
  return e;
}
