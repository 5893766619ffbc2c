// Throughput of the reliability maths on the paths a Monte Carlo run takes (per-call cost).
// Prints figures only; never fails on a timing.
import { performance } from 'node:perf_hooks';
import { betaQuantile, gammaQuantile, normalQuantile, regularizedGammaP } from '../src/reliability/special.js';
import { createRng, latinHypercube } from '../src/reliability/random.js';
import { sampleQuantile } from '../src/reliability/distributions.js';
import { weibullEventProbability } from '../src/reliability/models/index.js';

function measure(name: string, calls: number, body: (u: number) => number): void {
  const rng = createRng(1);
  const us = Array.from({ length: calls }, () => rng.next());
  let sink = 0;
  for (let i = 0; i < Math.min(1000, calls); i++) sink += body(us[i]!); // warm-up
  const t0 = performance.now();
  for (let i = 0; i < calls; i++) sink += body(us[i]!);
  const ms = performance.now() - t0;
  console.log(`${name.padEnd(44)} ${((ms * 1e6) / calls).toFixed(0).padStart(7)} ns/call  (${calls} calls, checksum ${sink.toPrecision(6)})`);
}

const N = 200000;
measure('normalQuantile', N, (u) => normalQuantile(u));
measure('regularizedGammaP(2.5, x)', N, (u) => regularizedGammaP(2.5, 10 * u));
measure('gammaQuantile(p, 2.5, 1)', N, (u) => gammaQuantile(u, 2.5, 1));
measure('betaQuantile(p, 0.5, 120.5)', N, (u) => betaQuantile(u, 0.5, 120.5));
measure('sampleQuantile lognormal EF 3', N, (u) => sampleQuantile({ kind: 'lognormal', median: 1e-3, ef: 3 }, u));
measure('weibull event, exercise, end basis', N, (u) => weibullEventProbability({ shape: 2 + u, scale: 75, age: 32, exercise: 1 / 12 }));
measure('weibull event, exercise, average basis', N / 10, (u) =>
  weibullEventProbability({ shape: 2 + u, scale: 75, age: 32, exercise: 1 / 12, basis: 'average' }),
);
{
  const rng = createRng(2);
  const t0 = performance.now();
  let s = 0;
  for (let i = 0; i < 1e6; i++) s += rng.next();
  console.log(`${'createRng().next()'.padEnd(44)} ${((performance.now() - t0) * 1e6 / 1e6).toFixed(0).padStart(7)} ns/call  (1e6 calls, checksum ${s.toPrecision(6)})`);
  const t1 = performance.now();
  latinHypercube(rng, 20000);
  console.log(`${'latinHypercube(rng, 20000)'.padEnd(44)} ${(performance.now() - t1).toFixed(2).padStart(7)} ms`);
}
