/**
 * Drawing the study's parameters for a Monte Carlo trial.
 *
 * One sample per parameter per trial. A class parameter is one parameter shared by all the events
 * of its class, so those events move together: the state-of-knowledge correlation of a PRA
 * (G. Apostolakis & S. Kaplan, "Pitfalls in risk calculations", Reliab. Eng. 2, 1981; NUREG/CR-6823
 * §6.3 on correlated parameters), which independent per-event sampling would understate.
 *
 * Every distribution is sampled by its inverse CDF from a unit uniform (`sampleQuantile`), so plain
 * sampling and Latin hypercube sampling share one path: each parameter is one "dimension" of unit
 * uniforms. A Weibull fit (`uncertainty: fit`) is two dimensions for the whole fit: two standard
 * normals z₁, z₂ turned into (ln β, ln η) with the Cholesky factor of the fit's covariance of the
 * logarithms, centred on the fitted values — the large-sample normal law of the maximum-likelihood
 * estimates in the log parameters (W. Q. Meeker & L. A. Escobar, Statistical Methods for
 * Reliability Data, 1998, ch. 8). The covariance is of logarithms, so the unit of the scale does not
 * matter. A fitted location has no covariance entry and is held at its value.
 *
 * Values outside a parameter's domain: a sampled probability above 1 is set to 1 and counted
 * (a lognormal's upper tail can cross 1); a negative value is a study error (the distribution
 * should be truncated or be a positive one).
 */
import { createRng, latinHypercube, type Rng } from '../reliability/random.js';
import { DirichletSampler, quantileFunction } from '../reliability/distributions.js';
import { normalQuantile } from '../reliability/special.js';
import { StudyError } from '../study/errors.js';
import type { Parameter, Study } from '../study/types.js';

/** One parameter's draw (`probability`: a value above 1 is set to 1 and counted). */
type Draw =
  | { kind: 'quantile'; param: number; probability: boolean; dim: number; quantile: (unitUniform: number) => number }
  | { kind: 'log-normal-pair'; param: number; probability: boolean; dims: [number, number]; weights: [number, number]; logCentre: number }
  | { kind: 'dirichlet'; group: string; params: Int32Array; dims: Int32Array; sampler: DirichletSampler; gammas: Float64Array };

export interface SamplerPlan {
  /** Parameter indices (into study.parameters) that vary between trials. */
  varying: Set<number>;
  /** Unit-uniform dimensions per trial. */
  dimensions: number;
  /** Keys of parameters that state an uncertainty the analysis cannot sample, with the reason. */
  held: { key: string; reason: string }[];
}

export class ParameterSampler implements SamplerPlan {
  readonly varying = new Set<number>();
  readonly dimensions: number;
  readonly held: { key: string; reason: string }[] = [];
  /** Trials in which at least one sampled probability was above 1 and set to 1. */
  clippedTrials = 0;
  private readonly draws: Draw[] = [];
  /** Dimensions read as standard normals by the fits' pairs (each once per trial, for both of a fit's parameters). */
  private readonly normalDims: number[] = [];
  private readonly normals: Float64Array;
  private readonly params: Parameter[];
  private readonly groupAt: (id: string) => Parameter['at'];

