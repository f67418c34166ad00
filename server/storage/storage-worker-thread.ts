import type { Worker } from 'node:worker_threads';
import { startWorker } from '../workers/start-worker.js';
import type { StorageReply, StorageRequest, StoreState, WorkerOpen } from './storage-protocol.js';

/** Distributes `Omit` over a union, so each request kind keeps its own fields. */
type RequestBody = StorageRequest extends infer R ? (R extends StorageRequest ? Omit<R, 'id'> : never) : never;

export interface StorageWorkerEvents {
  /** Every state the worker reports (after each write attempt and each answer). */
  onState(state: StoreState): void;
  onLog(level: 'info' | 'warn' | 'error', message: string, error: string | undefined): void;
  onOutage(outage: boolean, error: string | null): void;
}

/**
 * The event loop's handle on the storage worker thread (`storage-worker.ts`, started with
 * `startWorker`): sends requests, matches answers by id, and passes on what the worker
 * reports by itself.
 */
export class StorageWorker {
  private readonly worker: Worker;
  private nextId = 1;
  private readonly waiting = new Map<number, { resolve: (value: unknown) => void; reject: (error: Error) => void }>();
  private exited = false;
  /** Resolves once the worker has opened the database (rejects if the worker stops first). */
  readonly ready: Promise<void>;
  private markReady!: () => void;
  private markFailed!: (error: Error) => void;

  constructor(settings: WorkerOpen, events: StorageWorkerEvents) {
    this.worker = startWorker(import.meta.url, 'storage-worker', { workerData: settings });
    this.ready = new Promise<void>((resolve, reject) => {
      this.markReady = resolve;
      this.markFailed = reject;
    });
    this.ready.catch(() => undefined);
    this.worker.on('message', (reply: StorageReply) => {
      if (reply.kind === 'ready') return this.markReady();
      if (reply.kind === 'log') return events.onLog(reply.level, reply.message, reply.error);
      if (reply.kind === 'outage') return events.onOutage(reply.outage, reply.error);
      events.onState(reply.state);
      if (reply.id === null) return;
      const waiter = this.waiting.get(reply.id);
      this.waiting.delete(reply.id);
      if (reply.kind === 'failed') waiter?.reject(new Error(reply.message));
      else if (reply.kind === 'done') waiter?.resolve(reply.result);
    });
    this.worker.on('error', (error) => events.onLog('error', 'storage worker stopped', error.message));
    this.worker.on('exit', () => {
      this.exited = true;
      this.markFailed(new Error('the storage worker stopped before it opened the telemetry database'));
      for (const waiter of this.waiting.values()) waiter.reject(new Error('the storage worker has stopped'));
      this.waiting.clear();
    });
  }

  /** Sends a request; `transfer` lists buffers handed over without copying. */
  request<T>(body: RequestBody, transfer: ArrayBuffer[] = []): Promise<T> {
    if (this.exited) return Promise.reject(new Error('the storage worker has stopped'));
    const id = this.nextId++;
    return new Promise<T>((resolve, reject) => {
      this.waiting.set(id, { resolve: resolve as (value: unknown) => void, reject });
      this.worker.postMessage({ ...body, id }, transfer);
    });
  }

  /** Ends the thread (after a `close` request has finished its work). */
  async terminate(): Promise<void> {
    await this.worker.terminate();
  }
}
