/**
 * Common-cause expansion against the parametric-model formulas of NUREG/CR-5485 (US NRC 1998,
 * "Guidelines on Modeling Common-Cause Failures in Probabilistic Risk Assessment"), as listed in
 * ../shared/reference/README.md:
 *   beta factor:  Q_1 = (1 − β)Q_t, Q_m = βQ_t, nothing in between;
 *   multiple Greek letter: Q_k = 1/C(m−1,k−1) · (Π_{i≤k} ρ_i)(1 − ρ_{k+1}) Q_t, ρ = 1, β, γ, δ, then 0;
 *   alpha factor, non-staggered: Q_k = k/C(m−1,k−1) · α_k/α_t · Q_t, α_t = Σ k α_k;
 *   alpha factor, staggered:     Q_k = 1/C(m−1,k−1) · α_k · Q_t.
 * Every expected value below is worked by hand from those formulas in the comment beside it (not
 * computed by the code under test). All study numbers are INVENTED for the test.
 */
import { describe, expect, it } from 'vitest';
import { ccfFactors, choose, subsetsOfSize } from '../../src/analysis/common-cause.js';
import { StudyErrors } from '../../src/study/errors.js';
import { enumerate, eventsYaml, rel, run, studyOf, QUICK } from './helpers.js';

const close = (got: number[], want: number[]) => {
  expect(got.length).toBe(want.length);
  got.forEach((g, i) => expect(Math.abs(g - want[i]!)).toBeLessThanOrEqual(1e-15));
};