  /**
   * @param readBy parameter keys some basic event reads; uncertainty on any other parameter cannot
   *               change a probability and is listed in `held`.
   */
  constructor(study: Study, readBy: ReadonlySet<string>) {
    this.params = study.parameters;
    this.groupAt = (id) => study.commonCause.find((g) => g.id === id)!.dirichlet!.at;
    let dims = 0;
    const fitPairs = new Map<string, { dims: [number, number]; chol: [number, number, number] } | null>();
    study.parameters.forEach((p, i) => {
      const u = p.uncertainty;
      if (!u) return;
      if (!readBy.has(p.key)) {
        this.held.push({ key: p.key, reason: 'no basic event reads it' });
        return;
      }
      if (u.kind !== 'fit') {
        this.draws.push({ kind: 'quantile', param: i, probability: p.quantity === 'probability', dim: dims++, quantile: quantileFunction(u) });
        this.varying.add(i);
        return;
      }
      if (u.which === 'location') {
        this.held.push({ key: p.key, reason: `the covariance of fit '${u.fit}' covers shape and scale only` });
        return;
      }
      let pair = fitPairs.get(u.fit);
      if (pair === undefined) {
        const fit = study.fits.find((f) => f.id === u.fit);
        const chol = fit?.result?.covarianceLog ? cholesky2(fit.result.covarianceLog) : undefined;
        pair = chol ? { dims: [dims, dims + 1], chol } : null;
        if (pair) dims += 2;
        fitPairs.set(u.fit, pair);
      }
      if (pair === null) {
        this.held.push({ key: p.key, reason: `fit '${u.fit}' gives no usable covariance` });
        return;
      }
      if (!(p.value > 0)) throw new StudyError(`'${p.key}' is ${p.value}; a fitted ${u.which} must be positive to be sampled on the log scale`, p.at);
      const [l00, l10, l11] = pair.chol;
      // ln β = ln β̂ + L₀₀z₁;  ln η = ln η̂ + L₁₀z₁ + L₁₁z₂.
      const weights: [number, number] = u.which === 'shape' ? [l00, 0] : [l10, l11];
      this.draws.push({ kind: 'log-normal-pair', param: i, probability: p.quantity === 'probability', dims: pair.dims, weights, logCentre: Math.log(p.value) });
      for (const dim of pair.dims) if (!this.normalDims.includes(dim)) this.normalDims.push(dim);
      this.varying.add(i);
    });
    // An alpha-factor group's Dirichlet: one dimension per factor (dirichlet.ts).
    const index = new Map(study.parameters.map((p, i) => [p.key, i]));
    for (const g of study.commonCause) {
      if (!g.dirichlet) continue;
      const params = Object.keys(g.fields)
        .sort((x, y) => Number(x.slice('alpha'.length)) - Number(y.slice('alpha'.length)))
        .map((f) => index.get(g.fields[f]!)!);
      const draw: Draw = {
        kind: 'dirichlet',
        group: g.id,
        params: Int32Array.from(params),
        dims: Int32Array.from(params, () => dims++),
        sampler: new DirichletSampler(g.dirichlet.a),
        gammas: new Float64Array(params.length),
      };
      this.draws.push(draw);
      for (const i of params) this.varying.add(i);
    }
    this.dimensions = dims;
    this.normals = new Float64Array(dims);
  }

  /**
   * Writes one trial's parameter values into `values` (indexed like study.parameters) from one
   * row of unit uniforms (length `dimensions`). `trial` is only used in messages.
   */
  apply(uniforms: ArrayLike<number>, values: Float64Array, trial: number): void {
    let clipped = false;
    // A fit's two normals serve both its shape and its scale: computed once.
    const normals = this.normals;
    for (let k = 0; k < this.normalDims.length; k++) {
      const dim = this.normalDims[k]!;
      normals[dim] = normalQuantile(uniforms[dim]!);
    }
    const draws = this.draws;
    for (let k = 0; k < draws.length; k++) {
      const d = draws[k]!;
      let v: number;
      if (d.kind === 'dirichlet') {
        if (!d.sampler.draw(uniforms, d.gammas, d.dims)) {
          throw new StudyError(`the alpha factors of common-cause group '${d.group}' could not be sampled in Monte Carlo trial ${trial + 1}: every gamma variate was 0`, this.groupAt(d.group), 'larger Dirichlet parameters (a concentration of at least a few per factor)');
        }
        for (let j = 0; j < d.params.length; j++) values[d.params[j]!] = d.gammas[j]!;
        continue;
      }
      if (d.kind === 'quantile') {
        v = d.quantile(uniforms[d.dim]!);
      } else {
        v = Math.exp(d.logCentre + d.weights[0] * normals[d.dims[0]]! + d.weights[1] * normals[d.dims[1]]!);
      }
      if (!(v >= 0)) {
        const p = this.params[d.param]!;
        throw new StudyError(
          `the uncertainty of '${p.key}' gave ${v} in Monte Carlo trial ${trial + 1}, outside the values it can take`,
          p.at,
          'a distribution that stays positive (lognormal, gamma, beta) or a normal with min: 0',
        );
      }
      if (d.probability && v > 1) {
        v = 1;
        clipped = true;
      }
      values[d.param] = v;
    }
    if (clipped) this.clippedTrials += 1;
  }
}

