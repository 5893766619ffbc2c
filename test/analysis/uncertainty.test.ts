// Monte Carlo and Latin hypercube propagation (src/analysis/uncertainty.ts, sampling.ts) on
// one- and two-event studies built here (invented data), against closed-form moments (NUREG/CR-6823,
// Handbook of Parameter Estimation for PRA, US NRC 2003, for the error-factor lognormal) and
// @stdlib quantiles (a general-purpose reference library).
import { describe, expect, it } from 'vitest';
import * as lognormal from '@stdlib/stats-base-dists-lognormal';
import * as gammaDist from '@stdlib/stats-base-dists-gamma';
import { analyze } from '../../src/analysis/analyze.js';
import { ParameterSampler, cholesky2, uniformRows } from '../../src/analysis/sampling.js';
import { parametersRead } from '../../src/analysis/event-plan.js';
import { buildLogicModel } from '../../src/analysis/logic-model.js';
import { compileCase } from '../../src/analysis/quantify.js';
import { CaseQuantifier } from '../../src/analysis/case-quantifier.js';
import { monteCarlo } from '../../src/analysis/uncertainty.js';
import { StudyError } from '../../src/study/errors.js';
import type { FitSpec, Study } from '../../src/study/types.js';
import { studyOf } from './helpers.js';

const ONE_EVENT_LOGIC = 'tops:\n  t: { title: The one event, gate: g }\ngates:\n  g: { any: [e] }\n';

/** The point value sits inside its distribution (a point outside its own 1st–99th percentile is an input error). */
function oneEvent(uncertainty: string, settings: string, value = '1e-3'): Study {
  return studyOf({
    events: `events:\n  e: { title: One event (invented), model: fixed, probability: { value: ${value}, source: test-data, uncertainty: ${uncertainty} } }\n`,
    logic: ONE_EVENT_LOGIC,
    settings,
  });
}

const M = 1e-3;
const EF = 3;
const SIGMA = Math.log(EF) / 1.645; // NUREG/CR-6823: σ = ln(EF)/1.645
const N = 100_000;

/** Asymptotic standard error of the sample p-quantile: √(p(1 − p)/n)/f(x_p) (common practice, no source). */
const quantileSe = (p: number, n: number, x: number, pdf: (x: number) => number) => Math.sqrt((p * (1 - p)) / n) / pdf(x);

