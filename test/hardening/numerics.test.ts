/**
 * Numerics at the edges: probabilities below 1e-15 and close to 1 keep their digits through the
 * failure models, the decision diagram and the whole command; and the node budget either stops the
 * run with a suggestion or, when asked, falls back on cut-set bounds that are reported as bounds.
 *
 * Each expected value is worked here from the formula itself, independently of the code under test
 * (series expansions, binomial expansions, exact rational arithmetic with BigInt).
 */
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { faultbook, tempDir } from '../cli/helpers.js';
import { compile, cutSetBounds, minimalCutSets, probability, probabilityPair, type LogicGraph } from '../../src/logic/index.js';
import {
  demandProbability,
  modelProbability,
  rateProbability,
  repairableUnavailability,
  testedUnavailability,
  weibullCdf,
  weibullConditionalFailure,
  weibullEventProbability,
} from '../../src/reliability/models/index.js';
import { earlierOutputs, expectNoStackTrace, snapshot } from './harness.js';

/** |got − want| ≤ rel·|want|: agreement in relative terms, the only fair test for tiny numbers. */
function expectRelative(got: number, want: number, rel: number): void {
  expect(Number.isFinite(got)).toBe(true);
  expect(Math.abs(got - want)).toBeLessThanOrEqual(rel * Math.abs(want));
}

describe('failure models with extreme inputs (public API of src/reliability/models)', () => {
  it('rate and repairable keep a probability of 1e-18 (1 − e^(−x) = x − x²/2 + …, x/(1 + x) = x − x² + …)', () => {
    // Series expansions (common practice, no source): the second terms are 1e-36, far below a double's reach.
    expectRelative(rateProbability(1e-18, 1), 1e-18, 1e-15);
    expectRelative(rateProbability(3e-9 / 8766, 8766), 3e-9 - 4.5e-18, 1e-15);
    expectRelative(repairableUnavailability(1e-18, 1), 1e-18, 1e-15);
    expectRelative(modelProbability('rate', { rate: 2e-20, exposure: 0.5 }), 1e-20, 1e-15);
  });

  it('rate close to 1: 1 − e^(−λt) for λt = 20 is 1 − 2.06e-9 (the complement is not lost)', () => {
    // e^(−20) = 2.061153622438558e-9 (common practice, no source): the result carries it to double precision.
    expectRelative(1 - rateProbability(20, 1), 2.061153622438558e-9, 1e-7);
    expect(rateProbability(800, 1)).toBe(1);
  });

  it('tested: λT = 1e-16 gives λT/2 − (λT)²/6 (IEC 61508-6 Annex B limit, from the series)', () => {
    expectRelative(testedUnavailability({ rate: 1e-16, interval: 1 }), 5e-17, 1e-15);
    expectRelative(testedUnavailability({ rate: 1e-3, interval: 1e-12 }), 5e-16, 1e-14);
  });

  it('demand: q_d = 1e-18 with a hidden standby part 5e-19 combine to 1.5e-18, not 0', () => {
    // 1 − (1 − q)(1 − u) = q + u − q·u = 1.5e-18 − 5e-37 (algebra; formula of tested.ts).
    // Standby part: λT/2 − (λT)²/6 for λT = 1e-18 (series of the tested model).
    expectRelative(demandProbability({ probability: 1e-18, rate: 1e-18, interval: 1 }), 1.5e-18, 1e-15);
    expectRelative(demandProbability({ probability: 1e-18 }), 1e-18, 0);
  });

  it('weibull: F(t) far below η is (t/η)^β to full precision', () => {
    // 1 − e^(−H) with H = (1e-6)^3 = 1e-18: H − H²/2 … (series, common practice).
    expectRelative(weibullCdf(1e-6, 3, 1), 1e-18, 1e-15);
    // H = (2e-5)^2.5 = 1.79e-12: F = H − H²/2 + … (the second term is 9e-13 relative and must be there).
    const H = Math.pow(2e-5, 2.5);
    expectRelative(weibullCdf(2e-5 * 60, 2.5, 60), H - (H * H) / 2, 1e-14);
  });

  it('weibull: conditional failure at an age where R(a) underflows is still right (no 0/0)', () => {
    // β = 4, η = 1, a = 30 (R(a) = e^(−810 000) = 0 in doubles), τ = 1e-9:
    // ΔH = Σₖ C(4,k) a^(4−k) τ^k (binomial expansion, every term positive) and q = 1 − e^(−ΔH).
    const a = 30;
    const tau = 1e-9;
    const dH = 4 * a ** 3 * tau + 6 * a ** 2 * tau ** 2 + 4 * a * tau ** 3 + tau ** 4;
    expectRelative(weibullConditionalFailure(a, tau, 4, 1), -Math.expm1(-dH), 1e-12);
    // And a tiny conditional probability: a = 1e-3, τ = 1e-9, β = 2, η = 1: ΔH = 2aτ + τ² = 2e-12 + 1e-18.
    expectRelative(weibullConditionalFailure(1e-3, 1e-9, 2, 1), -Math.expm1(-(2e-12 + 1e-18)), 1e-12);
  });

  it('weibull with a very large shape is a step at η: 0 before it, 1 past it (no 0·∞)', () => {
    // β → ∞: F(t) → 0 for t < η and 1 for t > η (common practice, no source). With u = a/η < 1 the
    // factor u^β underflows to 0 while the growth factor overflows; the product is still exactly 0 here.
    expect(weibullConditionalFailure(36, 1 / 12, 1e300, 60)).toBe(0);
    expect(weibullConditionalFailure(36, 1, 11943, 60)).toBe(0);
    expect(weibullEventProbability({ shape: 4e89, scale: 60, age: 36, exercise: 1 / 12, basis: 'average' })).toBe(0);
    // Crossing η within the interval: certain failure.
    expect(weibullConditionalFailure(59.95, 0.1, 1e6, 60)).toBe(1);
    // A large but ordinary shape still agrees with the direct form H(a + s) − H(a) (no cancellation there).
    const dH = Math.pow(59 / 60, 200) - Math.pow(58 / 60, 200);
    expectRelative(weibullConditionalFailure(58, 1, 200, 60), -Math.expm1(-dH), 1e-12);
  });

  it('weibull with exercise and repair: a 1e-18 conditional probability is not swallowed by the repair term', () => {
    // β = 1, η = 1e18 years, a = 1, τ = 1: q = 1 − e^(−1e-18) = 1e-18; found per year q/τ, MTTR 0.1:
    // q_rep = 1e-19; 1 − (1 − q)(1 − q_rep) = 1.1e-18 − 1e-37 (weibull.ts formula, algebra by hand).
    expectRelative(weibullEventProbability({ shape: 1, scale: 1e18, age: 1, exercise: 1, repair: 0.1 }), 1.1e-18, 1e-15);
  });
});

