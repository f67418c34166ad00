/**
 * Hears account changes made by other processes on the same PostgreSQL server (the `users`
 * command next to a running server): a connection of its own LISTENs on the channel that
 * `announceAccountChange` notifies, and each notification re-checks that account's sessions at
 * once. A lost connection is opened again with a growing pause, and then every session is
 * re-checked (notifications sent meanwhile are lost). With PGlite there is no other process
 * (the `users` command takes the data folder's lock), so nothing listens.
 */
import type { Logger } from 'pino';
import pg from 'pg';
import { ACCOUNT_CHANGES_CHANNEL, type AccountEvents } from './account-events.js';

const RETRY_DELAYS_MS = [1000, 2000, 5000, 10_000];

export interface AccountChangeListener {
  /** Resolves once the first LISTEN is in place (or has failed, and will be retried). */
  ready: Promise<void>;
  close(): Promise<void>;
}

export function listenForAccountChanges(databaseUrl: string, events: AccountEvents, log: Logger): AccountChangeListener {
  let client: pg.Client | null = null;
  let closed = false;
  let attempt = 0;
  let retryTimer: NodeJS.Timeout | null = null;

  const connect = async (): Promise<void> => {
    const next = new pg.Client({ connectionString: databaseUrl, connectionTimeoutMillis: 5000, keepAlive: true });
    next.on('error', (error) => log.debug({ err: error }, 'account-change listener connection failed'));
    next.on('end', () => {
      if (client === next) lost();
    });
    next.on('notification', (message) => {
      const userId = Number(message.payload);
      if (message.channel === ACCOUNT_CHANGES_CHANNEL && Number.isInteger(userId)) events.changed(userId);
    });
    try {
      await next.connect();
      await next.query(`LISTEN ${ACCOUNT_CHANGES_CHANNEL}`);
    } catch (error) {
      await next.end().catch(() => undefined);
      log.debug({ err: error }, 'cannot listen for account changes yet; trying again');
      scheduleRetry();
      return;
    }
    if (closed) return void (await next.end());
    client = next;
    // Changes made while nobody listened were not heard: look at every session once.
    if (attempt > 0) events.changed(null);
    attempt = 0;
  };
  const lost = () => {
    client = null;
    attempt = Math.max(attempt, 1);
    scheduleRetry();
  };
  const scheduleRetry = () => {
    if (closed || retryTimer) return;
    const delay = RETRY_DELAYS_MS[Math.min(attempt, RETRY_DELAYS_MS.length - 1)]!;
    attempt++;
    retryTimer = setTimeout(() => {
      retryTimer = null;
      void connect();
    }, delay);
    retryTimer.unref();
  };

  return {
    ready: connect(),
    async close() {
      closed = true;
      if (retryTimer) clearTimeout(retryTimer);
      retryTimer = null;
      const open = client;
      client = null;
      await open?.end().catch(() => undefined);
    },
  };
}