describe('plain Monte Carlo, lognormal by median and error factor', () => {
  const study = oneEvent(`{ lognormal: { median: ${M}, ef: ${EF} } }`, `  samples: ${N}\n  seed: 11\n  horizon: 0`);
  const u = analyze(study).uncertainty![0]!;

  it('the sampled mean is within 3 standard errors of m·exp(σ²/2) (NUREG/CR-6823)', () => {
    const mean = M * Math.exp((SIGMA * SIGMA) / 2);
    // Lognormal variance m²e^{σ²}(e^{σ²} − 1) (standard lognormal moments).
    const sd = M * Math.sqrt(Math.exp(SIGMA * SIGMA) * Math.expm1(SIGMA * SIGMA));
    expect(Math.abs(u.mean - mean)).toBeLessThan((3 * sd) / Math.sqrt(N));
    expect(u.standard_error).toBeCloseTo(u.sd / Math.sqrt(N), 15);
    expect(u.samples).toBe(N);
    expect(u.method).toBe('monte-carlo');
  });

  it('the sampled variance is within 3 standard errors of m²e^{σ²}(e^{σ²} − 1)', () => {
    const s2 = SIGMA * SIGMA;
    const variance = M * M * Math.exp(s2) * Math.expm1(s2);
    // Var(sample variance) ≈ σ⁴(κ + 2)/n with the lognormal excess kurtosis
    // κ = e^{4s²} + 2e^{3s²} + 3e^{2s²} − 6 (standard lognormal moments, common practice, no source).
    const kurt = Math.exp(4 * s2) + 2 * Math.exp(3 * s2) + 3 * Math.exp(2 * s2) - 6;
    const se = variance * Math.sqrt((kurt + 2) / N);
    expect(Math.abs(u.sd * u.sd - variance)).toBeLessThan(3 * se);
  });

  it('the 5th, 50th and 95th percentiles agree with @stdlib lognormal quantiles within 3.5 standard errors', () => {
    const mu = Math.log(M);
    const pdf = (x: number) => lognormal.pdf(x, mu, SIGMA);
    for (const [p, got] of [[0.05, u.p05], [0.5, u.median], [0.95, u.p95]] as const) {
      const want = lognormal.quantile(p, mu, SIGMA);
      expect(Math.abs(got - want)).toBeLessThan(3.5 * quantileSe(p, N, want, pdf));
    }
    // The EF is the 95th over the 50th percentile (NUREG/CR-6823).
    expect(u.p95 / u.median).toBeGreaterThan(EF * 0.97);
    expect(u.p95 / u.median).toBeLessThan(EF * 1.03);
  });

  it('the cumulative curve is the sample quantiles at the fixed probabilities, increasing', () => {
    const at = (p: number) => u.cdf.find((x) => x.p === p)!.value;
    expect(at(0.5)).toBe(u.median);
    expect(at(0.05)).toBe(u.p05);
    expect(at(0.95)).toBe(u.p95);
    for (let k = 1; k < u.cdf.length; k++) expect(u.cdf[k]!.value).toBeGreaterThanOrEqual(u.cdf[k - 1]!.value);
  });

  it('the histogram holds every trial, in log-spaced bins', () => {
    const { edges, counts, zeros } = u.histogram;
    expect(zeros).toBe(0);
    expect(counts.reduce((a, b) => a + b, 0)).toBe(N);
    expect(edges.length).toBe(counts.length + 1);
    const ratio = edges[1]! / edges[0]!;
    for (let k = 1; k < edges.length; k++) expect(edges[k]! / edges[k - 1]!).toBeCloseTo(ratio, 9);
    // The bins span the smallest to the largest trial, so they enclose the 1st and 99th percentiles.
    expect(edges[0]).toBeLessThanOrEqual(u.cdf[0]!.value);
    expect(edges[edges.length - 1]).toBeGreaterThanOrEqual(u.cdf[u.cdf.length - 1]!.value);
  });

  it('the convergence check compares the 95th percentile of the first half with that of all trials', () => {
    expect(u.convergence.p95_full).toBe(u.p95);
    expect(u.convergence.relative_change).toBeCloseTo(Math.abs(u.p95 - u.convergence.p95_half) / u.p95, 15);
    expect(u.convergence.relative_change).toBeLessThan(0.05);
  });

  it('the same seed gives identical numbers; another seed gives others', () => {
    expect(analyze(study).uncertainty).toEqual(analyze(study).uncertainty);
    const other = oneEvent(`{ lognormal: { median: ${M}, ef: ${EF} } }`, `  samples: ${N}\n  seed: 12\n  horizon: 0`);
    expect(analyze(other).uncertainty![0]!.mean).not.toBe(u.mean);
  });
});

describe('Latin hypercube sampling', () => {
  it('puts exactly one trial in each of n equal-probability strata (McKay, Beckman & Conover 1979)', () => {
    const n = 1000;
    const study = oneEvent('{ uniform: { min: 1e-3, max: 2e-3 } }', `  samples: ${n}\n  seed: 3\n  sampling: latin-hypercube\n  horizon: 0`, '1.5e-3');
    const q = new CaseQuantifier(study, buildLogicModel(study), compileCase(study, buildLogicModel(study), new Map()));
    const run = monteCarlo(study, q)!;
    expect(run.method).toBe('latin-hypercube');
    const strata = new Set(Array.from(run.values[0]!, (v) => Math.floor(((v - 1e-3) / 1e-3) * n)));
    expect(strata.size).toBe(n);
  });

  it('its 95th percentile of a lognormal sits within two strata of 0.95 on the @stdlib CDF', () => {
    const n = 20_000;
    const study = oneEvent(`{ lognormal: { median: ${M}, ef: ${EF} } }`, `  samples: ${n}\n  seed: 5\n  sampling: latin-hypercube\n  horizon: 0`);
    const u = analyze(study).uncertainty![0]!;
    expect(u.method).toBe('latin-hypercube');
    const F = lognormal.cdf(u.p95, Math.log(M), SIGMA);
    expect(Math.abs(F - 0.95)).toBeLessThan(2 / n);
  });
});