/** A graph of single gates over n variables. */
function oneGate(op: 'or' | 'and', n: number): LogicGraph {
  return {
    variables: Array.from({ length: n }, (_, i) => `e${i}`),
    gates: [{ id: 'top', op, inputs: Array.from({ length: n }, (_, i) => ({ kind: 'var' as const, index: i })) }],
  };
}

describe('top-event probability at the edges (src/logic)', () => {
  it('an OR of three 1e-18 events is 3e-18 exactly, and so are the rare-event sum and the MCUB', () => {
    // 1 − (1 − 1e-18)³ = 3e-18 − 3e-36 + 1e-54 (binomial expansion): 3e-18 to double precision.
    const g = oneGate('or', 3);
    const p = [1e-18, 1e-18, 1e-18];
    const c = compile(g);
    const root = c.gateRoots[0]!;
    expectRelative(probability(c.manager, root, p), 3e-18, 1e-15);
    const bounds = cutSetBounds(minimalCutSets(c.manager, root, p).sets);
    expectRelative(bounds.rareEvent, 3e-18, 1e-15);
    expectRelative(bounds.mcub, 3e-18, 1e-15);
  });

  it('an OR of a 1e-18 event with a 1e-3 event keeps the small one in the sum', () => {
    // 1e-3 + 1e-18 − 1e-21: the small term shifts the result by 1e-15 relative, below a double's resolution
    // next to 1e-3, so only check nothing cancelled: the result is 1e-3 + 1e-18 − 1e-21 to rounding.
    const c = compile(oneGate('or', 2));
    expectRelative(probability(c.manager, c.gateRoots[0]!, [1e-3, 1e-18]), 1e-3 + 1e-18 - 1e-21, 2e-16);
  });

  it('an AND of four events with p = 1 − 2⁻³⁰: P and its complement match exact rational arithmetic', () => {
    const p = 1 - 2 ** -30; // exactly representable
    const c = compile(oneGate('and', 4));
    const root = c.gateRoots[0]!;
    const { p: P, q: Q } = probabilityPair(c.manager, root, [p, p, p, p]);
    // Exact: P = (2³⁰ − 1)⁴ / 2¹²⁰ and 1 − P = (2¹²⁰ − (2³⁰ − 1)⁴) / 2¹²⁰, with BigInt.
    const num = (2n ** 30n - 1n) ** 4n;
    const den = 2n ** 120n;
    const exactQ = Number(den - num) / 2 ** 120;
    const exactP = 1 - exactQ; // P itself is within a rounding of 1 − 4·2⁻³⁰
    expectRelative(Q, exactQ, 1e-15);
    expectRelative(P, exactP, 2e-16);
  });

  it('an OR of events near 1: the complement 2⁻¹²⁰ is not rounded to 0', () => {
    const p = 1 - 2 ** -30;
    const c = compile(oneGate('or', 4));
    const { p: P, q: Q } = probabilityPair(c.manager, c.gateRoots[0]!, [p, p, p, p]);
    expect(P).toBe(1);
    // Π(1 − p) = 2⁻¹²⁰ exactly (each 1 − p = 2⁻³⁰ is exact).
    expect(Q).toBe(2 ** -120);
  });
});

