import { Worker } from 'node:worker_threads';

/**
 * Starts the prediction worker thread beside this module.
 *
 * Compiled JavaScript loads `prediction-worker.js` directly. From TypeScript sources (the
 * server under `node --import tsx`, and vitest) the worker must load tsx itself: on Node 20 a
 * Worker given `execArgv: ['--import', 'tsx']` still fails with "Unknown file extension .ts",
 * because module hooks registered that way do not reach the worker's loader. So a short
 * bootstrap registers tsx's ESM hooks inside the new thread and then imports the worker
 * source. Both module URLs are resolved here, from this file, so neither depends on the
 * working directory.
 */
export function startPredictionWorker(): Worker {
  if (import.meta.url.endsWith('.js')) return new Worker(new URL('./prediction-worker.js', import.meta.url));
  const tsxApi = import.meta.resolve('tsx/esm/api');
  const source = new URL('./prediction-worker.ts', import.meta.url).href;
  const bootstrap = `import(${JSON.stringify(tsxApi)}).then((tsx) => { tsx.register(); return import(${JSON.stringify(source)}); });`;
  return new Worker(bootstrap, { eval: true });
}
