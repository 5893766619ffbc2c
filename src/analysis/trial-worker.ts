/**
 * Entry point of a Monte Carlo worker thread (parallel-trials.ts): runs chunks of the job it is
 * given until none is left. Loaded from dist/ as compiled JavaScript.
 */
import { workerData } from 'node:worker_threads';
import { workerMain, type WorkerInput } from './parallel-trials.js';

workerMain(workerData as WorkerInput);
