/**
 * Body of the storage worker thread: owns the telemetry database connection (its own PGlite
 * cluster in `${dataDir}/telemetry`, or its own pool to `DATABASE_URL`), encodes and writes
 * what the event loop hands over, prunes old telemetry, and answers history reads. Database
 * work, sample encoding and compression never run on the server's event loop.
 *
 * The database is opened in the background and reopened after a failed start, so the server
 * starts (and keeps supervising) while it is down; writes wait in the bounded queue meanwhile.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { openDatabase, type OpenDatabase } from '../db/database.js';
import { RetentionTask } from './retention.js';
import type { StorageReply, StorageRequest, WorkerOpen } from './storage-protocol.js';
import { TelemetryStore } from './telemetry-store.js';
import { lowerThisThreadPriority } from '../workers/background-priority.js';

const port = parentPort;
if (!port) throw new Error('storage-worker.ts must run in a worker thread');
// Background work: the event loop (ingest, supervision, fan-out) comes first when CPU is short.
lowerThisThreadPriority();
const settings = workerData as WorkerOpen;

/** Pause between attempts to open the database at start, ms. */
const REOPEN_MS = 2000;
/** How often queued writes are tried again without new data, ms. */
const RETRY_TICK_MS = 500;

const post = (reply: StorageReply) => port.postMessage(reply);
const log = (level: 'info' | 'warn' | 'error', message: string, error?: unknown) =>
  post({ id: null, kind: 'log', level, message, error: error instanceof Error ? error.message : error === undefined ? undefined : String(error) });

let database: OpenDatabase | null = null;
let retention: RetentionTask | null = null;
let closing = false;

const store = new TelemetryStore(() => database?.db ?? null, {
  maxPendingSamples: settings.maxPendingSamples,
  retryMinMs: settings.retryMinMs,
  retryMaxMs: settings.retryMaxMs,
  onError: (error) => log('error', 'storing telemetry failed', error),
  onOutageChange: (outage, error) => post({ id: null, kind: 'outage', outage, error: error?.message ?? null }),
});

// A database connection that breaks while idle must not end the thread: the queue rides it out.
process.on('uncaughtException', (error) => log('error', 'storage worker error (writes continue to be retried)', error));

const retryTimer = setInterval(() => {
  const before = store.state();
  if (before.pendingFrames === 0 && before.pendingSamples === 0) return;
  void store.flush().then(() => post({ id: null, kind: 'state', state: store.state() }));
}, RETRY_TICK_MS);

async function open(): Promise<void> {
  while (!closing) {
    try {
      const opened = await openDatabase({ dataDir: settings.dataDir, databaseUrl: settings.databaseUrl, pgliteFolder: 'telemetry' });
      if (closing) {
        await opened.close();
        return;
      }
      database = opened;
      retention = new RetentionTask(opened.db, settings.retention, (error) => log('error', 'pruning old telemetry failed', error));
      post({ id: null, kind: 'ready' });
      return;
    } catch (error) {
      log('error', `cannot open the telemetry database; trying again in ${REOPEN_MS / 1000} s`, error);
      await new Promise((resolve) => setTimeout(resolve, REOPEN_MS));
    }
  }
}
const opening = open();

port.on('message', (request: StorageRequest) => {
  handle(request).then(
    (result) => post({ id: request.id, kind: 'done', state: store.state(), result }),
    (error: unknown) => post({ id: request.id, kind: 'failed', state: store.state(), message: error instanceof Error ? error.message : String(error) }),
  );
});

async function handle(request: StorageRequest) {
  switch (request.kind) {
    case 'append':
      // Written at the next flush (every flushIntervalMs), so early hand-overs at high rates add no transactions.
      store.append(request.input);
      return undefined;
    case 'flush':
      await store.flush();
      return undefined;
    case 'raw':
      return store.rawCurrents(request.fromMs, request.toMs, request.blockMs);
    case 'slow':
      return store.slowRows(request.fromMs, request.toMs, request.blockMs);
    case 'rollups':
      return store.rollupBlocks(request.fromMs, request.toMs, request.blockMs);
    case 'predictions':
      return store.predictions(request.fromMs, request.toMs, request.maxPoints);
    case 'close':
      closing = true;
      clearInterval(retryTimer);
      await opening;
      await store.close();
      await retention?.close();
      await database?.close();
      database = null;
      return undefined;
  }
}
