// The prepared event evaluation (src/analysis/event-plan.ts) must give exactly what
// evaluateEvents (src/analysis/event-probability.ts) gives for the same case and parameter values:
// it is the same model calls with the lookups hoisted (common practice, no source: an optimisation
// is checked against the plain form it replaces).
import { describe, expect, it } from 'vitest';
import { baseCase, scenarioCase, type Case } from '../../src/analysis/case.js';
import { EventPlan } from '../../src/analysis/event-plan.js';
import { evaluateEvents } from '../../src/analysis/event-probability.js';
import { createRng } from '../../src/reliability/random.js';
import { studyOf } from './helpers.js';

// Invented equipment and data.
const study = studyOf({
  events: `
classes:
  motor:
    model: weibull
    shape: { value: 2.8, source: test-data }
    scale: { value: 60 years, source: test-data }
    exercise: { value: 1 month, source: test-data }
  coupling:
    model: tested
    rate: { value: 2e-3 /year, source: test-data }
    interval: { value: 1 month, source: test-data }
    repair: { value: 5 days, source: test-data }
  starter:
    model: demand
    probability: { value: 6e-4, source: test-data }
    rate: { value: 1e-2 /year, source: test-data }
    interval: { value: 1 month, source: test-data }
events:
  m1: { title: Motor 1, class: motor, installed: 1990 }
  m2: { title: Motor 2, class: motor, installed: 1990 }
  m3: { title: Motor 3, class: motor, installed: 2004, exercise: { value: 1 week, source: test-data } }
  c1: { title: Coupling 1, class: coupling }
  c2: { title: Coupling 2, class: coupling }
  s1: { title: Starter 1, class: starter }
  grid: { title: Grid lost, model: repairable, rate: { value: 1.5 /year, source: test-data }, repair: { value: 6 h, source: test-data } }
  run: { title: Fails to run, model: rate, rate: { value: 1e-3 /h, source: test-data }, exposure: { value: 72 h, source: test-data } }
  off: { title: Out of service, model: switch, on: false }
`,
  logic: `
tops:
  t: { title: Anything fails, gate: g }
gates:
  g: { any: [m1, m2, m3, c1, c2, s1, grid, run, off] }
scenarios:
  plan:
    title: A plan (invented)
    set: { motor.exercise: 1 week, coupling.rate: 4e-3 /year }
    switch: { off: true }
    renew: { m1: 2028-06-30 }
`,
});

function randomValues(varying: Set<number>, seed: number): Float64Array {
  const rng = createRng(seed);
  return Float64Array.from(study.parameters, (p, i) => (varying.has(i) ? p.value * (0.5 + rng.next()) : p.value));
}

function compare(c: Case, varying: Set<number>, seed: number): void {
  const plan = new EventPlan(study, c, varying);
  const values = randomValues(varying, seed);
  const index = new Map(study.parameters.map((p, i) => [p.key, i]));
  const want = evaluateEvents(study, c, (key) => values[index.get(key)!]!).total;
  const got = plan.evaluate(values, new Float64Array(study.events.length));
  expect(Array.from(got)).toEqual(Array.from(want));
}

describe('EventPlan = evaluateEvents', () => {
  const all = new Set(study.parameters.map((_, i) => i));
  const some = new Set([0, 3, 6].filter((i) => i < study.parameters.length));

  it('base case, every parameter varying, several draws', () => {
    for (let s = 1; s <= 5; s++) compare(baseCase(), all, s);
  });

  it('base case, some parameters varying (the rest fixed at the study values)', () => {
    for (let s = 1; s <= 5; s++) compare(baseCase(), some, s);
  });

  it('a scenario with overrides, a switch and a renewal, years after as_of', () => {
    for (const years of [0, 1, 3, 10]) {
      const c = scenarioCase(study.scenarios[0]!);
      c.years = years;
      compare(c, all, years + 1);
      compare(c, some, years + 7);
    }
  });

  it('shares one computation among events with identical inputs', () => {
    // m1 and m2 (same class, same age), c1 and c2; m3 has its own exercise and age.
    const plan = new EventPlan(study, baseCase(), all);
    expect(plan.groupCount).toBe(study.events.length - 2 - 1); // two shared pairs; the switch reads no parameter
  });
});