/** Lower Cholesky factor [L₀₀, L₁₀, L₁₁] of a 2 × 2 covariance; undefined if it is not one. */
export function cholesky2(c: readonly (readonly number[])[]): [number, number, number] | undefined {
  const a = c[0]?.[0];
  const b = c[0]?.[1];
  const b2 = c[1]?.[0];
  const d = c[1]?.[1];
  if (a === undefined || b === undefined || b2 === undefined || d === undefined) return undefined;
  if (!(a > 0) || !(d >= 0) || !Number.isFinite(b) || Math.abs(b - b2) > 1e-12 * Math.max(Math.abs(b), 1e-300)) return undefined;
  const l00 = Math.sqrt(a);
  const l10 = b / l00;
  const rest = d - l10 * l10;
  // A correlation of ±1 (to rounding) leaves no independent part; more than that is not a covariance.
  if (rest < -1e-12 * d) return undefined;
  return [l00, l10, Math.sqrt(Math.max(0, rest))];
}

/**
 * Rows of unit uniforms, one per trial: plain sampling draws each row from the generator in order;
 * Latin hypercube sampling (McKay, Beckman & Conover 1979) draws each dimension's column of n
 * stratified values up front (`latinHypercubeColumns`, or the ones given: a run draws them once
 * for all its threads), dimension by dimension, from the same generator.
 * Either way trial t's row depends only on the seed and t: a reader asked for a later trial than the
 * next one (another thread ran the trials between) passes over the generator's outputs of the trials
 * it skips, so it gets the rows a reader that went through every trial would.
 */
export interface UniformRows {
  /** Fill `out` (length = dimensions) with trial t's uniforms; t must increase from call to call. */
  row(t: number, out: Float64Array): void;
}

export function uniformRows(
  seed: number,
  method: 'monte-carlo' | 'latin-hypercube',
  trials: number,
  dimensions: number,
  columns?: Float64Array,
): UniformRows {
  if (method === 'monte-carlo') {
    const rng: Rng = createRng(seed);
    let next = 0;
    return {
      row(t, out) {
        if (t < next) throw new RangeError(`uniform rows are read forwards: trial ${t} after ${next - 1}`);
        // Each uniform takes two 32-bit outputs (random.ts `next`).
        for (let k = 2 * (t - next) * dimensions; k > 0; k--) rng.nextUint32();
        for (let d = 0; d < dimensions; d++) out[d] = rng.next();
        next = t + 1;
      },
    };
  }
  const table = columns ?? latinHypercubeColumns(seed, trials, dimensions);
  return {
    row(t, out) {
      for (let d = 0; d < dimensions; d++) out[d] = table[d * trials + t]!;
    },
  };
}

/**
 * The Latin hypercube columns of a run as `uniformRows` reads them: dimension d's column of n
 * stratified values (`latinHypercube`) at [d·n, (d + 1)·n), drawn dimension by dimension from the
 * seed's generator. Drawing them is most of a short run's sampling cost (about 100 ms for 19
 * dimensions of 100,000 trials), so a run draws them once, in shared memory (`shared`) when worker
 * threads read them too.
 */
export function latinHypercubeColumns(seed: number, trials: number, dimensions: number, shared = false): Float64Array {
  const rng: Rng = createRng(seed);
  const size = dimensions * trials;
  const columns = shared ? new Float64Array(new SharedArrayBuffer(size * 8)) : new Float64Array(size);
  for (let d = 0; d < dimensions; d++) columns.set(latinHypercube(rng, trials), d * trials);
  return columns;
}
