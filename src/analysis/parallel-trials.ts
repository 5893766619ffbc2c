/**
 * Running a job's trials on several threads (node:worker_threads), synchronously, with the same
 * numbers as one thread. The trials are cut into chunks; the calling thread and the workers take
 * the next chunk from a shared counter (Atomics) until none is left, and every trial writes its
 * values at its own index of shared arrays. Which thread ran a trial never shows: its uniforms
 * depend only on the seed and its index, and the summaries are taken afterwards over the arrays in
 * trial order. The calling thread works too and waits for the workers with Atomics.wait, so the
 * analysis stays a plain function call. A worker that cannot start (no compiled dist/, a sandbox
 * without threads) takes no chunk, and the calling thread runs them all: the same numbers, slower.
 * When several trials fail, the error reported is that of the lowest trial, as one thread would
 * meet it: every chunk below a failing trial is still run.
 *
 * Workers run the compiled JavaScript in dist/ (trial-worker.js beside this file once built; from
 * the TypeScript sources under vitest, the built copy in ../../dist): a worker cannot load .ts.
 */
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { receiveMessageOnPort, MessageChannel, Worker, type MessagePort } from 'node:worker_threads';
import { StudyError } from '../study/errors.js';
import { EventProbabilityError } from './event-probability.js';
import { TrialError, TrialRunner, trialSink, type TrialJob, type TrialSink } from './trials.js';

/** Trials per chunk a thread takes at a time. */
export const CHUNK = 1024;

/** Indices into the shared control array: next chunk to take, trials done, chunks completed (run or passed over), chunks the workers ran. */
const NEXT = 0;
const DONE = 1;
const COMPLETED = 2;
const WORKER_CHUNKS = 3;
const CONTROL = 4;

/** What a worker gets (structured-cloned). */
export interface WorkerInput {
  job: TrialJob;
  sink: TrialSink;
  control: Int32Array;
  batch: number;
  port: MessagePort;
}

/** What a worker posts when a trial fails (before it counts that chunk completed, so the caller has it when it stops waiting). */
export interface WorkerFailure {
  trial: number;
  error: SerializedError;
}

export type SerializedError = { kind: 'study'; message: string; at?: StudyError['at']; hint?: string } | { kind: 'other'; message: string; stack?: string };

export interface ParallelOptions {
  threads: number;
  batch: number;
  /** Trials done so far, across threads (for the progress bar). */
  onProgress?: (done: number) => void;
  /** Tests only: leave every chunk to the workers, so the worker path is known to have run. */
  workersOnly?: boolean;
}

export interface ParallelResult {
  sink: TrialSink;
  /** Chunks the workers ran (0 when none could start): for the benchmark's figures, never in results. */
  workerChunks: number;
}

/** The compiled worker script, or undefined when there is none to run. */
export function workerScript(): URL | undefined {
  const here = import.meta.url;
  const url = here.endsWith('.ts') ? new URL('../../dist/analysis/trial-worker.js', here) : new URL('./trial-worker.js', here);
  return url.protocol === 'file:' && existsSync(fileURLToPath(url)) ? url : undefined;
}

/**
 * Takes chunks from the shared counter and runs them until none is left. After a failure the
 * thread only passes over the chunks it takes (they lie above its failure: chunks are taken in
 * increasing order). `onFailure` hears of the failure before its chunk counts as completed.
 */
export function workOnChunks(
  runner: TrialRunner,
  job: TrialJob,
  sink: TrialSink,
  control: Int32Array,
  hooks: { onBatch?: () => void; onFailure?: (f: TrialError) => void; onChunk?: () => void } = {},
): TrialError | undefined {
  const chunks = Math.ceil(job.samples / CHUNK);
  let failure: TrialError | undefined;
  for (;;) {
    const c = Atomics.add(control, NEXT, 1);
    if (c >= chunks) break;
    const from = c * CHUNK;
    if (!failure) {
      try {
        runner.run(from, Math.min(job.samples, from + CHUNK), sink, (count) => {
          Atomics.add(control, DONE, count);
          hooks.onBatch?.();
        });
        hooks.onChunk?.();
      } catch (err) {
        if (!(err instanceof TrialError)) throw err;
        failure = err;
        hooks.onFailure?.(err);
      }
    }
    Atomics.add(control, COMPLETED, 1);
    Atomics.notify(control, COMPLETED);
  }
  return failure;
}

