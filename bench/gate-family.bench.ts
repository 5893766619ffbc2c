/**
 * The engine at scale: the invented "many gates" family (bench/gate-family.ts) at M/K = 50/10,
 * 100/10, 200/20 and 400/20, `faultbook run --format json` as a whole process against the BuDDy C
 * library building the same function in the same variable order (bench/buddy/build.c, whole
 * process too, with its own garbage collection), their ratio, the final diagram size, each side's
 * peak memory (/usr/bin/time -v), and the exact values side by side (they must agree to 1e-12
 * relative; a row says so). Wall and CPU (user + system) seconds are both shown: on a shared
 * machine the CPU figure is the steadier one; the ratio is of wall times. Prints figures; never
 * fails on a timing.
 *
 *   node bench/run.js gate-family
 *   node --import tsx bench/gate-family.bench.ts [--bin path/to/bin/faultbook.js] [--max-nodes N] [--only 400] [--layout blocks|striped]
 *
 * A second table follows: the same family with its controllers striped across the power groups
 * (bench/gate-family.ts, `layout`), whose diagrams are much larger for the same number of events.
 *
 * `--bin` times another build (the "before" figures of a change); `--max-nodes` writes that
 * settings.max_nodes into the studies (a build whose default budget the larger sizes exceed).
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { buildLogicModel } from '../src/analysis/logic-model.js';
import { baseCase } from '../src/analysis/case.js';
import { evaluateEvents } from '../src/analysis/event-probability.js';
import { variableOrder } from '../src/logic/order.js';
import { readStudy } from '../src/study/read.js';
import { prepareBuddy, writeBuddyDump } from './buddy/dump.js';
import { gateFamilyStudy } from './gate-family.js';

const here = dirname(fileURLToPath(import.meta.url));
const SIZES: [number, number][] = [
  [50, 10],
  [100, 10],
  [200, 20],
  [400, 20],
];

const arg = (name: string): string | undefined => {
  const i = process.argv.indexOf(name);
  return i >= 0 ? process.argv[i + 1] : undefined;
};
const bin = arg('--bin') ?? join(here, '..', 'bin', 'faultbook.js');
const maxNodes = arg('--max-nodes') ? Number(arg('--max-nodes')) : undefined;
const only = arg('--only');
const layoutArg = arg('--layout');
/**
 * Without --layout: the blocks table at every size, then the striped layout at 50/10 only (at
 * 100/10 its diagram is 9.6M nodes: faultbook takes minutes, and BuDDy did not finish in 10
 * minutes on this machine).
 */
const TABLES: { layout: 'blocks' | 'striped'; sizes: [number, number][] }[] =
  layoutArg === 'striped' ? [{ layout: 'striped', sizes: SIZES }] : layoutArg === 'blocks' ? [{ layout: 'blocks', sizes: SIZES }] : [
    { layout: 'blocks', sizes: SIZES },
    { layout: 'striped', sizes: [[50, 10]] },
  ];

interface Timed {
  ok: boolean;
  seconds: number;
  /** User + system CPU seconds: steadier than wall time on a shared machine. */
  cpu: number;
  maxRssMb: number;
  stdout: string;
  stderr: string;
}

/** Runs a command under /usr/bin/time -v: wall time measured here, peak RSS from time's report. */
function timedRun(cmd: string, args: string[]): Timed {
  const t0 = performance.now();
  const r = spawnSync('/usr/bin/time', ['-v', cmd, ...args], { encoding: 'utf8', maxBuffer: 1 << 26 });
  const seconds = (performance.now() - t0) / 1000;
  const rss = /Maximum resident set size \(kbytes\): (\d+)/.exec(r.stderr ?? '');
  const user = /User time \(seconds\): ([\d.]+)/.exec(r.stderr ?? '');
  const sys = /System time \(seconds\): ([\d.]+)/.exec(r.stderr ?? '');
  const cpu = user && sys ? Number(user[1]) + Number(sys[1]) : NaN;
  return { ok: r.status === 0, seconds, cpu, maxRssMb: rss ? Number(rss[1]) / 1024 : NaN, stdout: r.stdout ?? '', stderr: r.stderr ?? '' };
}

const pad = (s: string | number, n: number): string => String(s).padStart(n);

