/**
 * How many of n gates fail. References: the binomial distribution of @stdlib/stats-base-dists-binomial
 * (a general-purpose reference library) for independent like gates; conditioning on a shared event
 * by the law of total probability (common practice, no source) for gates that share one; brute-force
 * enumeration of all states for the Poisson-binomial. Every study number is INVENTED for the test.
 */
import binomial from '@stdlib/stats-base-dists-binomial';
import { describe, expect, it } from 'vitest';
import { poissonBinomial, tails } from '../../src/analysis/gate-counts.js';
import { enumerate, eventsYaml, rel, run } from './helpers.js';

/** n gates, gate i = any[<shared...>, hoist-i, brake-i]. */
function gatesStudy(n: number, shared: string[], hoist: number[], brake: number) {
  const events: [string, number][] = [];
  for (let i = 1; i <= n; i++) events.push([`hoist-${i}`, hoist[i - 1]!], [`brake-${i}`, brake]);
  const gates = Array.from({ length: n }, (_, k) => `  gate-${k + 1}: { any: [${[...shared, `hoist-${k + 1}`, `brake-${k + 1}`].join(', ')}] }`);
  return {
    events,
    logic: `tops:
  all-stuck: { title: Every gate fails (invented), gate: all-stuck }
gates:
  all-stuck: { all: [${gates.map((_, k) => `gate-${k + 1}`).join(', ')}] }
${gates.join('\n')}
counts:
  stuck:
    title: Gates that fail to open (invented)
    of: [${gates.map((_, k) => `gate-${k + 1}`).join(', ')}]
`,
  };
}

describe('gate-count distribution', () => {
  it('with no shared events equals the binomial (stdlib) and names it so', () => {
    const n = 5;
    const s = gatesStudy(n, [], Array(n).fill(0.03), 0.02);
    const { results } = run({ events: eventsYaml(s.events), logic: s.logic });
    const c = results.gate_counts![0]!;
    const q = 1 - (1 - 0.03) * (1 - 0.02);
    expect(c.independent_method).toBe('binomial');
    expect(c.exact).toHaveLength(n + 1);
    c.exact.forEach((x, j) => expect(rel(x, binomial.pmf(j, n, q))).toBeLessThanOrEqual(1e-12));
    c.independent.forEach((x, j) => expect(rel(x, binomial.pmf(j, n, q))).toBeLessThanOrEqual(1e-12));
    expect(Math.abs(c.exact.reduce((a, b) => a + b, 0) - 1)).toBeLessThanOrEqual(1e-14);
    // P(at least j) is the binomial upper tail: 1 − cdf(j − 1).
    c.at_least.exact.forEach((x, j) => expect(Math.abs(x - (j === 0 ? 1 : 1 - binomial.cdf(j - 1, n, q)))).toBeLessThanOrEqual(1e-14));
  });

  it('with a shared power event equals hand conditioning on that event, and sums to 1', () => {
    // Law of total probability: P(j) = P_s·[j = n] + (1 − P_s)·Binomial(j; n, q), q = P(own causes).
    const n = 4;
    const ps = 0.01;
    const s = gatesStudy(n, ['power-lost'], Array(n).fill(0.05), 0.01);
    const { results } = run({ events: eventsYaml([['power-lost', ps], ...s.events]), logic: s.logic });
    const c = results.gate_counts![0]!;
    const q = 1 - 0.95 * 0.99;
    for (let j = 0; j <= n; j++) {
      const want = (j === n ? ps : 0) + (1 - ps) * binomial.pmf(j, n, q);
      expect(rel(c.exact[j]!, want)).toBeLessThanOrEqual(1e-12);
    }
    expect(Math.abs(c.exact.reduce((a, b) => a + b, 0) - 1)).toBeLessThanOrEqual(1e-14);
    // The independent answer uses each gate's marginal P_s + (1 − P_s)q and misses the shared mass at j = n.
    const marginal = ps + (1 - ps) * q;
    c.of.forEach((g) => expect(rel(g.probability, marginal)).toBeLessThanOrEqual(1e-12));
    c.independent.forEach((x, j) => expect(rel(x, binomial.pmf(j, n, marginal))).toBeLessThanOrEqual(1e-12));
    // All n failing: at least P_s exactly, but only marginal^n ≈ 2.3e-5 < P_s as if independent.
    expect(c.exact[n]!).toBeGreaterThanOrEqual(ps);
    expect(c.independent[n]!).toBeLessThan(ps / 100);
    // The expected number failing is the same both ways (linearity of expectation; common practice, no source).
    expect(rel(c.mean.exact, c.mean.independent)).toBeLessThanOrEqual(1e-12);
  });

  it('with a beta-factor group on the hoists equals conditioning on the common-cause event', () => {
    // Beta factor (NUREG/CR-5485): Q_c = βQ_t shared by all, Q_ind = (1 − β)Q_t each; gate i = hoist i only.
    const n = 3;
    const qt = 0.04;
    const beta = 0.1;
    const events = Array.from({ length: n }, (_, i): [string, number] => [`hoist-${i + 1}`, qt]);
    const logic = `tops:
  all-stuck: { title: t, gate: all-stuck }
gates:
  all-stuck: { all: [gate-1, gate-2, gate-3] }
  gate-1: { any: [hoist-1] }
  gate-2: { any: [hoist-2] }
  gate-3: { any: [hoist-3] }
common_cause:
  hoists: { members: [hoist-1, hoist-2, hoist-3], method: beta, beta: { value: ${beta}, source: test-data } }
counts:
  stuck: { of: [gate-1, gate-2, gate-3] }
`;
    const { results } = run({ events: eventsYaml(events), logic });
    const c = results.gate_counts![0]!;
    const qc = beta * qt;
    const qi = (1 - beta) * qt;
    for (let j = 0; j <= n; j++) {
      const want = (j === n ? qc : 0) + (1 - qc) * binomial.pmf(j, n, qi);
      expect(rel(c.exact[j]!, want)).toBeLessThanOrEqual(1e-12);
    }
  });

  it('unequal marginals: the Poisson-binomial matches enumeration, and the result says which was used', () => {
    // Brute force over the 2^n states of independent events with unequal probabilities.
    const p = [0.3, 0.05, 0.12, 0.5, 0.01, 0.2];
    const dist = poissonBinomial(p);
    for (let j = 0; j <= p.length; j++) {
      const want = enumerate(p, (x) => x.filter(Boolean).length === j);
      expect(Math.abs(dist[j]! - want)).toBeLessThanOrEqual(1e-15);
    }
    expect(tails([0.5, 0.3, 0.2])).toEqual([1, 0.5, 0.2]);
    const s = gatesStudy(3, [], [0.01, 0.02, 0.08], 0.01);
    const { results } = run({ events: eventsYaml(s.events), logic: s.logic });
    expect(results.gate_counts![0]!.independent_method).toBe('poisson-binomial');
  });

  it('counts tops and basic events as well as gates', () => {
    const { results } = run({
      events: eventsYaml([['a', 0.1], ['b', 0.2]]),
      logic: `tops:
  t: { title: t, gate: g }
gates:
  g: { any: [a, b] }
counts:
  mixed: { of: [t, a, b] }
`,
    });
    const c = results.gate_counts![0]!;
    expect(c.of.map((x) => x.kind)).toEqual(['top', 'event', 'event']);
    // By enumeration: states of (a, b) and the count of {a∨b, a, b} that are true.
    const want = [0, 1, 2, 3].map((j) => enumerate([0.1, 0.2], (x) => Number(x[0]! || x[1]!) + Number(x[0]!) + Number(x[1]!) === j));
    c.exact.forEach((x, j) => expect(Math.abs(x - want[j]!)).toBeLessThanOrEqual(1e-15));
  });
});

