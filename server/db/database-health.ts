/** What `/api/health` says about the database. Times in ISO 8601 UTC. */
export interface DatabaseHealthReport {
  /** `unreachable` while the server cannot reach its PostgreSQL server. */
  state: 'up' | 'unreachable';
  /** Since when the present state holds; null while up since the start. */
  since: string | null;
  /** The driver's own message for the newest connection failure (kept after recovery). */
  lastError: string | null;
  /** Outages since the start. */
  outages: number;
}

export interface DatabaseHealthOptions {
  /** Runs one cheap query; rejects when the database cannot be reached. */
  ping: () => Promise<unknown>;
  /** Time between pings while up, ms; while unreachable the ping repeats at the same pace. */
  intervalMs?: number;
  onChange?: (report: DatabaseHealthReport) => void;
  now?: () => number;
}

/**
 * Watches the connection to a PostgreSQL server: pings it on a timer and takes failures
 * reported by the pool (`noteFailure`, which pings at once), so an outage shows on `/api/health` and as the
 * `databaseOutage` alarm channel within about one interval, and its end likewise.
 */
export class DatabaseHealth {
  private state: DatabaseHealthReport['state'] = 'up';
  private sinceMs: number | null = null;
  private lastError: string | null = null;
  private outages = 0;
  private timer: NodeJS.Timeout | null = null;
  private pinging = false;
  private readonly now: () => number;

  constructor(private readonly opts: DatabaseHealthOptions) {
    this.now = opts.now ?? Date.now;
  }

  start(): void {
    this.timer ??= setInterval(() => void this.check(), this.opts.intervalMs ?? 1000);
  }

  close(): void {
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
  }

  /** Pings once now; resolves with the state afterwards. */
  async check(): Promise<DatabaseHealthReport['state']> {
    if (this.pinging) return this.state;
    this.pinging = true;
    try {
      await this.opts.ping();
      this.set('up');
    } catch (error) {
      this.lastError = describeDatabaseError(error);
      this.set('unreachable');
    } finally {
      this.pinging = false;
    }
    return this.state;
  }

  /**
   * A connection-level failure seen elsewhere (the pool's `error` event, a connection ended by
   * the server): pings at once, and the ping decides, so one stale connection ending after the
   * server came back does not count as a new outage.
   */
  noteFailure(error: unknown): void {
    this.lastError = describeDatabaseError(error);
    void this.check();
  }

  /** Seconds the database has been unreachable, 0 while up. */
  outageSeconds(): number {
    return this.state === 'up' || this.sinceMs === null ? 0 : Math.max(0, (this.now() - this.sinceMs) / 1000);
  }

  report(): DatabaseHealthReport {
    return {
      state: this.state,
      since: this.sinceMs === null ? null : new Date(this.sinceMs).toISOString(),
      lastError: this.lastError,
      outages: this.outages,
    };
  }

  private set(state: DatabaseHealthReport['state']): void {
    if (state === this.state) return;
    this.state = state;
    this.sinceMs = this.now();
    if (state === 'unreachable') this.outages++;
    this.opts.onChange?.(this.report());
  }
}

/**
 * The real reason a connection failed, in one line: a connection to `localhost` that fails on
 * both IPv6 and IPv4 arrives as an AggregateError with an empty message, so its parts are
 * listed; the driver's error code is added when it has one.
 */
export function describeDatabaseError(error: unknown): string {
  const err = driverError(error) as Error & { code?: string; errors?: unknown[] };
  if (Array.isArray(err.errors) && err.errors.length > 0) {
    return [...new Set(err.errors.map(describeDatabaseError))].join('; ');
  }
  const message = err?.message || String(error);
  return err?.code && !message.includes(err.code) ? `${message} (${err.code})` : message;
}

/**
 * Whether a failure is about reaching the server (worth waiting and retrying), rather than
 * about what it said (bad password, unknown database, SQL error). PostgreSQL's class 08
 * (connection exception) and 57P (operator intervention: shutdown, starting up) count too.
 */
export function isConnectionFailure(error: unknown): boolean {
  const err = driverError(error) as Error & { code?: string; errors?: unknown[] };
  if (Array.isArray(err.errors) && err.errors.length > 0) return err.errors.every(isConnectionFailure);
  const code = err?.code ?? '';
  if (['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EHOSTUNREACH', 'ENETUNREACH', 'EPIPE', 'ENOTFOUND', 'EAI_AGAIN'].includes(code)) return true;
  if (code.startsWith('08') || code.startsWith('57P')) return true;
  const message = err?.message ?? '';
  return /Connection terminated|connection timeout|timeout exceeded when trying to connect|Client has encountered a connection error|the database system is (starting up|shutting down)/i.test(message);
}

/** The driver's own error under Drizzle's "Failed query: …" wrapper (its `cause`). */
function driverError(error: unknown): unknown {
  let err = error as { cause?: unknown; message?: string } | null;
  while (err && typeof err === 'object' && err.cause && typeof err.message === 'string' && err.message.startsWith('Failed query')) {
    err = err.cause as typeof err;
  }
  return err;
}

/**
 * The result of `read`, or `fallback` when it fails because the database cannot be reached:
 * for the parts of an answer that are a bonus (history beside a live state), so the live part
 * still shows during an outage.
 */
export async function unlessDatabaseDown<T, F>(read: () => Promise<T>, fallback: F): Promise<T | F> {
  try {
    return await read();
  } catch (error) {
    if (isConnectionFailure(error)) return fallback;
    throw error;
  }
}