export function serializeError(err: unknown): SerializedError {
  const e = err instanceof EventProbabilityError ? err.toStudyError() : err;
  if (e instanceof StudyError) return { kind: 'study', message: e.message, ...(e.at ? { at: e.at } : {}), ...(e.hint ? { hint: e.hint } : {}) };
  return e instanceof Error ? { kind: 'other', message: e.message, ...(e.stack ? { stack: e.stack } : {}) } : { kind: 'other', message: String(e) };
}

function deserializeError(e: SerializedError): Error {
  if (e.kind === 'study') return new StudyError(e.message, e.at, e.hint);
  const err = new Error(e.message);
  if (e.stack) err.stack = e.stack;
  return err;
}

/** How long the calling thread waits for a worker's next sign of progress before calling it lost (a fault, not a timing of the result). */
const STALL_MS = 120_000;

/** Runs every trial of the job on `threads` threads (this one included); throws the lowest failing trial's error. */
export function runParallel(job: TrialJob, options: ParallelOptions): ParallelResult {
  const sink = trialSink(job, true);
  const control = new Int32Array(new SharedArrayBuffer(CONTROL * 4));
  const script = workerScript();
  const workers: { worker: Worker; port: MessagePort }[] = [];
  if (script) {
    for (let k = 1; k < options.threads; k++) {
      try {
        const { port1, port2 } = new MessageChannel();
        const input: WorkerInput = { job, sink, control, batch: options.batch, port: port2 };
        const worker = new Worker(script, { workerData: input, transferList: [port2] });
        worker.unref();
        // A worker that fails to load takes no chunk; its error event must not end the process.
        worker.on('error', () => {});
        workers.push({ worker, port: port1 });
      } catch {
        break;
      }
    }
  }
  let mine: TrialError | undefined;
  if (!options.workersOnly || workers.length === 0) {
    const runner = new TrialRunner(job, options.batch);
    mine = workOnChunks(runner, job, sink, control, { onBatch: () => options.onProgress?.(Atomics.load(control, DONE)) });
  }
  // Wait until every chunk is completed, whoever took it.
  const chunks = Math.ceil(job.samples / CHUNK);
  let lastDone = -1;
  let quietSince = Date.now();
  for (;;) {
    const completed = Atomics.load(control, COMPLETED);
    if (completed >= chunks) break;
    Atomics.wait(control, COMPLETED, completed, 100);
    const done = Atomics.load(control, DONE);
    options.onProgress?.(done);
    if (done !== lastDone) {
      lastDone = done;
      quietSince = Date.now();
    } else if (Date.now() - quietSince > STALL_MS) {
      throw new Error('Monte Carlo worker threads stopped making progress');
    }
  }
  let failure: { trial: number; error: Error } | undefined = mine ? { trial: mine.trial, error: toError(mine.error) } : undefined;
  for (const { worker, port } of workers) {
    for (let m = receiveMessageOnPort(port); m; m = receiveMessageOnPort(port)) {
      const f = m.message as WorkerFailure;
      if (!failure || f.trial < failure.trial) failure = { trial: f.trial, error: deserializeError(f.error) };
    }
    port.close();
    void worker.terminate();
  }
  if (failure) throw failure.error;
  return { sink, workerChunks: Atomics.load(control, WORKER_CHUNKS) };
}

function toError(cause: unknown): Error {
  const e = cause instanceof EventProbabilityError ? cause.toStudyError() : cause;
  return e instanceof Error ? e : new Error(String(e));
}

/** The worker's side: run chunks, post a failure as soon as it happens. */
export function workerMain(input: WorkerInput): void {
  const { job, sink, control, batch, port } = input;
  let runner: TrialRunner;
  try {
    runner = new TrialRunner(job, batch);
  } catch {
    // The calling thread makes the same runner and meets the same error, or runs the chunks itself.
    port.close();
    return;
  }
  workOnChunks(runner, job, sink, control, {
    onFailure: (f) => port.postMessage({ trial: f.trial, error: serializeError(f.error) } satisfies WorkerFailure),
    onChunk: () => Atomics.add(control, WORKER_CHUNKS, 1),
  });
  port.close();
}
