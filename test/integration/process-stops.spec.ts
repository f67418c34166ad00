/**
 * The server as its own process, stopped the two ways a night shift meets: a clean stop of the
 * demo (Ctrl-C) must end supervision before the simulated controller goes away — no trip, no
 * mail, and the next start is not tripped; and a kill -9 during ingest must lose nothing that
 * was reported done (a trip, acknowledged, shelved and out-of-service alarms).
 */
import type { ChildProcessWithoutNullStreams } from 'node:child_process';
import { once } from 'node:events';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import mqtt from 'mqtt';
import { afterEach, describe, expect, it } from 'vitest';
import type { AlarmListItem, InterlockStatus } from '../../shared/alarms/alarm-api.js';
import type { RunningServer } from '../../server/server.js';
import { startControllerFeed } from '../../server/testing/controller-feed.js';
import { makeDataDir, removeDataDir, startTestServer, signIn, callApi } from '../../server/testing/test-server.js';
import { addAccounts, login, spawnServer } from '../support/server-process.js';
import { waitFor } from '../support/stack.js';

async function health(url: string): Promise<{ frames: { acceptedByKind: { fast: number } } }> {
  return (await fetch(`${url}/api/health`)).json() as Promise<{ frames: { acceptedByKind: { fast: number } } }>;
}

async function post(url: string, token: string, route: string, body?: unknown): Promise<number> {
  const res = await fetch(`${url}${route}`, { method: 'POST', headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' }, body: JSON.stringify(body ?? {}) });
  return res.status;
}

describe('stopping the server process', () => {
  let dir: string | null = null;
  let child: ChildProcessWithoutNullStreams | null = null;
  let server: RunningServer | null = null;

  afterEach(async () => {
    if (child && child.exitCode === null && child.signalCode === null) {
      process.kill(-child.pid!, 'SIGKILL');
      await once(child, 'exit');
    }
    await server?.close();
    if (dir) removeDataDir(dir);
    child = server = dir = null;
  });

  /** Restarts in this process; `realViewer` signs in with the users command's viewer account. */
  async function restartInProcess(realViewer = false): Promise<{ interlock: InterlockStatus; alarms: AlarmListItem[] }> {
    server = await startTestServer(dir!);
    const token = realViewer ? await login(server.url, 'viewer') : await signIn(server, 'viewer');
    const interlock = (await callApi<InterlockStatus>(server, token, 'GET', '/api/interlock')).body;
    const alarms = (await callApi<{ alarms: AlarmListItem[] }>(server, token, 'GET', '/api/alarms?state=all')).body.alarms;
    return { interlock, alarms };
  }

  it('ends supervision before the simulator on Ctrl-C of the demo: no trip, no notice, and the next start is not tripped', async () => {
    dir = await makeDataDir();
    const demo = await spawnServer(dir, ['--demo']);
    child = demo.child;
    await waitFor(async () => ((await health(demo.url)).frames.acceptedByKind.fast > 100 ? true : undefined), 'telemetry from the simulator', 60_000);

    process.kill(-demo.child.pid!, 'SIGINT'); // what Ctrl-C in the terminal does
    const [code] = (await once(demo.child, 'exit')) as [number | null];
    expect(code).toBe(0);
    expect(demo.output()).not.toMatch(/software interlock tripped/);
    expect(demo.output()).not.toMatch(/"msg":"mail (sent|not sent|dropped|given up|send failed)/);

    const { interlock } = await restartInProcess();
    expect(interlock).toMatchObject({ state: 'ok', trip: null, history: [] });
  }, 180_000);

  it('keeps a trip and acknowledged, shelved and out-of-service alarms after kill -9 during ingest', async () => {
    dir = await makeDataDir();
    // Without --demo the demo accounts do not sign in: the lab's own accounts do.
    await addAccounts(dir, ['viewer', 'operator', 'lead']);
    const proc = await spawnServer(dir, []);
    child = proc.child;
    const credentials = JSON.parse(readFileSync(path.join(dir, 'mqtt-credentials.json'), 'utf8')) as { controller: { username: string; password: string } };
    const client = await mqtt.connectAsync(proc.mqttUrl, { protocolVersion: 4, ...credentials.controller, reconnectPeriod: 0 });
    const feed = await startControllerFeed(client);
    try {
      const operator = await login(proc.url, 'operator');
      const lead = await login(proc.url, 'lead');
      const viewer = await login(proc.url, 'viewer');
      const get = async <T>(route: string) => (await (await fetch(`${proc.url}${route}`, { headers: { authorization: `Bearer ${viewer}` } })).json()) as T;
      const alarm = async (id: string) => (await get<{ alarms: AlarmListItem[] }>('/api/alarms?state=all')).alarms.find((a) => a.id === id)!;

      feed.currents = { x: 19, y: 4, z: 6 };
      await waitFor(async () => ((await alarm('current.x.H')).state === 'unacknowledged' ? true : undefined), 'the current alarm', 20_000);
      expect(await post(proc.url, operator, '/api/alarms/current.x.H/acknowledge')).toBe(200);
      expect(await post(proc.url, operator, '/api/alarms/flow.y.L/shelve', { minutes: 60, reason: 'flow meter y recalibrated' })).toBe(200);
      expect(await post(proc.url, lead, '/api/alarms/flow.z.L/out-of-service', { on: true, reason: 'flow meter z replaced' })).toBe(200);
      feed.spike('y', 21);
      await waitFor(async () => ((await get<InterlockStatus>('/api/interlock')).history?.length ? true : undefined), 'the stored trip', 20_000);

      // Telemetry keeps flowing while the process dies.
      process.kill(-proc.child.pid!, 'SIGKILL');
      await once(proc.child, 'exit');
    } finally {
      feed.stop();
      await client.endAsync(true);
    }

    const { interlock, alarms } = await restartInProcess(true);
    expect(interlock).toMatchObject({ state: 'tripped', firstOut: { condition: 'over-current-y' } });
    const byId = new Map(alarms.map((a) => [a.id, a]));
    expect(byId.get('current.x.H')).toMatchObject({ state: 'acknowledged', valueAtRaise: 19 });
    expect(byId.get('flow.y.L')).toMatchObject({ state: 'shelved', shelf: { reason: 'flow meter y recalibrated' } });
    expect(byId.get('flow.z.L')).toMatchObject({ state: 'out-of-service' });
  }, 180_000);
});
