// Batches and threads never change a Monte Carlo number (src/analysis/trials.ts,
// parallel-trials.ts, logic/flat-diagram.ts): the oracle is the same study run one trial per
// diagram pass on one thread, compared bit for bit, and the scalar decision-diagram pass
// (ProbabilityEvaluator) for the batch pass. Common practice, no source: a trial's numbers must
// depend only on the seed and its index. The worker threads run the compiled dist/ (npm test builds
// it first; after changing src/, run `npm run build` before this file alone).
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyze } from '../../src/analysis/analyze.js';
import { baseCase } from '../../src/analysis/case.js';
import { CaseQuantifier } from '../../src/analysis/case-quantifier.js';
import { buildLogicModel } from '../../src/analysis/logic-model.js';
import { CHUNK, runParallel, workerScript } from '../../src/analysis/parallel-trials.js';
import { compileCase } from '../../src/analysis/quantify.js';
import { monteCarlo, trialJob, type MonteCarloRun } from '../../src/analysis/uncertainty.js';
import { BatchEvaluator, flattenDiagram } from '../../src/logic/flat-diagram.js';
import { createRng } from '../../src/reliability/random.js';
import { resultsJson } from '../../src/report/results-json.js';
import { readStudy } from '../../src/study/read.js';
import { StudyError } from '../../src/study/errors.js';
import type { Study } from '../../src/study/types.js';
import { faultbook } from '../cli/helpers.js';
import { writeStudy } from './helpers.js';

const EXAMPLE = new URL('../../example-study', import.meta.url).pathname;

function example(sampling: 'monte-carlo' | 'latin-hypercube', samples: number): { study: Study; quantifier: CaseQuantifier } {
  const study = readStudy(EXAMPLE);
  study.settings.sampling = sampling;
  study.settings.samples = samples;
  const model = buildLogicModel(study);
  return { study, quantifier: new CaseQuantifier(study, model, compileCase(study, model, new Map())) };
}

/** Every number of a run, as bytes. */
function bytesOf(run: MonteCarloRun): Buffer {
  return Buffer.concat([...run.values, ...run.derived].map((a) => Buffer.from(a.buffer, a.byteOffset, a.byteLength)));
}

describe('the batch pass over a frozen diagram', () => {
  it('gives, vector by vector, the bits of the scalar pass (ProbabilityEvaluator)', () => {
    const { study, quantifier } = example('monte-carlo', 0);
    const { compiled, evaluator } = quantifier.diagram(baseCase());
    const roots = quantifier.model.topGates.map((g) => compiled.gateRoots[g]!);
    const vars = quantifier.model.graph.variables.length;
    const flat = flattenDiagram(compiled.manager, roots, vars);
    // 9 vectors of room, 7 evaluated: the pass's four-at-a-time steps and its remainder both run.
    const B = 9;
    const batch = new BatchEvaluator(flat, B);
    const rng = createRng(99);
    const p = new Float64Array(vars * B);
    for (let i = 0; i < p.length; i++) p[i] = rng.next() ** 4;
    const out = new Float64Array(roots.length * B);
    batch.evaluate(p, 7, out);
    for (let b = 0; b < 7; b++) {
      const one = Float64Array.from({ length: vars }, (_, v) => p[v * B + b]!);
      const want = evaluator.evaluate(one);
      roots.forEach((_, r) => expect(out[r * B + b]).toBe(want[r]));
    }
    expect(study.tops.length).toBe(roots.length);
  });
});

describe('Monte Carlo numbers do not depend on the batch or the threads', () => {
  for (const sampling of ['monte-carlo', 'latin-hypercube'] as const) {
    it(`${sampling}: batches of 1, 7, 64 and 5000 trials give the same bits`, () => {
      const { study, quantifier } = example(sampling, 3 * CHUNK + 17);
      const runs = [1, 7, 64, 5000].map((batch) => monteCarlo(study, quantifier, { batch })!);
      const want = bytesOf(runs[0]!);
      expect(runs[0]!.derived.length).toBeGreaterThan(0);
      for (const r of runs.slice(1)) {
        expect(bytesOf(r).equals(want)).toBe(true);
        expect(r.clippedTrials).toBe(runs[0]!.clippedTrials);
      }
    });

    it(`${sampling}: every chunk run on a worker thread gives the bits of one thread`, () => {
      expect(workerScript(), 'the compiled worker in dist/ (npm run build)').toBeDefined();
      const { study, quantifier } = example(sampling, 3 * CHUNK + 17);
      const single = monteCarlo(study, quantifier)!;
      const job = trialJob(study, quantifier, study.settings.samples);
      const { sink, workerChunks } = runParallel(job, { threads: 2, batch: 64, workersOnly: true });
      expect(workerChunks).toBe(4);
      const flat = Buffer.concat([sink.tops, sink.derived].map((a) => Buffer.from(a.buffer, a.byteOffset, a.byteLength)));
      expect(flat.equals(bytesOf(single))).toBe(true);
    });
  }

  it('two threads give a byte-identical results.json (analysis in-process)', () => {
    const study = readStudy(EXAMPLE);
    const one = resultsJson(analyze(study, { threads: 1 }));
    const two = resultsJson(analyze(study, { threads: 2 }));
    expect(two).toBe(one);
    expect(JSON.parse(one).outcome_uncertainty.length).toBeGreaterThan(0);
  });

  it('faultbook run --threads 1 and --threads 3 write byte-identical results.json', async () => {
    const out = mkdtempSync(join(tmpdir(), 'faultbook-threads-'));
    try {
      for (const t of ['1', '3']) {
        const r = await faultbook('run', EXAMPLE, '--out', join(out, t), '--format', 'json', '--threads', t, '--quiet');
        expect(r.code, r.stderr).toBe(0);
      }
      expect(readFileSync(join(out, '3', 'results.json')).equals(readFileSync(join(out, '1', 'results.json')))).toBe(true);
      const bad = await faultbook('run', EXAMPLE, '--out', join(out, 'x'), '--threads', 'two', '--quiet');
      expect(bad.code).toBe(2);
      expect(bad.stderr).toContain('--threads must be a whole number');
    } finally {
      rmSync(out, { recursive: true, force: true });
    }
  });

  it('a trial that fails is reported as the lowest failing trial, whatever the threads', () => {
    // A normal without a lower bound: some trials draw a negative rate, an input error.
    const dir = writeStudy({
      events: 'events:\n  e: { title: e (invented), model: rate, exposure: 1 year, rate: { value: 1e-3 /year, source: test-data, uncertainty: { normal: { mean: 1e-3 /year, sd: 8e-4 /year } } } }\n',
      logic: 'tops:\n  t: { title: t (invented), gate: g }\ngates:\n  g: { any: [e] }\n',
      settings: `  samples: ${4 * CHUNK}\n  seed: 5\n  horizon: 0`,
    });
    try {
      const study = readStudy(dir);
      const messages = [1, 2].map((threads) => {
        try {
          analyze(study, { threads });
        } catch (err) {
          expect(err).toBeInstanceOf(StudyError);
          return (err as StudyError).message;
        }
        return 'no error';
      });
      expect(messages[0]).toMatch(/in Monte Carlo trial \d+,/);
      expect(messages[1]).toBe(messages[0]);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