describe('other distributions through the same path', () => {
  it('gamma (shape 4, scale 2.5e-4): percentiles agree with @stdlib gamma quantiles (rate = 1/scale)', () => {
    const study = oneEvent('{ gamma: { shape: 4, scale: 2.5e-4 } }', `  samples: ${N}\n  seed: 21\n  horizon: 0`);
    const u = analyze(study).uncertainty![0]!;
    const pdf = (x: number) => gammaDist.pdf(x, 4, 4000);
    for (const [p, got] of [[0.05, u.p05], [0.5, u.median], [0.95, u.p95]] as const) {
      const want = gammaDist.quantile(p, 4, 4000);
      expect(Math.abs(got - want)).toBeLessThan(3.5 * quantileSe(p, N, want, pdf));
    }
    // Mean shape·scale = 1e-3, sd √shape·scale = 5e-4 (standard gamma moments).
    expect(Math.abs(u.mean - 1e-3)).toBeLessThan((3 * 5e-4) / Math.sqrt(N));
  });

  it('a sampled probability above 1 is set to 1 and the trials counted', () => {
    const study = oneEvent('{ lognormal: { median: 0.5, ef: 10 } }', '  samples: 5000\n  seed: 2\n  horizon: 0', '0.5');
    const u = analyze(study).uncertainty![0]!;
    // P(X > 1) = 1 − Φ(ln 2/σ), σ = ln 10/1.645 = 1.3998: Φ(0.4952) = 0.6898, so about 31% of 5000.
    expect(u.clipped_trials).toBeGreaterThan(1400);
    expect(u.clipped_trials).toBeLessThan(1700);
    expect(u.cdf[u.cdf.length - 1]!.value).toBe(1);
  });

  it('the clipped trials become a sampled-probability-clipped warning with their count and the parameter that can exceed 1', () => {
    const study = oneEvent('{ lognormal: { median: 0.5, ef: 10 } }', '  samples: 5000\n  seed: 2\n  horizon: 0', '0.5');
    const r = analyze(study);
    const w = r.warnings.filter((x) => x.code === 'sampled-probability-clipped');
    expect(w).toHaveLength(1);
    const n = r.uncertainty![0]!.clipped_trials;
    expect(w[0]!.message).toContain(`in ${n.toLocaleString('en-US')} of 5,000 Monte Carlo trials`);
    expect(w[0]!.message).toContain("'e.probability' can exceed 1");
    expect(w[0]!.at?.file).toBe('events.yaml');
    // A beta stays within [0, 1]: nothing clipped, no warning (common practice, no source).
    const bounded = analyze(oneEvent('{ beta: { a: 2, b: 2 } }', '  samples: 2000\n  seed: 2\n  horizon: 0', '0.5'));
    expect(bounded.uncertainty![0]!.clipped_trials).toBe(0);
    expect(bounded.warnings.some((x) => x.code === 'sampled-probability-clipped')).toBe(false);
  });

  it('an uncertainty no event reads is not sampled, and results.warnings says so', () => {
    const study = studyOf({
      events: `classes:\n  spare: { model: fixed, probability: { value: 1e-2, source: test-data, uncertainty: { lognormal: { median: 1e-2, ef: 3 } } } }\nevents:\n  e: { title: One event (invented), model: fixed, probability: { value: 1e-3, source: test-data, uncertainty: { lognormal: { median: 1e-3, ef: 3 } } } }\n`,
      logic: ONE_EVENT_LOGIC,
      settings: '  samples: 1000\n  seed: 2\n  horizon: 0',
    });
    const r = analyze(study);
    expect(r.uncertainty![0]!.sampled_parameters).toEqual(['e.probability']);
    expect(r.uncertainty![0]!.held_parameters).toEqual([{ key: 'spare.probability', reason: 'no basic event reads it' }]);
    expect(r.warnings.filter((w) => w.code === 'uncertainty-not-sampled').map((w) => w.message)).toEqual([
      "the uncertainty of 'spare.probability' is not sampled: no basic event reads it",
    ]);
  });

  it('a negative draw of a probability is a study error naming the parameter', () => {
    const study = oneEvent('{ normal: { mean: 1e-3, sd: 1e-2 } }', '  samples: 1000\n  seed: 2\n  horizon: 0');
    expect(() => analyze(study)).toThrow(StudyError);
    expect(() => analyze(study)).toThrow(/e\.probability/);
  });
});

