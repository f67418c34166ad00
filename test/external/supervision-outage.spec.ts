/**
 * Supervision records made while the PostgreSQL server is down are not lost: the interlock
 * trips from memory at once, the trip and its alarm transitions wait in the supervision journal
 * of the data folder, and after a kill -9 of the server and a start with the database back
 * they are on record, once. Own PostgreSQL server (this test stops it), the server as its own
 * process (so it can be killed), a scripted controller on its embedded broker.
 */
import type { ChildProcessWithoutNullStreams } from 'node:child_process';
import { once } from 'node:events';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import mqtt from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { AlarmHistoryEvent, AlarmListItem, InterlockStatus } from '../../shared/alarms/alarm-api.js';
import type { HealthReport } from '../../server/health/health-route.js';
import type { RunningServer } from '../../server/server.js';
import { startControllerFeed } from '../../server/testing/controller-feed.js';
import { startPostgres, type PostgresServer } from '../../server/testing/postgres-server.js';
import { callApi, makeEmptyDir, removeDataDir, startTestServer } from '../../server/testing/test-server.js';
import { TOPICS } from '../../shared/telemetry/topics.js';
import { addAccounts, login, spawnServer } from '../support/server-process.js';
import { waitFor } from '../support/stack.js';

describe('supervision records through a PostgreSQL outage and a kill -9', () => {
  let postgres: PostgresServer;
  let dir: string;
  let child: ChildProcessWithoutNullStreams | null = null;
  let server: RunningServer | null = null;

  beforeAll(async () => {
    postgres = await startPostgres();
    dir = makeEmptyDir();
  }, 120_000);
  afterAll(async () => {
    if (child && child.exitCode === null && child.signalCode === null) {
      process.kill(-child.pid!, 'SIGKILL');
      await once(child, 'exit');
    }
    await server?.close();
    await postgres?.start().catch(() => undefined);
    await postgres?.close();
    removeDataDir(dir);
  });

  it('trips from memory during the outage, journals the trip and its alarm transitions, and stores them at the next start', { timeout: 240_000 }, async () => {
    const env = { DATABASE_URL: await postgres.createDatabase(), TILTWATCH_STALE_TRIP_MS: '2000' };
    await addAccounts(dir, ['viewer'], env);
    const proc = await spawnServer(dir, [], env);
    child = proc.child;
    const credentials = JSON.parse(readFileSync(path.join(dir, 'mqtt-credentials.json'), 'utf8')) as { controller: { username: string; password: string } };
    const client = await mqtt.connectAsync(proc.mqttUrl, { protocolVersion: 4, ...credentials.controller, reconnectPeriod: 0 });
    const feed = await startControllerFeed(client);
    const outageStart = Date.now();
    try {
      const viewer = await login(proc.url, 'viewer');
      const get = async <T>(route: string) => (await (await fetch(`${proc.url}${route}`, { headers: { authorization: `Bearer ${viewer}` } })).json()) as T;
      const health = async () => (await (await fetch(`${proc.url}/api/health`)).json()) as HealthReport;
      await waitFor(async () => ((await health()).frames.acceptedByKind.fast > 50 ? true : undefined), 'telemetry', 30_000);
      // Signed in before the outage: the server knows the account from memory while the database is down.
      expect((await get<InterlockStatus>('/api/interlock')).state).toBe('ok');

      await postgres.stop();
      await waitFor(async () => ((await health()).database?.state === 'unreachable' ? true : undefined), 'the outage on /api/health', 20_000);
      // Flow x fails: the low-low flow alarm is raised and the interlock trips on it, from memory.
      feed.flows = { x: 0.5, y: 3.2, z: 3.3 };
      const tripped = await waitFor(async () => {
        const status = await get<InterlockStatus>('/api/interlock');
        return status.state === 'tripped' ? status : undefined;
      }, 'the trip during the outage', 20_000);
      expect(tripped.firstOut?.condition).toBe('low-flow-x');
      await waitFor(() => feed.commands.find((c) => c.topic === TOPICS.trip), 'the trip command');
      await waitFor(
        async () => ((await get<{ alarms: AlarmListItem[] }>('/api/alarms?state=active')).alarms.find((a) => a.id === 'flow.x.LL')?.state === 'unacknowledged' ? true : undefined),
        'the low-low flow alarm (after its on-delay)',
        20_000,
      );
      // The trip and the transitions are journaled and counted, the database refusing them.
      const waiting = await waitFor(async () => {
        const h = await health();
        return h.supervision.journalPending >= 2 && h.supervision.failingSince ? h : undefined;
      }, 'the records in the journal', 20_000);
      expect(waiting.status).toBe('degraded');
      expect(waiting.problems.join('\n')).toMatch(/kept in the journal/);

      process.kill(-proc.child.pid!, 'SIGKILL');
      await once(proc.child, 'exit');
    } finally {
      feed.stop();
      await client.endAsync(true);
    }

    await postgres.start();
    server = await startTestServer(dir, {}, env);
    const token = await login(server.url, 'viewer');
    expect(server.counters().supervision).toMatchObject({ journalPending: 0, journalBytes: 0, failingSince: null });
    const status = (await callApi<InterlockStatus>(server, token, 'GET', '/api/interlock')).body;
    expect(status).toMatchObject({ state: 'tripped', firstOut: { condition: 'low-flow-x' } });
    expect(status.history).toHaveLength(1);
    expect(status.history![0]).toMatchObject({ firstOut: { condition: 'low-flow-x' }, reset: null });
    const history = (await callApi<{ events: AlarmHistoryEvent[] }>(server, token, 'GET', '/api/alarms/history?hours=1')).body.events;
    const raises = history.filter((e) => e.alarmId === 'flow.x.LL' && e.kind === 'raise');
    expect(raises).toHaveLength(1);
    expect(Date.parse(raises[0].at)).toBeGreaterThanOrEqual(outageStart);
    const listed = (await callApi<{ alarms: AlarmListItem[] }>(server, token, 'GET', '/api/alarms?state=all')).body.alarms.find((a) => a.id === 'flow.x.LL');
    expect(listed).toMatchObject({ state: 'unacknowledged', valueAtRaise: 0.5 });
  });
});
