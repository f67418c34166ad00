import type { Worker } from 'node:worker_threads';
import { startWorker } from '../workers/start-worker.js';

/** Starts the prediction worker thread beside this module (see `startWorker`). */
export function startPredictionWorker(): Worker {
  return startWorker(import.meta.url, 'prediction-worker');
}
