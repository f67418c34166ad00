import { Worker, type WorkerOptions } from 'node:worker_threads';

/**
 * Starts the worker thread `${name}.js` (compiled output) or `${name}.ts` (TypeScript sources)
 * beside the module at `callerUrl` (its `import.meta.url`).
 *
 * From TypeScript sources (the server under `node --import tsx`, and vitest) the worker must
 * load tsx itself: on Node 20 a Worker given `execArgv: ['--import', 'tsx']` still fails with
 * "Unknown file extension .ts", because module hooks registered that way do not reach the
 * worker's loader. So a short bootstrap registers tsx's ESM hooks inside the new thread and
 * then imports the worker source. Both module URLs are resolved from `callerUrl`, so neither
 * depends on the working directory.
 */
export function startWorker(callerUrl: string, name: string, options: WorkerOptions = {}): Worker {
  if (callerUrl.endsWith('.js')) return new Worker(new URL(`./${name}.js`, callerUrl), options);
  const tsxApi = import.meta.resolve('tsx/esm/api');
  const source = new URL(`./${name}.ts`, callerUrl).href;
  const bootstrap = `import(${JSON.stringify(tsxApi)}).then((tsx) => { tsx.register(); return import(${JSON.stringify(source)}); });`;
  return new Worker(bootstrap, { ...options, eval: true });
}