describe('as-if-independent column with marginals near 1', () => {
  it('uses complements computed on the diagram, not 1 − marginal', () => {
    // Three gates, each failing unless all eight of its own events (p = 0.9 each) are absent:
    // P(gate works) = (1 − 0.9)^8 ≈ 1e-8, so P(no gate fails) = ((1 − 0.9)^8)^3 for independent
    // gates (product rule, common practice, no source). Forming 1 − (1 − 1e-8) keeps only 8 digits.
    const events: [string, number][] = [];
    const gates: string[] = [];
    for (let g = 1; g <= 3; g++) {
      const ids = Array.from({ length: 8 }, (_, i) => `e${g}-${i}`);
      for (const id of ids) events.push([id, 0.9]);
      gates.push(`  gate-${g}: { any: [${ids.join(', ')}] }`);
    }
    const logic = `tops:\n  all: { title: All fail (invented), gate: all }\ngates:\n  all: { all: [gate-1, gate-2, gate-3] }\n${gates.join('\n')}\ncounts:\n  stuck: { title: Gates that fail (invented), of: [gate-1, gate-2, gate-3] }\n`;
    const { results } = run({ events: eventsYaml(events), logic });
    const c = results.gate_counts![0]!;
    const works = Math.pow(1 - 0.9, 8);
    expect(rel(c.independent[0]!, works ** 3)).toBeLessThanOrEqual(1e-12);
    expect(rel(c.independent[1]!, 3 * (1 - works) * works ** 2)).toBeLessThanOrEqual(1e-12);
    // The gates share nothing, so the exact column agrees.
    expect(rel(c.exact[0]!, works ** 3)).toBeLessThanOrEqual(1e-12);
  });
});