describe('NUREG/CR-5485 factors f_k = Q_k / Q_t', () => {
  it('beta factor, groups of 2, 3 and 4 (β = 0.1)', () => {
    // Q_1 = 0.9 Q_t, Q_m = 0.1 Q_t, Q_k = 0 for 1 < k < m.
    close(ccfFactors('beta', 'non-staggered', 2, { beta: 0.1 }).slice(1), [0.9, 0.1]);
    close(ccfFactors('beta', 'non-staggered', 3, { beta: 0.1 }).slice(1), [0.9, 0, 0.1]);
    close(ccfFactors('beta', 'non-staggered', 4, { beta: 0.1 }).slice(1), [0.9, 0, 0, 0.1]);
  });

  it('multiple Greek letter, groups of 2, 3 and 4 (β = 0.1, γ = 0.3, δ = 0.5)', () => {
    // m = 2: Q_1 = (1 − β) = 0.9; Q_2 = β = 0.1.
    close(ccfFactors('mgl', 'non-staggered', 2, { beta: 0.1 }).slice(1), [0.9, 0.1]);
    // m = 3: Q_1 = 0.9; Q_2 = β(1 − γ)/C(2,1) = 0.1·0.7/2 = 0.035; Q_3 = βγ = 0.03.
    close(ccfFactors('mgl', 'non-staggered', 3, { beta: 0.1, gamma: 0.3 }).slice(1), [0.9, 0.035, 0.03]);
    // m = 4: Q_1 = 0.9; Q_2 = β(1 − γ)/C(3,1) = 0.07/3; Q_3 = βγ(1 − δ)/C(3,2) = 0.015/3 = 0.005; Q_4 = βγδ = 0.015.
    close(ccfFactors('mgl', 'non-staggered', 4, { beta: 0.1, gamma: 0.3, delta: 0.5 }).slice(1), [0.9, 0.07 / 3, 0.005, 0.015]);
  });

  it('alpha factor, non-staggered testing, groups of 2, 3 and 4', () => {
    // m = 2, α = (0.95, 0.05): α_t = 0.95 + 2·0.05 = 1.05; Q_1 = 0.95/1.05; Q_2 = 2/C(1,1)·0.05/1.05 = 0.1/1.05.
    close(ccfFactors('alpha', 'non-staggered', 2, { alpha1: 0.95, alpha2: 0.05 }).slice(1), [0.95 / 1.05, 0.1 / 1.05]);
    // m = 3, α = (0.9, 0.07, 0.03): α_t = 0.9 + 0.14 + 0.09 = 1.13;
    // Q_1 = 0.9/1.13; Q_2 = 2/C(2,1)·0.07/1.13 = 0.07/1.13; Q_3 = 3/C(2,2)·0.03/1.13 = 0.09/1.13.
    close(ccfFactors('alpha', 'non-staggered', 3, { alpha1: 0.9, alpha2: 0.07, alpha3: 0.03 }).slice(1), [0.9 / 1.13, 0.07 / 1.13, 0.09 / 1.13]);
    // m = 4, α = (0.9, 0.05, 0.03, 0.02): α_t = 0.9 + 0.1 + 0.09 + 0.08 = 1.17;
    // Q_1 = 0.9/1.17; Q_2 = 2/3·0.05/1.17; Q_3 = 3/3·0.03/1.17; Q_4 = 4/1·0.02/1.17.
    close(ccfFactors('alpha', 'non-staggered', 4, { alpha1: 0.9, alpha2: 0.05, alpha3: 0.03, alpha4: 0.02 }).slice(1), [
      0.9 / 1.17,
      ((2 / 3) * 0.05) / 1.17,
      0.03 / 1.17,
      0.08 / 1.17,
    ]);
  });

  it('alpha factor, staggered testing, groups of 2, 3 and 4', () => {
    // m = 2: Q_1 = α_1 = 0.95, Q_2 = α_2/C(1,1) = 0.05.
    close(ccfFactors('alpha', 'staggered', 2, { alpha1: 0.95, alpha2: 0.05 }).slice(1), [0.95, 0.05]);
    // m = 3: Q_1 = 0.9, Q_2 = 0.07/C(2,1) = 0.035, Q_3 = 0.03.
    close(ccfFactors('alpha', 'staggered', 3, { alpha1: 0.9, alpha2: 0.07, alpha3: 0.03 }).slice(1), [0.9, 0.035, 0.03]);
    // m = 4: Q_1 = 0.9, Q_2 = 0.05/3, Q_3 = 0.03/3 = 0.01, Q_4 = 0.02.
    close(ccfFactors('alpha', 'staggered', 4, { alpha1: 0.9, alpha2: 0.05, alpha3: 0.03, alpha4: 0.02 }).slice(1), [0.9, 0.05 / 3, 0.01, 0.02]);
  });

  it('each member keeps Q_t to first order: Σ_k C(m−1, k−1) Q_k = Q_t in every model', () => {
    // NUREG/CR-5485: a component's total failure probability is the sum over the basic events
    // (independent and common-cause) that fail it; C(m−1, k−1) events of size k contain a given member.
    const cases: [Parameters<typeof ccfFactors>, string][] = [
      [['beta', 'non-staggered', 4, { beta: 0.07 }], 'beta'],
      [['mgl', 'non-staggered', 4, { beta: 0.08, gamma: 0.4, delta: 0.6 }], 'mgl'],
      [['alpha', 'non-staggered', 4, { alpha1: 0.91, alpha2: 0.04, alpha3: 0.03, alpha4: 0.02 }], 'alpha ns'],
      [['alpha', 'staggered', 4, { alpha1: 0.91, alpha2: 0.04, alpha3: 0.03, alpha4: 0.02 }], 'alpha s'],
    ];
    for (const [args] of cases) {
      const f = ccfFactors(...args);
      const m = args[2];
      const total = f.reduce((s, fk, k) => (k === 0 ? s : s + choose(m - 1, k - 1) * fk), 0);
      expect(Math.abs(total - 1)).toBeLessThanOrEqual(1e-15);
    }
  });

  it('enumerates the subsets of a group: C(4,2) = 6 pairs, C(4,3) = 4 triples (common practice, no source)', () => {
    expect(subsetsOfSize(4, 2)).toEqual([[0, 1], [0, 2], [0, 3], [1, 2], [1, 3], [2, 3]]);
    expect(subsetsOfSize(4, 3)).toHaveLength(4);
    expect(subsetsOfSize(4, 4)).toEqual([[0, 1, 2, 3]]);
  });
});

/** 2-out-of-3 voting over three like pumps: the classic example a CCF group changes. */
const VOTING = `tops:
  pumps-fail: { title: Two of three pumps fail (invented), gate: two-of-three }
gates:
  two-of-three: { atleast: 2, of: [pump-a, pump-b, pump-c] }
`;