describe('state-of-knowledge correlation: events of one class share one sample per trial', () => {
  // Two events of one class under an AND: with one shared sample q per trial, E[P] = E[q²] =
  // m²e^{2σ²}; sampled independently it would be E[q]² = m²e^{σ²} (G. Apostolakis & S. Kaplan,
  // Reliab. Eng. 2, 1981; NUREG/CR-6823 on correlated parameters). Standard lognormal moments.
  const study = studyOf({
    events: `classes:\n  pump: { model: fixed, probability: { value: ${M}, source: test-data, uncertainty: { lognormal: { median: ${M}, ef: ${EF} } } } }\nevents:\n  a: { title: Pump A, class: pump }\n  b: { title: Pump B, class: pump }\n`,
    logic: 'tops:\n  both: { title: Both pumps fail, gate: g }\ngates:\n  g: { all: [a, b] }\n',
    settings: `  samples: ${N}\n  seed: 8\n  horizon: 0`,
  });
  const u = analyze(study).uncertainty![0]!;

  it('the mean is E[q²], within 3 standard errors, and far from E[q]²', () => {
    const s2 = SIGMA * SIGMA;
    const correlated = M * M * Math.exp(2 * s2);
    const independent = M * M * Math.exp(s2);
    const se = (M * M * Math.sqrt(Math.exp(8 * s2) - Math.exp(4 * s2))) / Math.sqrt(N);
    expect(Math.abs(u.mean - correlated)).toBeLessThan(3 * se);
    expect(Math.abs(u.mean - independent)).toBeGreaterThan(20 * se);
    expect(u.sampled_parameters).toEqual(['pump.probability']);
  });
});

