// Monte Carlo throughput on the example study: 100,000 trials, the study read once and its decision
// diagram compiled once (the trials reuse it: no re-parse, no re-build). Target: under 5 s on the
// project's 2-core machine. Prints figures only; never fails on a timing.
import { performance } from 'node:perf_hooks';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { baseCase } from '../src/analysis/case.js';
import { CaseQuantifier } from '../src/analysis/case-quantifier.js';
import { EventPlan, parametersRead } from '../src/analysis/event-plan.js';
import { buildLogicModel } from '../src/analysis/logic-model.js';
import { compileCase } from '../src/analysis/quantify.js';
import { ParameterSampler } from '../src/analysis/sampling.js';
import { summarize } from '../src/analysis/statistics.js';
import { monteCarlo } from '../src/analysis/uncertainty.js';
import { readStudy } from '../src/study/read.js';

const TRIALS = 100_000;
const root = join(dirname(fileURLToPath(import.meta.url)), '..', 'example-study');

let t = performance.now();
const study = readStudy(root);
const readMs = performance.now() - t;
t = performance.now();
const model = buildLogicModel(study);
const compiled = compileCase(study, model, new Map());
const quantifier = new CaseQuantifier(study, model, compiled);
const compileMs = performance.now() - t;

const sampler = new ParameterSampler(study, parametersRead(study));
const plan = new EventPlan(study, baseCase(), sampler.varying);
console.log(
  `example study: ${study.events.length} basic events, ${study.parameters.length} parameters (${sampler.varying.size} sampled, ` +
    `${sampler.dimensions} dimensions), ${plan.groupCount} event computations per trial, ${quantifier.diagram(baseCase()).evaluator.nodes.length} diagram nodes`,
);
console.log(`read ${readMs.toFixed(0)} ms, compile ${compileMs.toFixed(0)} ms (once)`);

// Warm-up so the figure is the steady state a real run reaches within its first trials.
monteCarlo(study, quantifier, { samples: 2000 });

for (const method of ['monte-carlo', 'latin-hypercube'] as const) {
  study.settings.sampling = method;
  const t0 = performance.now();
  const run = monteCarlo(study, quantifier, { samples: TRIALS })!;
  const ms = performance.now() - t0;
  const t1 = performance.now();
  const summaries = run.values.map((v) => summarize(v));
  const summaryMs = performance.now() - t1;
  console.log(
    `${method.padEnd(16)} ${TRIALS.toLocaleString('en-US')} trials in ${(ms / 1000).toFixed(2)} s = ` +
      `${Math.round((TRIALS / ms) * 1000).toLocaleString('en-US')} trials/s; summaries ${summaryMs.toFixed(0)} ms; ` +
      `mean of ${study.tops[0]!.id} ${summaries[0]!.mean.toExponential(3)}`,
  );
}
