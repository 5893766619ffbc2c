/**
 * 10,000 Monte Carlo trials on the synthetic models of 1k, 5k, 20k and 50k basic events (the same
 * seeded trees as bench/logic.bench.ts): the diagram is compiled once and every trial is one
 * prepared bottom-up pass (ProbabilityEvaluator), as the uncertainty analysis does it.
 *
 * Events are put in 100 invented component classes and each trial draws one lognormal multiplier
 * per class (error factor 3), so events of a class move together — the state-of-knowledge
 * correlation of a real study — and the figure measures the diagram passes, not a sampler drawing
 * 500 million numbers. Each size runs in its own child process for its peak memory.
 * Prints figures; never fails on a timing.
 */
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { compile, ProbabilityEvaluator } from '../src/logic/index.js';
import { normalQuantile } from '../src/reliability/special.js';
import { createRng } from '../src/reliability/random.js';
import { syntheticTree } from './synthetic.js';

const SIZES = [1000, 5000, 20000, 50000];
const TRIALS = 10_000;
const CLASSES = 100;
const SIGMA = Math.log(3) / 1.645; // lognormal with error factor 3 (NUREG/CR-6823)

function one(events: number): void {
  const tree = syntheticTree({ events, seed: 20260630 });
  const t0 = performance.now();
  const compiled = compile(tree.graph);
  const root = compiled.gateRoots[tree.top]!;
  const evaluator = new ProbabilityEvaluator(compiled.manager, [root]);
  const tCompile = performance.now() - t0;
  const rng = createRng(1);
  const p = new Float64Array(tree.p.length);
  const factor = new Float64Array(CLASSES);
  let sum = 0;
  const t1 = performance.now();
  for (let trial = 0; trial < TRIALS; trial++) {
    for (let c = 0; c < CLASSES; c++) factor[c] = Math.exp(SIGMA * normalQuantile(rng.next()));
    for (let v = 0; v < p.length; v++) p[v] = Math.min(1, tree.p[v]! * factor[v % CLASSES]!);
    sum += evaluator.evaluate(p)[0]!;
  }
  const tTrials = performance.now() - t1;
  const rss = process.resourceUsage().maxRSS / 1024;
  console.log(
    `${String(events).padStart(6)} events  ${String(compiled.manager.size(root)).padStart(8)} nodes  compile ${tCompile.toFixed(0).padStart(6)} ms  ` +
      `${TRIALS} trials ${(tTrials / 1000).toFixed(2).padStart(6)} s (${Math.round(TRIALS / (tTrials / 1000))} trials/s)  mean ${(sum / TRIALS).toExponential(3)}  peak RSS ${rss.toFixed(0)} MB`,
  );
}

const arg = process.argv[2];
if (arg) one(Number(arg));
else {
  console.log(`Monte Carlo on synthetic trees (${TRIALS} trials each, ${CLASSES} correlated classes):`);
  for (const n of SIZES) {
    const r = spawnSync(process.execPath, ['--import', 'tsx', fileURLToPath(import.meta.url), String(n)], { stdio: 'inherit' });
    if (r.status !== 0) console.log(`  ${n} events: the run failed (exit ${r.status})`);
  }
}
