import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ActiveAlarm, InterlockStatus } from '../../shared/alarms/alarm-api.js';
import type { LiveState } from '../../shared/live/live-state.js';
import type { HealthReport } from '../../server/health/health-route.js';
import { startPostgres, type PostgresServer } from '../../server/testing/postgres-server.js';
import { pino } from 'pino';
import { makeDataDir, removeDataDir, startTestServer } from '../../server/testing/test-server.js';
import { signIn, startStack, waitFor, type Stack } from '../support/stack.js';

/**
 * A restart of the PostgreSQL server under load (1 kHz telemetry from the simulator, readers on
 * the API): the server keeps ingesting and supervising from memory, trips without the database,
 * reports the outage on /api/health and as the `databaseOutage` alarm, answers 503 (never 500)
 * for what needs the database, reconnects by itself and stores again. Own PostgreSQL server,
 * because this test stops it.
 */
describe('PostgreSQL restart under load', () => {
  let postgres: PostgresServer;
  let stack: Stack;
  let viewer: string;
  let readers: Promise<void>;
  let reading = true;
  const statuses = new Map<number, number>();

  beforeAll(async () => {
    postgres = await startPostgres();
    stack = await startStack({ env: { DATABASE_URL: await postgres.createDatabase(), LOG_LEVEL: 'fatal' }, simulatorOptions: { demo: true } });
    viewer = await signIn(stack.server.url, 'viewer');
    // Readers that keep the API busy through the whole test; every answer's status is counted.
    readers = Promise.all(
      ['/api/live', '/api/series?seconds=5', '/api/alarms?state=all', '/api/alarms/history?hours=1'].map(async (path) => {
        while (reading) {
          const res = await fetch(`${stack.server.url}${path}`, { headers: { authorization: `Bearer ${viewer}` }, signal: AbortSignal.timeout(10_000) }).catch(() => null);
          if (res) {
            statuses.set(res.status, (statuses.get(res.status) ?? 0) + 1);
            await res.arrayBuffer();
          }
          await new Promise((r) => setTimeout(r, 20));
        }
      }),
    ).then(() => undefined);
  }, 300_000); // initdb and a whole stack on a loaded 2-core machine
  afterAll(async () => {
    reading = false;
    await readers;
    await stack?.close();
    await postgres?.close();
  });

  const health = async () => (await (await fetch(`${stack.server.url}/api/health`)).json()) as HealthReport;
  const get = async <T>(path: string) => (await (await fetch(`${stack.server.url}${path}`, { headers: { authorization: `Bearer ${viewer}` } })).json()) as T;

  it('rides out the restart: supervises and trips from memory, reports the outage, reconnects and stores again', { timeout: 180_000 }, async () => {
    await waitFor(async () => ((await health()).storage.framesWritten > 0 ? true : undefined), 'telemetry stored in PostgreSQL', 30_000);
    expect((await health()).database).toMatchObject({ state: 'up', outages: 0 });

    await postgres.stop();
    const down = await waitFor(async () => {
      const h = await health();
      return h.database?.state === 'unreachable' ? h : undefined;
    }, 'the outage on /api/health', 20_000);
    expect(down.status).toBe('degraded');
    expect(down.database!.lastError).toMatch(/ECONN|terminat|shut/i);
    const alarm = await waitFor(async () => (await get<{ alarms: ActiveAlarm[] }>('/api/alarms?state=active')).alarms.find((a) => a.channel === 'databaseOutage'), 'the database outage alarm', 20_000);
    expect(alarm.priority).toBe('medium');

    // Ingest goes on without the database: the live time moves.
    const before = (await get<LiveState>('/api/live')).time!;
    await waitFor(async () => ((await get<LiveState>('/api/live')).time! > before ? true : undefined), 'live frames during the outage');
    // What needs the database answers 503 with a message, not 500.
    const history = await fetch(`${stack.server.url}/api/alarms/history?hours=1`, { headers: { authorization: `Bearer ${viewer}` } });
    expect(history.status).toBe(503);
    expect(((await history.json()) as { error: string }).error).toMatch(/database cannot be reached/);

    // A trip while the database is down: telemetry stops, the interlock trips on stale data and the controller holds.
    await fetch(`${stack.simulator!.controlUrl}/faults`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ kind: 'sensor-dropout', stream: 'all' }) });
    const trip = await waitFor(async () => {
      const status = await get<InterlockStatus>('/api/interlock');
      return status.state === 'tripped' ? status : undefined;
    }, 'the trip from memory');
    expect(trip.firstOut?.channel).toBe('stale');
    expect(trip.historyUnavailable).toBe(true);
    await waitFor(async () => {
      const state = (await (await fetch(`${stack.simulator!.controlUrl}/state`)).json()) as { status: { softwareHold: boolean } };
      return state.status.softwareHold ? true : undefined;
    }, 'the controller to hold after the trip command');
    await fetch(`${stack.simulator!.controlUrl}/faults`, { method: 'DELETE' });

    await postgres.start();
    const up = await waitFor(async () => {
      const h = await health();
      return h.database?.state === 'up' ? h : undefined;
    }, 'the database back on /api/health', 30_000);
    expect(up.database!.outages).toBe(1);
    // The telemetry writer drains its queue and the status returns to ok (headroom's problems list says what is left meanwhile).
    let last: HealthReport = up;
    await waitFor(async () => {
      last = await health();
      return last.status === 'ok' ? true : undefined;
    }, 'the status back to ok', 60_000).catch((error: Error) => {
      throw new Error(`${error.message}: ${JSON.stringify(last.problems)}`);
    });
    const written = up.storage.framesWritten;
    await waitFor(async () => ((await health()).storage.framesWritten > written ? true : undefined), 'telemetry stored again', 30_000);
    expect((await fetch(`${stack.server.url}/api/alarms/history?hours=1`, { headers: { authorization: `Bearer ${viewer}` } })).status).toBe(200);

    reading = false;
    await readers;
    expect(statuses.get(500) ?? 0).toBe(0);
    expect(statuses.get(200) ?? 0).toBeGreaterThan(0);
  });

  it('starts while PostgreSQL is down: waits, saying why, and comes up once the database does', { timeout: 180_000 }, async () => {
    const url = await postgres.createDatabase();
    await postgres.stop();
    const dir = await makeDataDir();
    const retries: string[] = [];
    const log = pino({ level: 'warn' }, { write: (line: string) => void retries.push(JSON.parse(line).msg as string) });
    const starting = startTestServer(dir, { log }, { DATABASE_URL: url });
    try {
      await waitFor(() => (retries.length >= 1 ? true : undefined), 'a retry at start', 30_000);
      expect(retries[0]).toMatch(/^PostgreSQL at DATABASE_URL cannot be reached \(.*ECONNREFUSED.*\); trying again in 1 s$/);
      await postgres.start();
      const server = await starting;
      try {
        expect(server.counters().database).toMatchObject({ state: 'up', outages: 0 });
      } finally {
        await server.close();
      }
    } finally {
      await postgres.start().catch(() => undefined); // already running unless the test failed early
      removeDataDir(dir);
    }
  });
});
