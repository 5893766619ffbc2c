/**
 * Benchmark of the Boolean core on seeded synthetic trees (bench/synthetic.ts), and a comparison
 * of diagram construction with the BuDDy C library. Prints tables; never fails on a timing.
 *
 *   node bench/run.js logic          (or: node --import tsx --expose-gc bench/logic.bench.ts)
 *
 * Each tree size runs in its own child process, so its peak resident memory (getrusage maxRSS)
 * belongs to that size alone; within a child the peak is cumulative over the phases, in order.
 * A small warm-up tree runs first in every child so the timings are not of the JIT compiler.
 */
import { spawnSync } from 'node:child_process';
import { mkdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { compile, importance, minimalCutSets, probability } from '../src/logic/index.js';
import { syntheticTree, type SyntheticTree } from './synthetic.js';
import { prepareBuddy, writeBuddyDump } from './buddy/dump.js';

const here = dirname(fileURLToPath(import.meta.url));
const outDir = join(here, 'out');
const SIZES = [1000, 5000, 20000, 50000];
const SEED = 20260630;
const CUTOFF = 1e-12;
const MAX_ORDER = 8;
/** Repetitions of the construction comparison (median reported). */
const REPS = 5;

interface CaseResult {
  events: number;
  shared: number;
  gates: number;
  managerNodes: number;
  topNodes: number;
  probability: number;
  compileMs: number;
  compileRssMb: number;
  cutSetMs: number;
  cutSets: number;
  truncated: number;
  truncatedExact: boolean;
  cutSetRssMb: number;
  importanceMs: number;
  importanceRssMb: number;
  heapMb: number;
  buddy?: { oursMs: number; buddyBuildMs: number; buddyInitMs: number; buddyTopNodes: number; buddyProbability: number; gc: number } | { skipped: string };
}

// A full major collection between phases, so each phase's memory is its own. Plain gc() is the
// "last resort" collection, which also throws away optimised code: the next phase then ran up to
// 5× slower (measured), which is not how the tool runs. gc({ type: 'major' }) keeps the code.
const gc = (): void => (globalThis as { gc?: (o?: { type: 'major' | 'minor' }) => void }).gc?.({ type: 'major' });
const rssMb = (): number => process.resourceUsage().maxRSS / 1024;
const heapMb = (): number => {
  const m = process.memoryUsage();
  return (m.heapUsed + m.arrayBuffers) / 2 ** 20;
};

function timed<T>(f: () => T): [T, number] {
  const t0 = performance.now();
  const r = f();
  return [r, performance.now() - t0];
}

/** The function as BuDDy's helper reads it (format in bench/buddy/build.c): variables by level. */
function writeDump(path: string, t: SyntheticTree, order: number[], nodeHint: number): void {
  writeBuddyDump(path, t.graph, t.p, t.top, order, nodeHint);
}

function runPipeline(t: SyntheticTree): Omit<CaseResult, 'buddy' | 'events' | 'shared' | 'gates'> & { order: number[] } {
  gc();
  const [[c, P], compileMs] = timed(() => {
    const c = compile(t.graph);
    return [c, probability(c.manager, c.gateRoots[t.top]!, t.p)] as const;
  });
  const compileRssMb = rssMb();
  const root = c.gateRoots[t.top]!;
  gc();
  const [cs, cutSetMs] = timed(() => minimalCutSets(c.manager, root, t.p, { cutoff: CUTOFF, maxOrder: MAX_ORDER, monotone: c.negationFree }));
  const cutSetRssMb = rssMb();
  gc();
  const [imp, importanceMs] = timed(() => importance(c.manager, root, t.p));
  const importanceRssMb = rssMb();
  if (Math.abs(imp.probability - P) > 1e-12 * P) throw new Error('importance and probability passes disagree');
  return {
    managerNodes: c.nodeCount,
    topNodes: c.manager.size(root),
    probability: P,
    compileMs,
    compileRssMb,
    cutSetMs,
    cutSets: cs.sets.length,
    truncated: cs.truncated,
    truncatedExact: cs.truncatedExact,
    cutSetRssMb,
    importanceMs,
    importanceRssMb,
    heapMb: heapMb(),
    order: c.order,
  };
}

function runCase(events: number, buddyBinary: string | null): CaseResult {
  // Warm-up on a different, smaller tree.
  runPipeline(syntheticTree({ events: 2000, seed: SEED + 1 }));
  const t = syntheticTree({ events, seed: SEED });
  const r = runPipeline(t);
  const result: CaseResult = { events, shared: t.sharedEvents, gates: t.graph.gates.length, ...r };
  delete (result as Partial<typeof r>).order;
  if (!buddyBinary) {
    result.buddy = { skipped: 'no BuDDy helper (gcc or libbdd-dev missing)' };
    return result;
  }
  // Ours, same order, construction only (the order heuristic is excluded on both sides). The two
  // sides alternate, REPS times each, and the medians are compared, so both see the same machine
  // load and a stray garbage collection or JIT tier-up is not the figure.
  mkdirSync(outDir, { recursive: true });
  const dump = join(outDir, `logic-${events}.txt`);
  writeDump(dump, t, r.order, r.managerNodes);
  const ours: number[] = [];
  const theirs: { init_ms: number; build_ms: number; top_nodes: number; probability: number; gc: number }[] = [];
  for (let i = 0; i < REPS; i++) {
    gc();
    ours.push(timed(() => compile(t.graph, { order: r.order }))[1]);
    // BuDDy recurses as deep as the diagram; lift the C stack limit where allowed.
    const run = spawnSync('sh', ['-c', 'ulimit -s unlimited 2>/dev/null || ulimit -s 1048576 2>/dev/null; exec "$0" "$1" 1', buddyBinary, dump], {
      encoding: 'utf8',
    });
    if (run.status !== 0) {
      result.buddy = { skipped: `BuDDy helper failed: ${(run.stderr || run.error?.message || '').trim().slice(0, 200)}` };
      return result;
    }
    theirs.push(JSON.parse(run.stdout.trim().split('\n').pop()!));
  }
  const median = (xs: number[]): number => [...xs].sort((a, b) => a - b)[xs.length >> 1]!;
  const oursMs = median(ours);
  const b = {
    init_ms: median(theirs.map((x) => x.init_ms)),
    build_ms: median(theirs.map((x) => x.build_ms)),
    top_nodes: theirs[0]!.top_nodes,
    probability: theirs[0]!.probability,
    gc: Math.max(...theirs.map((x) => x.gc)),
  };
  result.buddy = {
    oursMs,
    buddyBuildMs: b.build_ms,
    buddyInitMs: b.init_ms,
    buddyTopNodes: b.top_nodes,
    buddyProbability: b.probability,
    gc: b.gc,
  };
  return result;
}

const pad = (s: string | number, n: number): string => String(s).padStart(n);
const ms = (x: number): string => (x < 10 ? x.toFixed(1) : x.toFixed(0));

function main(): void {
  const caseArg = process.argv.indexOf('--case');
  if (caseArg >= 0) {
    const events = Number(process.argv[caseArg + 1]);
    const bin = process.argv[caseArg + 2];
    console.log(JSON.stringify(runCase(events, bin && bin !== '-' ? bin : null)));
    return;
  }
  const buddy = prepareBuddy(outDir);
  const binArg = typeof buddy === 'string' ? buddy : '-';
  console.log(`Boolean core on seeded synthetic trees (seed ${SEED}; ~30% shared events; p log-uniform 1e-5..1e-2)`);
  console.log(`cut sets: cutoff ${CUTOFF}, max order ${MAX_ORDER}. Peak RSS is per child process, cumulative over its phases.`);
  console.log(`gc between phases: ${typeof (globalThis as { gc?: unknown }).gc === 'function' ? 'yes' : 'no (run with --expose-gc)'}`);
  const results: CaseResult[] = [];
  for (const events of SIZES) {
    const child = spawnSync(process.execPath, [...process.execArgv, fileURLToPath(import.meta.url), '--case', String(events), binArg], {
      encoding: 'utf8',
      maxBuffer: 1 << 26,
      timeout: 15 * 60_000,
    });
    if (child.status !== 0) {
      console.log(`${events} events: run failed (${child.signal ?? child.status}): ${child.stderr.trim().split('\n').slice(-3).join(' | ')}`);
      continue;
    }
    results.push(JSON.parse(child.stdout.trim().split('\n').pop()!) as CaseResult);
  }

  console.log('');
  console.log(
    [
      pad('events', 7), pad('shared', 7), pad('gates', 6), pad('mgr nodes', 10), pad('top nodes', 10), pad('P(top)', 10),
      pad('compile+P ms', 13), pad('RSS MB', 7), pad('cut sets ms', 12), pad('sets', 8), pad('dropped', 9), pad('RSS MB', 7),
      pad('importance ms', 14), pad('RSS MB', 7),
    ].join(' '),
  );
  for (const r of results) {
    console.log(
      [
        pad(r.events, 7), pad(r.shared, 7), pad(r.gates, 6), pad(r.managerNodes, 10), pad(r.topNodes, 10), pad(r.probability.toExponential(3), 10),
        pad(ms(r.compileMs), 13), pad(r.compileRssMb.toFixed(0), 7), pad(ms(r.cutSetMs), 12), pad(r.cutSets, 8),
        pad(`${r.truncatedExact ? '' : '≥'}${r.truncated}`, 9), pad(r.cutSetRssMb.toFixed(0), 7),
        pad(ms(r.importanceMs), 14), pad(r.importanceRssMb.toFixed(0), 7),
      ].join(' '),
    );
  }
  const at5k = results.find((r) => r.events === 5000);
  if (at5k) {
    console.log('');
    console.log(`targets at 5,000 events: exact ${ms(at5k.compileMs)} ms (target < 1000), cut sets ${ms(at5k.cutSetMs)} ms (target < 3000)`);
  }

  console.log('');
  if (typeof buddy !== 'string') {
    console.log(`BuDDy comparison skipped: ${buddy.skipped}`);
    return;
  }
  console.log(`Construction of the same diagrams (same variable order, same operation sequence) vs BuDDy (libbdd, gcc -O2), median of ${REPS}:`);
  console.log([pad('events', 7), pad('ours ms', 9), pad('BuDDy ms', 9), pad('init ms', 8), pad('ratio', 6), pad('top nodes', 10), pad('same nodes', 11), pad('|ΔP|', 9)].join(' '));
  for (const r of results) {
    const b = r.buddy;
    if (!b || 'skipped' in b) {
      console.log(`${pad(r.events, 7)} skipped: ${b ? b.skipped : 'no result'}`);
      continue;
    }
    const theirs = b.buddyBuildMs + b.buddyInitMs;
    console.log(
      [
        pad(r.events, 7), pad(ms(b.oursMs), 9), pad(ms(b.buddyBuildMs), 9), pad(ms(b.buddyInitMs), 8), pad((b.oursMs / theirs).toFixed(2), 6),
        pad(b.buddyTopNodes, 10), pad(b.buddyTopNodes === r.topNodes ? 'yes' : `no (${r.topNodes})`, 11),
        pad(Math.abs(b.buddyProbability - r.probability).toExponential(1), 9),
      ].join(' '),
    );
  }
  console.log('ratio = our compile time / BuDDy (init + build) time; target within 3×. BuDDy garbage collections: ' +
    results.map((r) => (r.buddy && !('skipped' in r.buddy) ? r.buddy.gc : '-')).join(', '));
}

main();