describe('Weibull shape and scale from a fit, sampled jointly', () => {
  // (ln β, ln η) ~ N((ln β̂, ln η̂), Σ): large-sample law of the ML estimates in the log parameters
  // (W. Q. Meeker & L. A. Escobar, Statistical Methods for Reliability Data, 1998, ch. 8).
  const cov: [[number, number], [number, number]] = [
    [0.02, -0.006],
    [-0.006, 0.01],
  ];
  function fitStudy(covarianceLog: [[number, number], [number, number]] | undefined): Study {
    const study = studyOf({
      events: 'classes:\n  motor:\n    model: weibull\n    shape: { value: 2.5, source: test-data }\n    scale: { value: 40 years, source: test-data }\nevents:\n  m1: { title: Motor 1, class: motor, installed: 2000 }\n  m2: { title: Motor 2, class: motor, installed: 2010 }\n',
      logic: 'tops:\n  t: { title: Either motor, gate: g }\ngates:\n  g: { any: [m1, m2] }\n',
      settings: '  samples: 4000\n  seed: 4\n  horizon: 0',
    });
    // The study as a fitted one would read: the class's shape and scale point at fit 'motor-life'.
    const fit = { id: 'motor-life', data: 'data/x.csv', method: 'mle', threeParameter: false, lifeUnit: 'years', confidence: 0.9, at: { file: 'events.yaml', line: 1, col: 1 } } as FitSpec;
    if (covarianceLog) (fit as { result?: unknown }).result = { covarianceLog };
    study.fits.push(fit);
    for (const p of study.parameters) {
      if (p.key === 'motor.shape') p.uncertainty = { kind: 'fit', fit: 'motor-life', which: 'shape' };
      if (p.key === 'motor.scale') p.uncertainty = { kind: 'fit', fit: 'motor-life', which: 'scale' };
    }
    return study;
  }

  it('the sampled logarithms have the fit’s means and covariance (two dimensions for the pair)', () => {
    const study = fitStudy(cov);
    const sampler = new ParameterSampler(study, parametersRead(study));
    expect(sampler.dimensions).toBe(2);
    const n = 50_000;
    const rows = uniformRows(9, 'monte-carlo', n, 2);
    const u = new Float64Array(2);
    const values = Float64Array.from(study.parameters, (p) => p.value);
    const iShape = study.parameters.findIndex((p) => p.key === 'motor.shape');
    const iScale = study.parameters.findIndex((p) => p.key === 'motor.scale');
    const a: number[] = [];
    const b: number[] = [];
    for (let t = 0; t < n; t++) {
      rows.row(t, u);
      sampler.apply(u, values, t);
      a.push(Math.log(values[iShape]!));
      b.push(Math.log(values[iScale]!));
    }
    const mean = (x: number[]) => x.reduce((s, v) => s + v, 0) / x.length;
    const ma = mean(a);
    const mb = mean(b);
    expect(Math.abs(ma - Math.log(2.5))).toBeLessThan(3 * Math.sqrt(cov[0][0] / n));
    expect(Math.abs(mb - Math.log(40))).toBeLessThan(3 * Math.sqrt(cov[1][1] / n));
    const c = (x: number[], mx: number, y: number[], my: number) => x.reduce((s, v, i) => s + (v - mx) * (y[i]! - my), 0) / (n - 1);
    // Sample (co)variances of normals: relative error ~ √(2/n) ≈ 0.6%; allow 4%.
    expect(c(a, ma, a, ma)).toBeCloseTo(cov[0][0], 3);
    expect(Math.abs(c(a, ma, a, ma) / cov[0][0] - 1)).toBeLessThan(0.04);
    expect(Math.abs(c(b, mb, b, mb) / cov[1][1] - 1)).toBeLessThan(0.04);
    expect(Math.abs(c(a, ma, b, mb) / cov[0][1] - 1)).toBeLessThan(0.06);
  });

  it('a study with a real fit (invented life records) samples its shape and scale in every trial', () => {
    // Invented lives, years: 9 failures and 3 suspensions.
    const csv = 'life_years,status\n12,failed\n18,failed\n21,failed\n25,failed\n27,suspended\n30,failed\n33,failed\n35,suspended\n38,failed\n41,failed\n44,failed\n46,suspended\n';
    const study = studyOf({
      events: 'fits:\n  motor-life: { data: data/motor-life.csv, method: mle }\nclasses:\n  motor:\n    model: weibull\n    shape: { fit: motor-life }\n    scale: { fit: motor-life }\nevents:\n  m1: { title: Motor 1, class: motor, installed: 2000 }\n',
      logic: 'tops:\n  t: { title: Motor fails, gate: g }\ngates:\n  g: { any: [m1] }\n',
      settings: '  samples: 3000\n  seed: 4\n  horizon: 0',
      files: { 'data/motor-life.csv': csv },
    });
    expect(study.fits[0]!.result!.covarianceLog[0][0]).toBeGreaterThan(0);
    const u = analyze(study).uncertainty![0]!;
    expect(u.sampled_parameters).toEqual(['motor.shape', 'motor.scale']);
    expect(u.held_parameters).toEqual([]);
    expect(u.p95).toBeGreaterThan(u.p05);
  });

  it('a fit without a usable covariance is held at its values and listed with the reason', () => {
    const study = fitStudy(undefined);
    const sampler = new ParameterSampler(study, parametersRead(study));
    expect(sampler.dimensions).toBe(0);
    expect(sampler.held.map((h) => h.key)).toEqual(['motor.shape', 'motor.scale']);
    expect(sampler.held[0]!.reason).toMatch(/motor-life/);
  });

  it('cholesky2 factors a 2 × 2 covariance (L·Lᵀ = Σ) and refuses one that is not positive semi-definite', () => {
    const [l00, l10, l11] = cholesky2(cov)!;
    expect(l00 * l00).toBeCloseTo(cov[0][0], 15);
    expect(l00 * l10).toBeCloseTo(cov[0][1], 15);
    expect(l10 * l10 + l11 * l11).toBeCloseTo(cov[1][1], 15);
    expect(cholesky2([[1, 2], [2, 1]])).toBeUndefined();
    expect(cholesky2([[0, 0], [0, 1]])).toBeUndefined();
  });
});

describe('progress', () => {
  it('reports increasing counts and ends at total', () => {
    const study = oneEvent(`{ lognormal: { median: ${M}, ef: ${EF} } }`, '  samples: 3500\n  seed: 1\n  horizon: 0');
    const calls: [string, number, number][] = [];
    analyze(study, { progress: (label, done, total) => calls.push([label, done, total]) });
    expect(calls.map((c) => c[1])).toEqual([1000, 2000, 3000, 3500]);
    expect(calls.every((c) => c[2] === 3500 && c[0] === 'Monte Carlo')).toBe(true);
  });
});
