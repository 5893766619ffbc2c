// The tornado from derivatives (src/analysis/sensitivity.ts) against re-quantification: every
// low and high end must equal a full bottom-up pass of the base diagram at that case's event
// probabilities (the exact oracle: the same Shannon recursion, P = p·P(high) + (1 − p)·P(low),
// run from scratch) to 1e-12 relative — on the example study and on seeded random studies with
// shared class parameters and common-cause groups (so some ends move one variable and some many).
// Range provenance: a fitted shape/scale with no stated range takes the fit's Fisher bounds.
import { rmSync } from 'node:fs';
import { join } from 'node:path';
import fc from 'fast-check';
import { afterAll, describe, expect, it } from 'vitest';
import { analyze } from '../../src/analysis/analyze.js';
import { baseCase } from '../../src/analysis/case.js';
import { CaseQuantifier } from '../../src/analysis/case-quantifier.js';
import { buildLogicModel } from '../../src/analysis/logic-model.js';
import { compileBaseCase } from '../../src/analysis/quantify.js';
import { sensitivity } from '../../src/analysis/sensitivity.js';
import { readStudy } from '../../src/study/read.js';
import type { Study } from '../../src/study/types.js';
import { writeStudy } from './helpers.js';

const dirs: string[] = [];
afterAll(() => {
  for (const d of dirs) rmSync(d, { recursive: true, force: true });
});

function tempStudy(events: string, logic: string): Study {
  const dir = writeStudy({ events, logic, settings: '  samples: 0\n  horizon: 0\n  sensitivity_factor: 3' });
  dirs.push(dir);
  return readStudy(dir);
}

/** Every tornado end against a full pass at that case's probabilities. */
function checkAgainstRequantification(study: Study): number {
  const model = buildLogicModel(study);
  const compiled = compileBaseCase(study, model, baseCase().switches)!;
  const q = new CaseQuantifier(study, model, compiled);
  const base = q.diagram(baseCase()).evaluator.evaluate(q.baseEvents);
  const results = sensitivity(study, q, base);
  let checked = 0;
  results.forEach((r, t) => {
    for (const row of r.tornado) {
      for (const [value, got] of [
        [row.low_value, row.low],
        [row.high_value, row.high],
      ] as const) {
        const c = baseCase();
        c.overrides.set(row.key, value);
        const full = q.tops(c)[t]!;
        expect(Math.abs(got - full)).toBeLessThanOrEqual(1e-12 * Math.abs(full));
        checked++;
      }
    }
  });
  return checked;
}

describe('tornado from derivatives equals re-quantification', () => {
  it('on the example study', () => {
    const study = readStudy(join(__dirname, '..', '..', 'example-study'));
    expect(checkAgainstRequantification(study)).toBeGreaterThan(50);
  });

  it('on random studies with shared parameters and common-cause groups', () => {
    const arb = fc.record({
      n: fc.integer({ min: 3, max: 9 }),
      probs: fc.array(fc.double({ min: 1e-6, max: 0.6, noNaN: true }), { minLength: 9, maxLength: 9 }),
      inClass: fc.array(fc.integer({ min: 0, max: 2 }), { minLength: 9, maxLength: 9 }),
      gates: fc.array(fc.record({ op: fc.integer({ min: 0, max: 2 }), picks: fc.array(fc.nat(), { minLength: 2, maxLength: 4 }) }), { minLength: 1, maxLength: 5 }),
      ccf: fc.boolean(),
    });
    fc.assert(
      fc.property(arb, (x) => {
        const own = (i: number) => x.inClass[i] === 0 || (x.ccf && i < 2);
        const ev = Array.from({ length: x.n }, (_, i) =>
          own(i)
            ? `  e${i}: { title: E${i}, model: fixed, probability: { value: ${x.probs[i]!.toPrecision(6)}, source: test-data } }`
            : `  e${i}: { title: E${i}, class: k${x.inClass[i]} }`,
        );
        const classes = [1, 2].map((k) => `  k${k}: { title: K${k}, model: fixed, probability: { value: ${(0.01 * k).toPrecision(3)}, source: test-data } }`);
        const gates: string[] = [];
        x.gates.forEach((g, j) => {
          const pool = [...Array.from({ length: x.n }, (_, i) => `e${i}`), ...Array.from({ length: j }, (_, i) => `g${i}`)];
          const inputs = [...new Set(g.picks.map((p) => pool[p % pool.length]!))];
          if (inputs.length < 2) inputs.push(pool.find((p) => !inputs.includes(p))!);
          const body = g.op === 0 ? `any: [${inputs}]` : g.op === 1 ? `all: [${inputs}]` : `atleast: 2, of: [${inputs}]`;
          gates.push(`  g${j}: { ${body} }`);
        });
        // Make the top use every gate and event so none is unused (lint would only warn).
        const all = [...Array.from({ length: x.n }, (_, i) => `e${i}`), ...x.gates.map((_, j) => `g${j}`)];
        gates.push(`  top: { any: [${all}] }`);
        const ccf = x.ccf ? `common_cause:\n  pair: { members: [e0, e1], method: beta, beta: 0.1 }\n` : '';
        const study = tempStudy(`classes:\n${classes.join('\n')}\nevents:\n${ev.join('\n')}\n`, `tops:\n  t: { title: T, gate: top }\n  u: { title: U, gate: g0 }\ngates:\n${gates.join('\n')}\n${ccf}`);
        checkAgainstRequantification(study);
      }),
      { numRuns: 60, seed: 20261204 },
    );
  });
});