// --- through the whole command ------------------------------------------------------------------

function writeStudy(files: Record<string, string>): string {
  const dir = join(tempDir('faultbook-numerics-'), 'study');
  for (const [name, text] of Object.entries(files)) {
    mkdirSync(join(dir, name, '..'), { recursive: true });
    writeFileSync(join(dir, name), text);
  }
  return dir;
}

const HEADER = `# Invented study for faultbook's numerics tests: no real facility; every number is invented.
format: faultbook/1
title: Invented numerics check
as_of: 2026-06-30
`;

async function runJson(study: string): Promise<{ code: number; stdout: string; stderr: string; results?: any }> {
  const out = join(tempDir(), 'out');
  const r = await faultbook('run', study, '--format', 'json', '--out', out);
  if (r.code !== 0) return r;
  return { ...r, results: JSON.parse(readFileSync(join(out, 'results.json'), 'utf8')) };
}

describe('extreme probabilities through faultbook run', () => {
  it('an OR of three 1e-18 events and an AND of three events near 1 come out exact in results.json', async () => {
    const study = writeStudy({
      'study.yaml':
        HEADER +
        `settings: { cutoff: 0 }
tops:
  tiny: { title: Any of three very rare events, gate: any-rare }
  near-one: { title: All of three near-certain events, gate: all-likely }
gates:
  any-rare: { any: [r1, r2, r3] }
  all-likely: { all: [l1, l2, l3] }
events:
  r1: { model: fixed, probability: 1e-18, source: invented }
  r2: { model: fixed, probability: 1e-18, source: invented }
  r3: { model: rate, rate: 1e-18 /year, exposure: 1 year, source: invented }
  l1: { model: fixed, probability: 0.999999999, source: invented }
  l2: { model: fixed, probability: 0.999999999, source: invented }
  l3: { model: fixed, probability: 0.999999999, source: invented }
sources:
  invented: { title: Invented values for a numerics test, invented: true }
`,
    });
    const r = await runJson(study);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const tiny = r.results.tops.find((t: { id: string }) => t.id === 'tiny');
    // 1 − (1 − 1e-18)³ = 3e-18 to double precision (binomial expansion).
    expectRelative(tiny.probability.exact, 3e-18, 1e-15);
    expectRelative(tiny.probability.rare_event, 3e-18, 1e-15);
    expectRelative(tiny.probability.mcub, 3e-18, 1e-15);
    expect(tiny.cut_sets).toHaveLength(3);
    const near = r.results.tops.find((t: { id: string }) => t.id === 'near-one');
    // (1 − 1e-9)³ = 1 − 3e-9 + 3e-18 − 1e-27 (binomial expansion).
    expectRelative(near.probability.exact, 1 - 3e-9 + 3e-18, 2e-16);
    expect(r.stdout).toContain('tiny: 3.00E-18 (exact;');
  });
});

// --- the node budget -----------------------------------------------------------------------------

/**
 * A model whose diagram needs more than 1,000 nodes (the smallest budget the schema allows): an OR of
 * 1,100 rare events (each has a node of its own), beside a 2-out-of-3 vote, under one OR.
 */
const N_RARE = 1100;
const rareP = (i: number) => 1e-6 * (1 + (i % 10));
const VOTE_P = 0.1;

function budgetStudy(settings: string): string {
  const ids = Array.from({ length: N_RARE }, (_, i) => `r${i}`);
  const events = ids.map((id, i) => `  ${id}: { model: fixed, probability: ${rareP(i)}, source: invented }`).join('\n');
  return writeStudy({
    'study.yaml': HEADER + `settings: { ${settings} }\n`,
    'logic.yaml': `# Logic of the invented numerics check.
tops:
  station-fails: { title: Invented station fails, gate: top }
gates:
  top: { any: [many-rare, two-of-three] }
  many-rare: { any: [${ids.join(', ')}] }
  two-of-three: { atleast: 2, of: [x, y, z] }
`,
    'events.yaml': `events:
${events}
  x: { model: fixed, probability: ${VOTE_P}, source: invented }
  y: { model: fixed, probability: ${VOTE_P}, source: invented }
  z: { model: fixed, probability: ${VOTE_P}, source: invented }
`,
    'sources.yaml': 'sources:\n  invented: { title: Invented values for a numerics test, invented: true }\n',
  });
}