function main(): void {
  if (!existsSync(bin)) {
    console.log(`${bin} is missing: run \`npm run build\` first (npm run bench does)`);
    return;
  }
  const outDir = join(here, 'out');
  const buddy = prepareBuddy(outDir);
  if (typeof buddy !== 'string') console.log(`BuDDy comparison skipped: ${buddy.skipped}`);
  for (const { layout, sizes } of TABLES) table(buddy, layout, sizes);
}

function table(buddy: string | { skipped: string }, layout: 'blocks' | 'striped', sizes: [number, number][]): void {
  console.log(`gate family (invented, controllers in ${layout}): faultbook ${bin} run --format json, whole process, vs BuDDy whole process`);
  console.log(
    [pad('M/K', 7), pad('events', 7), pad('top nodes', 10), pad('BuDDy s', 8), pad('cpu', 5), pad('MB', 6), pad('faultbook s', 12), pad('cpu', 5), pad('MB', 6), pad('ratio', 6), pad('P(top)', 22), pad('rel. diff', 10)].join(' '),
  );
  let prev: { nodes: number; seconds: number } | undefined;
  for (const [M, K] of sizes) {
    if (only && String(M) !== only) continue;
    const dir = mkdtempSync(join(tmpdir(), 'faultbook-bench-family-'));
    try {
      for (const [name, text] of Object.entries(gateFamilyStudy({ gates: M, atLeast: K, layout, ...(maxNodes ? { maxNodes } : {}) }))) writeFileSync(join(dir, name), text);
      const study = readStudy(dir);
      const model = buildLogicModel(study);
      const p = evaluateEvents(study, baseCase()).probability;
      const dump = join(dir, 'buddy.txt');
      writeBuddyDump(dump, model.graph, p, model.topGates[0]!, variableOrder(model.graph), 0);
      let b: { seconds: number; cpu: number; maxRssMb: number; probability: number; nodes: number } | undefined;
      if (typeof buddy === 'string') {
        const r = timedRun('sh', ['-c', 'ulimit -s unlimited 2>/dev/null || ulimit -s 1048576 2>/dev/null; exec "$0" "$1" 1', buddy, dump]);
        if (r.ok) {
          const j = JSON.parse(r.stdout.trim().split('\n').pop()!) as { probability: number; top_nodes: number };
          b = { seconds: r.seconds, cpu: r.cpu, maxRssMb: r.maxRssMb, probability: j.probability, nodes: j.top_nodes };
        } else console.log(`  BuDDy failed: ${r.stderr.trim().split('\n').slice(0, 2).join(' | ')}`);
      }
      const out = join(dir, 'out');
      const f = timedRun(process.execPath, [bin, 'run', dir, '--out', out, '--format', 'json', '--quiet']);
      if (!f.ok) {
        const why = f.stderr.split('\n').find((l) => l.startsWith('error')) ?? f.stderr.trim().split('\n')[0];
        console.log(`${pad(`${M}/${K}`, 7)} ${pad(study.events.length, 7)}  faultbook failed after ${f.seconds.toFixed(1)} s, ${f.maxRssMb.toFixed(0)} MB: ${why}`);
        continue;
      }
      const results = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8')) as { tops: { probability: { exact: number }; bdd_nodes: number }[] };
      const P = results.tops[0]!.probability.exact;
      const nodes = results.tops[0]!.bdd_nodes;
      const rel = b ? Math.abs(P - b.probability) / b.probability : NaN;
      console.log(
        [
          pad(`${M}/${K}`, 7), pad(study.events.length, 7), pad(nodes, 10),
          pad(b ? b.seconds.toFixed(2) : '-', 8), pad(b ? b.cpu.toFixed(2) : '-', 5), pad(b ? b.maxRssMb.toFixed(0) : '-', 6),
          pad(f.seconds.toFixed(2), 12), pad(f.cpu.toFixed(2), 5), pad(f.maxRssMb.toFixed(0), 6),
          pad(b ? `${(f.seconds / b.seconds).toFixed(1)}×` : '-', 6),
          pad(P.toPrecision(16), 22), pad(b ? rel.toExponential(1) : '-', 10),
          b && rel > 1e-12 ? ' DIFFERS beyond 1e-12' : '',
          b && b.nodes !== nodes ? ` (BuDDy ${b.nodes} nodes)` : '',
          prev ? `  growth: time ×${(f.seconds / prev.seconds).toFixed(1)}, diagram ×${(nodes / prev.nodes).toFixed(1)}` : '',
        ].join(' '),
      );
      prev = { nodes, seconds: f.seconds };
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }
}

main();
