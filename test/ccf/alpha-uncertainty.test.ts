// Joint (Dirichlet) uncertainty of alpha factors (src/reliability/distributions.ts
// dirichletFromUniforms, src/analysis/sampling.ts, src/study/build.ts). References: NUREG/CR-5485
// (US NRC 1998) treats the alpha factors' uncertainty jointly, as a Dirichlet distribution, the
// factors summing to 1 (from memory); a Dirichlet(a_1…a_M) has marginals Beta(a_k, Σa − a_k) and
// means a_k/Σa (standard results, common practice, no source), checked against the @stdlib beta
// distribution (a general-purpose reference library). Every study number is INVENTED for the test.
import { rmSync } from 'node:fs';
import * as beta from '@stdlib/stats-base-dists-beta';
import { describe, expect, it } from 'vitest';
import { analyze } from '../../src/analysis/analyze.js';
import { parametersRead } from '../../src/analysis/event-plan.js';
import { ParameterSampler, uniformRows } from '../../src/analysis/sampling.js';
import { dirichletFromUniforms } from '../../src/reliability/distributions.js';
import { createRng } from '../../src/reliability/random.js';
import { StudyError, StudyErrors } from '../../src/study/errors.js';
import { readStudy } from '../../src/study/read.js';
import type { Study } from '../../src/study/types.js';
import { writeStudy } from '../analysis/helpers.js';

/** Asymptotic standard error of a sample p-quantile, √(p(1 − p)/n)/f(x_p) (common practice, no source). */
const quantileSe = (p: number, n: number, pdf: number) => Math.sqrt((p * (1 - p)) / n) / pdf;

function quantile7(sorted: Float64Array, p: number): number {
  const h = (sorted.length - 1) * p;
  const lo = Math.floor(h);
  return sorted[lo]! + (h - lo) * (sorted[Math.min(sorted.length - 1, lo + 1)]! - sorted[lo]!);
}

describe('Dirichlet draws from gamma variates', () => {
  const a = [18, 1.5, 0.5];
  const A = a.reduce((s, x) => s + x, 0);
  const N = 20_000;
  const rng = createRng(404);
  const draws = a.map(() => new Float64Array(N));
  const out = new Float64Array(a.length);
  let worstSum = 0;
  for (let t = 0; t < N; t++) {
    expect(dirichletFromUniforms(a, a.map(() => rng.next()), out)).toBe(true);
    let s = 0;
    out.forEach((x, k) => {
      draws[k]![t] = x;
      s += x;
    });
    worstSum = Math.max(worstSum, Math.abs(s - 1));
  }

  it('every draw is a set of factors in (0, 1) that add up to 1', () => {
    expect(worstSum).toBeLessThan(1e-15);
    for (const d of draws) for (const x of d) expect(x > 0 && x < 1).toBe(true);
  });

  it('each marginal is Beta(a_k, Σa − a_k): 5th, 50th and 95th percentiles against @stdlib within 3.5 standard errors', () => {
    a.forEach((ak, k) => {
      const sorted = Float64Array.from(draws[k]!).sort();
      for (const p of [0.05, 0.5, 0.95]) {
        const want = beta.quantile(p, ak, A - ak);
        const se = quantileSe(p, N, beta.pdf(want, ak, A - ak));
        expect(Math.abs(quantile7(sorted, p) - want), `a${k + 1} at ${p}`).toBeLessThan(3.5 * se);
      }
      // Mean a_k/Σa within 3 standard errors of the Beta's sd.
      const mean = draws[k]!.reduce((s, x) => s + x, 0) / N;
      expect(Math.abs(mean - ak / A)).toBeLessThan((3 * Math.sqrt(beta.variance(ak, A - ak))) / Math.sqrt(N));
    });
  });
});

const EVENTS = `events:
  a: { title: Pump a (invented), model: fixed, probability: { value: 2e-3, source: test-data } }
  b: { title: Pump b (invented), model: fixed, probability: { value: 2e-3, source: test-data } }
  c: { title: Pump c (invented), model: fixed, probability: { value: 2e-3, source: test-data } }
`;
const logicWith = (group: string) => `tops:
  a-fails: { title: Pump a fails from any cause (invented), gate: ga }
gates:
  ga: { any: [a] }
  all3: { all: [a, b, c] }
common_cause:
  pumps:
${group}`;

