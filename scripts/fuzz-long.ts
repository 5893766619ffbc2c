/**
 * The long, nightly-style fuzz run of the study reader and the analysis behind it, with the same
 * generators and the same property as test/hardening/fuzz.test.ts, many more cases, and a watchdog:
 *
 *   npx tsx scripts/fuzz-long.ts [cases per generator, default 25000] [seed, default 20260630]
 *
 * Each generator runs in a worker thread. The worker announces every case before it runs it; if a
 * case runs longer than the hang limit, the main thread stops the worker and keeps that case. A
 * case that breaks the property (anything but a Study or a StudyError) is shrunk by fast-check and
 * kept too. Kept cases are written as study folders under out/fuzz/ (run `faultbook run` on them to
 * reproduce). Prints cases, time and outcome per generator; exits 1 if anything was kept.
 */
import { mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { isMainThread, parentPort, Worker, workerData } from 'node:worker_threads';
import fc from 'fast-check';
import { extremeValueCase, rawBytesCase, runCase, structureCase, textMutationCase, type FuzzCase } from '../test/hardening/fuzz-model.js';

const GENERATORS = { raw: rawBytesCase, text: textMutationCase, structure: structureCase, extreme: extremeValueCase } as const;
type GeneratorName = keyof typeof GENERATORS;

/** A case that runs this long is a hang (one case normally takes milliseconds). */
const HANG_MS = 20_000;

interface Job {
  generator: GeneratorName;
  cases: number;
  seed: number;
}

type Message =
  | { type: 'case'; n: number; files: FuzzCase }
  | { type: 'done'; accepted: number; refused: number }
  | { type: 'failed'; files: FuzzCase; error: string; numRuns: number };

if (isMainThread) {
  await mainThread();
} else {
  workerThread(workerData as Job);
}

async function mainThread(): Promise<void> {
  const cases = Number(process.argv[2] ?? 25_000);
  const seed = Number(process.argv[3] ?? 20260630);
  if (!(Number.isInteger(cases) && cases > 0) || !Number.isInteger(seed)) {
    console.error('usage: npx tsx scripts/fuzz-long.ts [cases per generator] [seed]');
    process.exit(2);
  }
  const outRoot = join('out', 'fuzz');
  let kept = 0;
  console.log(`fuzzing the study reader: ${cases} cases per generator, seed ${seed}, hang limit ${HANG_MS / 1000} s`);
  for (const generator of Object.keys(GENERATORS) as GeneratorName[]) {
    const t0 = performance.now();
    const result = await runJob({ generator, cases, seed });
    const seconds = ((performance.now() - t0) / 1000).toFixed(1);
    if (result.kind === 'done') {
      console.log(`${generator.padEnd(9)} ${String(cases).padStart(7)} cases  ${seconds.padStart(6)} s  ok (${result.accepted} accepted, ${result.refused} refused)`);
      continue;
    }
    kept++;
    const dir = join(outRoot, `${generator}-seed${seed}-${result.kind}`);
    rmSync(dir, { recursive: true, force: true });
    writeCase(dir, result.files);
    writeFileSync(join(dir, 'FUZZ-FINDING.txt'), `${result.kind} in generator ${generator}, seed ${seed}\n\n${result.detail}\n`);
    console.log(`${generator.padEnd(9)} ${result.kind.toUpperCase()} after ${seconds} s: kept in ${dir}\n  ${result.detail.split('\n')[0]}`);
  }
  process.exit(kept > 0 ? 1 : 0);
}

type JobResult =
  | { kind: 'done'; accepted: number; refused: number }
  | { kind: 'failure' | 'hang'; files: FuzzCase; detail: string };

function runJob(job: Job): Promise<JobResult> {
  return new Promise((resolve, reject) => {
    // The worker runs this same TypeScript file, so it registers the tsx loader first.
    const boot = `import('tsx/esm/api').then((tsx) => { tsx.register(); return import(${JSON.stringify(import.meta.url)}); })`;
    const worker = new Worker(boot, { eval: true, workerData: job });
    let current: { n: number; files: FuzzCase; since: number } | undefined;
    let settled = false;
    const finish = (r: JobResult) => {
      if (settled) return;
      settled = true;
      clearInterval(watchdog);
      void worker.terminate();
      resolve(r);
    };
    const watchdog = setInterval(() => {
      if (current && performance.now() - current.since > HANG_MS) {
        finish({ kind: 'hang', files: current.files, detail: `case ${current.n} ran longer than ${HANG_MS / 1000} s` });
      }
    }, 1000);
    worker.on('message', (m: Message) => {
      if (m.type === 'case') current = { n: m.n, files: m.files, since: performance.now() };
      else if (m.type === 'done') finish({ kind: 'done', accepted: m.accepted, refused: m.refused });
      else finish({ kind: 'failure', files: m.files, detail: `shrunk counterexample after ${m.numRuns} runs\n${m.error}` });
    });
    worker.on('error', (err) => (current ? finish({ kind: 'failure', files: current.files, detail: `worker died: ${String(err)}` }) : reject(err)));
    worker.on('exit', (code) => {
      if (!settled) finish(current ? { kind: 'failure', files: current.files, detail: `worker exited with code ${code}` } : { kind: 'done', accepted: 0, refused: 0 });
    });
  });
}

function workerThread(job: Job): void {
  const port = parentPort!;
  const dir = join(tmpdir(), `faultbook-fuzz-long-${process.pid}-${job.generator}`, 'study');
  let n = 0;
  let accepted = 0;
  let refused = 0;
  let shrinking = false;
  const details = fc.check(
    fc.property(GENERATORS[job.generator](), (files) => {
      // Announce each case while searching; during shrinking the watchdog still sees progress.
      if (!shrinking) port.postMessage({ type: 'case', n: ++n, files } satisfies Message);
      if (runCase(dir, files) === 'accepted') accepted++;
      else refused++;
    }),
    { numRuns: job.cases, seed: job.seed, endOnFailure: false, reporter: undefined },
  );
  shrinking = true;
  rmSync(join(dir, '..'), { recursive: true, force: true });
  if (details.failed && details.counterexample) {
    port.postMessage({ type: 'failed', files: details.counterexample[0], error: String(details.errorInstance ?? 'property failed'), numRuns: details.numRuns } satisfies Message);
  } else {
    port.postMessage({ type: 'done', accepted, refused } satisfies Message);
  }
}

function writeCase(dir: string, files: FuzzCase): void {
  for (const [name, data] of Object.entries(files)) {
    mkdirSync(join(dir, name, '..'), { recursive: true });
    writeFileSync(join(dir, name), data);
  }
}
