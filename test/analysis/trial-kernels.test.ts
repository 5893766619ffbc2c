// The per-trial paths the Monte Carlo takes instead of the general ones, held to the general ones
// bit for bit (common practice, no source: a faster path must not change a number):
//  - CommonCauseExpansion.apply reuses a group's factors while its parameters repeat; the oracle is
//    the group's `numbers` (ccfFactors and the members' mean) applied by hand;
//  - prepareModel evaluates a model from positional values; the oracle is each model's own
//    function (models/*.ts), called with its inputs by name;
//  - a Latin hypercube run draws its columns once, shared by its threads; the oracle is the
//    definition (one latinHypercube column per dimension, in order, from the seed's generator).
// The correctness of the factors and the models themselves is tested against NUREG/CR-5485,
// NUREG-0492 and IEC 61508-6 elsewhere (test/ccf, test/reliability/models.test.ts).
import { describe, expect, it } from 'vitest';
import { CommonCauseExpansion } from '../../src/analysis/common-cause.js';
import {
  demandProbability,
  fixedProbability,
  modelProbability,
  prepareModel,
  rateProbability,
  repairableUnavailability,
  testedUnavailability,
  weibullEventProbability,
} from '../../src/reliability/models/index.js';
import { createRng, latinHypercube } from '../../src/reliability/random.js';
import { latinHypercubeColumns, uniformRows } from '../../src/analysis/sampling.js';
import type { CommonCauseGroup } from '../../src/study/types.js';

const at = { file: 'logic.yaml', line: 1, col: 1 };

describe('the common-cause expansion in a trial', () => {
  const events = ['a', 'b', 'c', 'd', 'e', 'f', 'g'].map((id) => ({ id }));
  const groups: CommonCauseGroup[] = [
    { id: 'pumps', members: ['a', 'b', 'c'], method: 'alpha', testing: 'non-staggered', fields: { alpha1: 'k1', alpha2: 'k2', alpha3: 'k3' }, at },
    { id: 'valves', members: ['d', 'e'], method: 'beta', testing: 'non-staggered', fields: { beta: 'kb' }, at },
    { id: 'fans', members: ['f', 'g'], method: 'mgl', testing: 'non-staggered', fields: { beta: 'km' }, at },
  ];

  it('gives, call after call, what the groups’ numbers give, whether the parameters change or repeat', () => {
    const expansion = new CommonCauseExpansion({ events: events as never, commonCause: groups });
    const rng = createRng(3);
    let params: Record<string, number> = {};
    const draw = () => {
      const k = [rng.next(), rng.next(), rng.next()];
      const s = k[0]! + k[1]! + k[2]!;
      params = { k1: k[0]! / s, k2: k[1]! / s, k3: k[2]! / s, kb: rng.next() * 0.2, km: rng.next() * 0.1 };
    };
    draw();
    const value = (key: string) => params[key]!;
    for (let call = 0; call < 60; call++) {
      // Parameters change on every third call and repeat in between (the memo's two paths).
      if (call % 3 === 0) draw();
      const total = Float64Array.from(events, () => rng.next() * 1e-2);
      const got = expansion.apply(total, value);
      const want = Float64Array.from(total);
      for (const layout of expansion.groups) {
        const { factors, reference } = expansion.numbers(layout, total, value);
        for (const i of layout.members) want[i] = factors[1]! * total[i]!;
        const shared = new Float64Array(expansion.variableCount);
        for (const s of layout.shared) shared[s.variable] = factors[s.positions.length]! * reference;
        for (const s of layout.shared) expect(got[s.variable], `${s.id}, call ${call}`).toBe(shared[s.variable]);
      }
      for (let i = 0; i < events.length; i++) expect(got[i], `event ${i}, call ${call}`).toBe(want[i]);
    }
  });
});