function read(group: string, settings = '  samples: 4000\n  seed: 9\n  horizon: 0'): Study {
  const dir = writeStudy({ events: EVENTS, logic: logicWith(group), settings });
  try {
    return readStudy(dir);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

const STAGGERED = `    members: [a, b, c]
    method: alpha
    testing: staggered
    alpha1: { value: 0.9, source: test-data }
    alpha2: { value: 0.06, source: test-data }
    alpha3: { value: 0.04, source: test-data }
`;

describe('alpha factors sampled jointly in the Monte Carlo', () => {
  it('every trial\u2019s factors add up to 1 and stay in (0, 1) (per-factor sampling put alpha2 above 1)', () => {
    const study = read(STAGGERED + '    uncertainty: { dirichlet: { concentration: 25 } }\n');
    expect(study.commonCause[0]!.dirichlet!.a.map((x) => Number(x.toFixed(12)))).toEqual([22.5, 1.5, 1]);
    const sampler = new ParameterSampler(study, parametersRead(study));
    expect(sampler.dimensions).toBe(3);
    const keys = ['pumps.alpha1', 'pumps.alpha2', 'pumps.alpha3'].map((k) => study.parameters.findIndex((p) => p.key === k));
    const rows = uniformRows(9, 'monte-carlo', 2000, 3);
    const u = new Float64Array(3);
    const values = Float64Array.from(study.parameters, (p) => p.value);
    const sums = new Float64Array(keys.length);
    for (let t = 0; t < 2000; t++) {
      rows.row(t, u);
      sampler.apply(u, values, t);
      const alphas = keys.map((i) => values[i]!);
      expect(Math.abs(alphas.reduce((s, x) => s + x, 0) - 1)).toBeLessThan(1e-15);
      for (const x of alphas) expect(x > 0 && x < 1).toBe(true);
      alphas.forEach((x, k) => (sums[k] += x));
    }
    // The sampled means are the stated alphas (the Dirichlet's mean), within 3 standard errors.
    [0.9, 0.06, 0.04].forEach((alpha, k) => {
      const sd = Math.sqrt((alpha * (1 - alpha)) / (25 + 1)); // Var = α(1 − α)/(A + 1) (Dirichlet marginal)
      expect(Math.abs(sums[k]! / 2000 - alpha)).toBeLessThan((3 * sd) / Math.sqrt(2000));
    });
  });

  it('with staggered testing a member whose total is certain keeps its mean (Σ_k C(m−1,k−1) f_k = Σ α_k = 1 in every trial)', () => {
    const results = analyze(read(STAGGERED + '    uncertainty: { dirichlet: [45, 3, 2] }\n'));
    const u = results.uncertainty![0]!;
    const point = results.tops[0]!.probability.exact;
    expect(u.sampled_parameters).toEqual(['pumps.alpha1', 'pumps.alpha2', 'pumps.alpha3']);
    // P(a fails) = P(a's own part or a shared event with a): first order Q_t in every trial; what varies
    // is second order, relative terms of order Q_t = 2e-3, so the mean stays within 1e-4 relative (it
    // was 2.4 % high) and the 5th to 95th percentiles within Q_t of each other.
    expect(Math.abs(u.mean - point) / point).toBeLessThan(1e-4);
    expect(u.p95 / u.p05 - 1).toBeLessThan(2e-3);
    expect(results.common_cause![0]!.dirichlet).toEqual([45, 3, 2]);
  });
});

describe('how an alpha-factor uncertainty may be stated', () => {
  const message = (group: string): string => {
    try {
      read(group);
    } catch (err) {
      if (err instanceof StudyErrors) return err.errors.map((e) => `${e.message} | ${e.hint ?? ''} | ${e.at?.file}:${e.at?.line}`).join('\n');
      if (err instanceof StudyError) return `${err.message} | ${err.hint ?? ''} | ${err.at?.file}:${err.at?.line}`;
      throw err;
    }
    return '';
  };

  it('refuses an uncertainty on a single alpha factor, at its line, saying how to state it', () => {
    const m = message(STAGGERED.replace('alpha2: { value: 0.06, source: test-data }', 'alpha2: { value: 0.06, source: test-data, uncertainty: { lognormal: { median: 0.06, ef: 3 } } }'));
    expect(m).toContain("'alpha2' states an uncertainty of its own");
    expect(m).toContain('uncertainty: { dirichlet: { concentration: 40 } }');
    expect(m).toContain('logic.yaml:12');
  });

  it('refuses a Dirichlet whose mean is not the stated alphas, one of the wrong length, and one on a beta-factor group', () => {
    expect(message(STAGGERED + '    uncertainty: { dirichlet: [40, 5, 5] }\n')).toMatch(/mean \(0\.8000, 0\.1000, 0\.1000\) is not the stated alphas/);
    expect(message(STAGGERED + '    uncertainty: { dirichlet: [45, 3] }\n')).toMatch(/2 parameters for 3 alpha factors|dirichlet/);
    expect(message('    members: [a, b, c]\n    method: beta\n    beta: 0.1\n    uncertainty: { dirichlet: { concentration: 20 } }\n')).toMatch(/alpha factors' joint one/);
  });
});