describe('the expansion applied to the logic', () => {
  it('2-of-3 pumps with an MGL group equals brute-force enumeration over the expanded events', () => {
    const qt = 0.02;
    const { results } = run({
      events: eventsYaml([['pump-a', qt], ['pump-b', qt], ['pump-c', qt]]),
      logic:
        VOTING +
        `common_cause:
  pumps:
    members: [pump-a, pump-b, pump-c]
    method: mgl
    beta: { value: 0.1, source: test-data }
    gamma: { value: 0.3, source: test-data }
`,
    });
    // By hand (m = 3): Q_1 = 0.9 Q_t, Q_2 = 0.035 Q_t per pair, Q_3 = 0.03 Q_t.
    const q1 = 0.9 * qt;
    const q2 = 0.035 * qt;
    const q3 = 0.03 * qt;
    // Brute force over 7 independent events: a, b, c (independent parts), ab, ac, bc, abc.
    const p = [q1, q1, q1, q2, q2, q2, q3];
    const exact = enumerate(p, (x) => {
      const a = x[0]! || x[3]! || x[4]! || x[6]!;
      const b = x[1]! || x[3]! || x[5]! || x[6]!;
      const c = x[2]! || x[4]! || x[5]! || x[6]!;
      return Number(a) + Number(b) + Number(c) >= 2;
    });
    const top = results.tops[0]!;
    expect(rel(top.probability.exact, exact)).toBeLessThanOrEqual(1e-12);
    // The expanded events are listed, marked with their group, and reach the cut sets.
    const shared = results.events.filter((e) => e.common_cause_role === 'shared');
    expect(shared.map((e) => e.id)).toEqual(['pumps/ccf-1-2', 'pumps/ccf-1-3', 'pumps/ccf-2-3', 'pumps/ccf-1-2-3']);
    shared.forEach((e, i) => expect(rel(e.probability, [q2, q2, q2, q3][i]!)).toBeLessThanOrEqual(1e-15));
    const members = results.events.filter((e) => e.common_cause_role === 'independent');
    expect(members.map((e) => [e.id, e.common_cause_group])).toEqual([['pump-a', 'pumps'], ['pump-b', 'pumps'], ['pump-c', 'pumps']]);
    members.forEach((e) => {
      expect(rel(e.probability, q1)).toBeLessThanOrEqual(1e-15);
      expect(e.total_probability).toBe(qt);
    });
    const singles = top.cut_sets.filter((c) => c.events.length === 1).map((c) => c.events[0]);
    expect(singles.sort()).toEqual(['pumps/ccf-1-2', 'pumps/ccf-1-2-3', 'pumps/ccf-1-3', 'pumps/ccf-2-3']);
    expect(top.cut_sets.some((c) => c.events.join(' ') === 'pump-a pump-b')).toBe(true);
    const group = results.common_cause![0]!;
    expect(group.unequal_totals).toBe(false);
    expect(results.warnings.some((w) => w.code === 'ccf-unequal-totals')).toBe(false);
  });

  it('alpha factor (staggered) on a 4-member group in an AND gate: only the independent quadruple and shared events fail it', () => {
    const qt = 0.05;
    const { results } = run({
      events: eventsYaml([['m1', qt], ['m2', qt], ['m3', qt], ['m4', qt]]),
      logic: `tops:
  all-fail: { title: All four fail (invented), gate: all-four }
gates:
  all-four: { all: [m1, m2, m3, m4] }
common_cause:
  motors:
    members: [m1, m2, m3, m4]
    method: alpha
    testing: staggered
    alpha1: { value: 0.9, source: test-data }
    alpha2: { value: 0.05, source: test-data }
    alpha3: { value: 0.03, source: test-data }
    alpha4: { value: 0.02, source: test-data }
`,
    });
    // By hand (staggered, m = 4): Q_1 = 0.9 Q_t, Q_2 = 0.05/3 Q_t, Q_3 = 0.01 Q_t, Q_4 = 0.02 Q_t;
    // variables: 4 independent, 6 pairs, 4 triples, 1 quadruple (15), enumerated.
    const p = [...Array(4).fill(0.9 * qt), ...Array(6).fill((0.05 / 3) * qt), ...Array(4).fill(0.01 * qt), 0.02 * qt];
    const subsets: number[][] = [[0], [1], [2], [3], ...subsetsOfSize(4, 2), ...subsetsOfSize(4, 3), [0, 1, 2, 3]];
    const exact = enumerate(p, (x) => [0, 1, 2, 3].every((member) => subsets.some((s, v) => x[v]! && s.includes(member))));
    expect(rel(results.tops[0]!.probability.exact, exact)).toBeLessThanOrEqual(1e-12);
    expect(results.common_cause![0]!.testing).toBe('staggered');
    expect(results.common_cause![0]!.shared).toHaveLength(11);
  });

  it('members with unequal totals: independent parts keep their own Q_t, shared events use the mean, and a warning says so', () => {
    // The rule of common-cause.ts (a choice, documented there): Q_ind,i = (1 − β)Q_t,i, Q_ccf = β·mean(Q_t).
    const { results } = run({
      events: eventsYaml([['old-motor', 0.04], ['new-motor', 0.01]]),
      logic: `tops:
  both: { title: Both motors fail (invented), gate: both-fail }
gates:
  both-fail: { all: [old-motor, new-motor] }
common_cause:
  motors:
    members: [old-motor, new-motor]
    method: beta
    beta: { value: 0.1, source: test-data }
`,
    });
    const byId = new Map(results.events.map((e) => [e.id, e]));
    expect(rel(byId.get('old-motor')!.probability, 0.9 * 0.04)).toBeLessThanOrEqual(1e-15);
    expect(rel(byId.get('new-motor')!.probability, 0.9 * 0.01)).toBeLessThanOrEqual(1e-15);
    expect(rel(byId.get('motors/ccf-1-2')!.probability, 0.1 * 0.025)).toBeLessThanOrEqual(1e-15);
    // P(both) = 1 − (1 − Q_c)(1 − Q_old·Q_new) by hand, independent events.
    const want = 1 - (1 - 0.0025) * (1 - 0.036 * 0.009);
    expect(rel(results.tops[0]!.probability.exact, want)).toBeLessThanOrEqual(1e-12);
    expect(results.common_cause![0]!.unequal_totals).toBe(true);
    expect(results.warnings.find((w) => w.code === 'ccf-unequal-totals')?.message).toMatch(/mean/);
  });

  it('a member used under several gates is replaced everywhere', () => {
    // x is a member used by two gates; the top is OR of both, so P(top) = P(x or y or z) with x = x_ind ∨ ccf.
    const { results } = run({
      events: eventsYaml([['x', 0.1], ['w', 0.1], ['y', 0.2], ['z', 0.3]]),
      logic: `tops:
  t: { title: Either branch (invented), gate: top }
gates:
  top: { any: [g1, g2] }
  g1: { all: [x, y] }
  g2: { all: [x, z] }
  g3: { all: [w, y] }
common_cause:
  pair:
    members: [x, w]
    method: beta
    beta: { value: 0.2, source: test-data }
`,
    });
    // Variables x_ind (0.08), w_ind (0.08, unused by the top), ccf (0.02), y, z.
    const exact = enumerate([0.08, 0.02, 0.2, 0.3], (v) => (v[0]! || v[1]!) && (v[2]! || v[3]!));
    expect(rel(results.tops[0]!.probability.exact, exact)).toBeLessThanOrEqual(1e-12);
  });
});