describe('prepareModel', () => {
  const age = { ageYears: 23.5 };
  const cases: { model: Parameters<typeof prepareModel>[0]; values: Record<string, number>; context?: object; direct: () => number }[] = [
    { model: 'fixed', values: { probability: 3e-4 }, direct: () => fixedProbability(3e-4) },
    { model: 'rate', values: { exposure: 0.008, rate: 0.7 }, direct: () => rateProbability(0.7, 0.008) },
    { model: 'repairable', values: { repair: 0.002, rate: 1.5 }, direct: () => repairableUnavailability(1.5, 0.002) },
    { model: 'tested', values: { repair: 0.003, interval: 0.25, rate: 0.05 }, direct: () => testedUnavailability({ rate: 0.05, interval: 0.25, repair: 0.003 }) },
    {
      model: 'tested',
      values: { rate: 0.005, test_duration: 2.3e-4, interval: 1 },
      direct: () => testedUnavailability({ rate: 0.005, interval: 1, testDuration: 2.3e-4 }),
    },
    { model: 'demand', values: { probability: 6e-4 }, direct: () => demandProbability({ probability: 6e-4 }) },
    { model: 'demand', values: { interval: 1 / 12, probability: 6e-4, rate: 0.01 }, direct: () => demandProbability({ probability: 6e-4, rate: 0.01, interval: 1 / 12 }) },
    {
      model: 'weibull',
      values: { exercise: 1 / 12, scale: 110, shape: 3.4 },
      context: age,
      direct: () => weibullEventProbability({ shape: 3.4, scale: 110, age: 23.5, exercise: 1 / 12 }),
    },
    {
      model: 'weibull',
      values: { shape: 0.8, location: 2, scale: 40, repair: 0.01, exercise: 0.5 },
      context: { ...age, exerciseBasis: 'average' },
      direct: () => weibullEventProbability({ shape: 0.8, scale: 40, location: 2, age: 23.5, exercise: 0.5, repair: 0.01, basis: 'average' }),
    },
    { model: 'weibull', values: { scale: 45, shape: 2.5, repair: 0.02 }, context: age, direct: () => weibullEventProbability({ shape: 2.5, scale: 45, age: 23.5, repair: 0.02 }) },
  ];

  it('gives each model function’s bits, whatever the order of the fields', () => {
    for (const c of cases) {
      const fields = Object.keys(c.values);
      const prepared = prepareModel(c.model, fields, c.context);
      expect(prepared(fields.map((f) => c.values[f]!)), `${c.model} ${fields.join(',')}`).toBe(c.direct());
      const reversed = [...fields].reverse();
      expect(prepareModel(c.model, reversed, c.context)(reversed.map((f) => c.values[f]!))).toBe(c.direct());
      expect(modelProbability(c.model, c.values, c.context)).toBe(c.direct());
    }
  });

  it('refuses a missing required field or context when prepared, naming it', () => {
    expect(() => prepareModel('tested', ['rate'])).toThrow("model 'tested' needs 'interval'");
    expect(() => prepareModel('weibull', ['shape', 'scale'])).toThrow(/needs the age/);
    expect(() => prepareModel('switch', [])).toThrow(/needs its state/);
    expect(prepareModel('switch', [], { on: true })([])).toBe(1);
  });
});

describe('Latin hypercube columns drawn once for a run', () => {
  it('are the columns latinHypercube draws dimension by dimension, and give uniformRows the same rows', () => {
    const trials = 500;
    const dims = 4;
    const shared = latinHypercubeColumns(42, trials, dims, true);
    expect(shared.buffer).toBeInstanceOf(SharedArrayBuffer);
    const rng = createRng(42);
    for (let d = 0; d < dims; d++) expect(Array.from(shared.subarray(d * trials, (d + 1) * trials))).toEqual(latinHypercube(rng, trials));
    const own = uniformRows(42, 'latin-hypercube', trials, dims);
    const given = uniformRows(42, 'latin-hypercube', trials, dims, shared);
    const a = new Float64Array(dims);
    const b = new Float64Array(dims);
    for (let t = 0; t < trials; t++) {
      own.row(t, a);
      given.row(t, b);
      expect(Array.from(b)).toEqual(Array.from(a));
    }
  });
});