// Exact by hand: q_or = 1 − Π(1 − pᵢ); q_vote = 3p²(1 − p) + p³; P = 1 − (1 − q_or)(1 − q_vote)
// (independent events, common practice). The minimal cut sets are the 1,100 singletons and the three
// pairs of the vote, so the MCUB over all of them is 1 − Π(1 − pᵢ)·(1 − p²)³ (NUREG-0492 ch. XI).
let logNoRare = 0;
for (let i = 0; i < N_RARE; i++) logNoRare += Math.log1p(-rareP(i));
const qVote = 3 * VOTE_P ** 2 * (1 - VOTE_P) + VOTE_P ** 3;
const EXACT = -Math.expm1(logNoRare + Math.log1p(-qVote));
const MCUB_ALL = -Math.expm1(logNoRare + 3 * Math.log1p(-(VOTE_P ** 2)));

describe('the node budget (settings.max_nodes, settings.on_node_budget)', () => {
  it('a large enough budget gives the exact value', async () => {
    const r = await runJson(budgetStudy('max_nodes: 1000000, cutoff: 0'));
    expect(r.code).toBe(0);
    const top = r.results.tops[0];
    expect(top.probability.basis).toBe('exact');
    expectRelative(top.probability.exact, EXACT, 1e-12);
    expect(EXACT).toBeLessThan(MCUB_ALL);
  });

  it('a tiny budget stops the run with exit 2 and says what to do; earlier outputs stay', async () => {
    const study = budgetStudy('max_nodes: 1000');
    const out = earlierOutputs();
    const before = snapshot(out);
    const r = await faultbook('run', study, '--out', out);
    expect(r.code).toBe(2);
    expectNoStackTrace(r.stderr);
    expect(r.stderr).toContain('outgrew settings.max_nodes (1,000 nodes)');
    expect(r.stderr).toMatch(/expected: .*larger settings\.max_nodes.*on_node_budget: bounds/);
    expect(snapshot(out)).toEqual(before);
  });

  it('with on_node_budget: bounds the run goes on, and the number is reported as an upper bound', async () => {
    // cutoff 3e-6 drops the singletons of 1e-6 and 2e-6; the bound must still cover them.
    const r = await runJson(budgetStudy('max_nodes: 1000, on_node_budget: bounds, cutoff: 3e-6'));
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(/warning: .*UPPER BOUND.*\[node-budget-bounds\]/);
    expect(r.stdout).toMatch(/station-fails: \S+ \(upper bound, not exact;/);
    const top = r.results.tops[0];
    expect(top.probability.basis).toBe('bound');
    // A true upper bound (theorem: exact ≤ MCUB over a cover), and here equal to the MCUB of ALL the
    // minimal cut sets, dropped ones included.
    expect(top.probability.exact).toBeGreaterThanOrEqual(EXACT);
    expectRelative(top.probability.exact, MCUB_ALL, 1e-12);
    // The listed sets are those above the cutoff: 880 singletons and the three pairs.
    expect(top.cut_sets).toHaveLength(N_RARE - 220 + 3);
    expect(top.cut_set_summary.truncated).toBe(220);
    // rare_event and mcub keep their meaning (over the listed sets): below the reported bound here.
    expect(top.probability.mcub).toBeLessThan(top.probability.exact);
    expect(top.probability.mcub).toBeLessThanOrEqual(top.probability.rare_event);
    expect(r.results.warnings.map((w: { code: string }) => w.code)).toContain('node-budget-bounds');
  });

  it('the appendix of a bounded run says the number is a bound', async () => {
    const study = budgetStudy('max_nodes: 1000, on_node_budget: bounds, cutoff: 3e-6');
    const out = join(tempDir(), 'out');
    const r = await faultbook('run', study, '--format', 'html', '--out', out, '--quiet');
    expect(r.code).toBe(0);
    const text = readFileSync(join(out, 'appendix.html'), 'utf8').replace(/<[^>]+>/g, ' ').replace(/\s+/g, ' ');
    expect(text).toContain('This result is a bound, not an exact value');
    expect(text).toMatch(/UPPER BOUND/);
  }, 60_000);

  it('with on_node_budget: bounds and nothing cut off, the bound is the MCUB of every minimal cut set', async () => {
    const r = await runJson(budgetStudy('max_nodes: 1000, on_node_budget: bounds, cutoff: 0'));
    expect(r.code).toBe(0);
    const top = r.results.tops[0];
    expectRelative(top.probability.exact, MCUB_ALL, 1e-12);
    expectRelative(top.probability.mcub, MCUB_ALL, 1e-12);
    expect(top.cut_sets).toHaveLength(N_RARE + 3);
  });
});