describe('reading common-cause groups', () => {
  const events = eventsYaml([['a', 0.1], ['b', 0.1], ['c', 0.1]]) + '  s: { title: switch (invented), model: switch, on: false }\n';
  const logic = (group: string) => `tops:
  t: { title: t, gate: g }
gates:
  g: { all: [a, b, c, s] }
common_cause:
${group}`;
  const fails = (group: string): string => {
    try {
      studyOf({ settings: QUICK, events, logic: logic(group) });
    } catch (err) {
      if (err instanceof StudyErrors) return err.errors.map((e) => e.message).join('\n');
      if (err instanceof Error) return err.message;
    }
    return '';
  };

  it('refuses a switch as a member, an event in two groups, and testing with a method it does not change', () => {
    expect(fails('  g1: { members: [a, s], method: beta, beta: 0.1 }\n')).toMatch(/switch/);
    expect(fails('  g1: { members: [a, b], method: beta, beta: 0.1 }\n  g2: { members: [b, c], method: beta, beta: 0.1 }\n')).toMatch(/in common-cause groups 'g1' and 'g2'/);
    expect(fails('  g1: { members: [a, b], method: beta, testing: staggered, beta: 0.1 }\n')).toMatch(/testing/);
    expect(fails('  g1: { members: [a, b, c], method: alpha, alpha1: 0.9, alpha2: 0.05, alpha3: 0.04 }\n')).toMatch(/add up/);
    expect(fails('  g1: { members: [a, b, c], method: mgl, beta: 0.1 }\n')).toMatch(/gamma/);
  });
});