describe('tornado range provenance', () => {
  it('stated ranges and the default factor say so', () => {
    const study = tempStudy(
      `events:\n  a: { title: A, model: fixed, probability: { value: 0.01, source: test-data, range: [0.005, 0.03] } }\n  b: { title: B, model: fixed, probability: { value: 0.02, source: test-data } }\n`,
      `tops:\n  t: { title: T, gate: g }\ngates:\n  g: { any: [a, b] }\n`,
    );
    const rows = analyze(study).sensitivity![0]!.tornado;
    const a = rows.find((r) => r.key === 'a.probability')!;
    const b = rows.find((r) => r.key === 'b.probability')!;
    expect([a.range_source, a.range_basis]).toEqual(['stated', 'stated range']);
    expect([b.range_source, b.range_basis]).toEqual(['default-factor', 'default factor ×/÷ 3']);
    expect([b.low_value, b.high_value]).toEqual([0.02 / 3, 0.06]);
  });

  it('a fitted shape and scale with no stated range take the fit’s two-sided bounds', () => {
    // Invented life data; the bounds themselves are checked against published examples in test/fit.
    const csv = 'life,status\n' + [3.1, 5.2, 6.8, 8.0, 9.5, 11.2, 12.9, 15.3].map((t) => `${t} years,failed`).join('\n') + '\n4 years,suspended\n';
    const dir = writeStudy({
      events: `fits:\n  life: { data: data/life.csv, method: mle, source: test-data }\nevents:\n  m: { title: M, model: weibull, shape: { fit: life }, scale: { fit: life }, installed: 2016 }\n  o: { title: O, model: fixed, probability: { value: 0.01, source: test-data } }\n`,
      logic: `tops:\n  t: { title: T, gate: g }\ngates:\n  g: { any: [m, o] }\n`,
      settings: '  samples: 0\n  horizon: 0',
      files: { 'data/life.csv': csv },
    });
    dirs.push(dir);
    const results = analyze(readStudy(dir));
    const fit = results.fits!.find((f) => f.id === 'life')!;
    const rows = results.sensitivity![0]!.tornado;
    for (const field of ['shape', 'scale'] as const) {
      const row = rows.find((r) => r.key === `m.${field}`)!;
      expect(row.range_source).toBe('fit');
      expect(row.range_basis).toBe(`fit bounds (each one-sided ${fit.level * 100} %)`);
      expect(row.low_value).toBe(fit.bounds[field].lower);
      expect(row.high_value).toBe(fit.bounds[field].upper);
    }
  });
});
