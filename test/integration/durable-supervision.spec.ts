/**
 * Safety actions are durable before they take effect: an operator action on an alarm or an
 * interlock reset whose write fails answers an error and changes nothing (the latch stays
 * closed); alarm states and the latch come back after a restart; a controller found holding at
 * start with no trip on record is shown as tripped. Real server, real PGlite, a scripted
 * controller on the real broker; failing writes are made by a trigger in the same database.
 */
import type mqtt from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { AlarmListItem, InterlockStatus } from '../../shared/alarms/alarm-api.js';
import type { Role } from '../../shared/auth/roles.js';
import { TOPICS } from '../../shared/telemetry/topics.js';
import { openDatabase, type OpenDatabase } from '../../server/db/database.js';
import type { RunningServer } from '../../server/server.js';
import { refuseWrites } from '../../server/testing/refuse-writes.js';
import { startControllerFeed, type ControllerFeed } from '../../server/testing/controller-feed.js';
import { callApi, connectController, makeDataDir, removeDataDir, signIn, startTestServer } from '../../server/testing/test-server.js';
import { waitFor } from '../support/stack.js';

const OPERATOR = 'operator@tiltwatch.example';

describe('durable alarm and interlock actions', () => {
  let dir: string;
  let database: OpenDatabase;
  let server: RunningServer;
  let controller: mqtt.MqttClient;
  let feed: ControllerFeed;
  const tokens = new Map<Role, string>();

  async function start(): Promise<void> {
    database = await openDatabase({ dataDir: dir, databaseUrl: null });
    // A generous stale limit: a stall of this loaded machine must not trip the interlock mid-test.
    server = await startTestServer(dir, { database }, { TILTWATCH_STALE_TRIP_MS: '2000' });
    for (const role of ['viewer', 'operator', 'lead'] as const) tokens.set(role, await signIn(server, role));
  }
  async function connectFeed(): Promise<void> {
    controller = await connectController(server);
    feed = await startControllerFeed(controller);
  }
  async function stop(): Promise<void> {
    feed?.stop();
    await controller?.endAsync();
    await server?.close();
    await database?.close();
  }

  beforeAll(async () => {
    dir = await makeDataDir();
    await start();
    await connectFeed();
  });
  afterAll(async () => {
    await stop();
    removeDataDir(dir);
  });

  const call = <T>(role: Role, method: string, path: string, body?: unknown) => callApi<T>(server, tokens.get(role), method, path, body);
  const interlock = async () => (await call<InterlockStatus>('viewer', 'GET', '/api/interlock')).body;
  const alarm = async (id: string) => (await call<{ alarms: AlarmListItem[] }>('viewer', 'GET', '/api/alarms?state=all')).body.alarms.find((a) => a.id === id)!;

  const refuse = (table: string) => refuseWrites(database.db, table);

  it('answers 503 and leaves the alarm unacknowledged when the acknowledgement cannot be stored', async () => {
    feed.flows = { x: 0.5, y: 3.2, z: 3.3 };
    await waitFor(async () => ((await alarm('flow.x.LL')).state === 'unacknowledged' ? true : undefined), 'the low-low flow alarm');
    expect((await interlock()).firstOut?.condition).toBe('low-flow-x');

    const refusal = await refuse('alarm_states');
    const failed = await call<{ error: string }>('operator', 'POST', '/api/alarms/flow.x.LL/acknowledge');
    await refusal.allow();
    expect(failed.status).toBe(503);
    expect(failed.body.error).toMatch(/could not be recorded.*nothing was changed/);
    expect((await alarm('flow.x.LL')).state).toBe('unacknowledged');

    const done = await call<{ alarm: AlarmListItem }>('operator', 'POST', '/api/alarms/flow.x.LL/acknowledge');
    expect(done).toMatchObject({ status: 200, body: { alarm: { state: 'acknowledged' } } });
  });

  it('answers 503, keeps the latch closed and releases nothing when the reset cannot be stored', async () => {
    feed.flows = { x: 3.1, y: 3.2, z: 3.3 };
    await waitFor(async () => ((await interlock()).conditions.some((c) => c.active) ? undefined : true), 'the flow to come back');
    const refusal = await refuse('interlock_trips');
    const failed = await call<{ error: string }>('operator', 'POST', '/api/interlock/reset', { reason: 'valve x reopened' });
    await refusal.allow();
    expect(failed.status).toBe(503);
    expect(failed.body.error).toMatch(/could not be recorded.*stays tripped/);
    expect((await interlock()).state).toBe('tripped');
    expect(feed.commands.filter((c) => c.topic === TOPICS.release)).toEqual([]);

    await waitFor(async () => ((await call('operator', 'POST', '/api/interlock/reset', { reason: 'valve x reopened' })).status === 200 ? true : undefined), 'the reset');
    expect((await interlock()).history?.[0]).toMatchObject({ firstOut: { condition: 'low-flow-x' }, reset: { actor: OPERATOR, reason: 'valve x reopened' } });
    await waitFor(() => feed.commands.find((c) => c.topic === TOPICS.release), 'the release command');
  });

  it('restores acknowledged, shelved and out-of-service alarms and the latch after a restart', async () => {
    feed.currents = { x: 19, y: 4, z: 6 };
    await waitFor(async () => ((await alarm('current.x.H')).state === 'unacknowledged' ? true : undefined), 'the current alarm');
    expect((await call('operator', 'POST', '/api/alarms/current.x.H/acknowledge')).status).toBe(200);
    expect((await call('operator', 'POST', '/api/alarms/flow.y.L/shelve', { minutes: 30, reason: 'flow meter y recalibrated' })).status).toBe(200);
    expect((await call('lead', 'POST', '/api/alarms/flow.z.L/out-of-service', { on: true, reason: 'flow meter z replaced' })).status).toBe(200);
    feed.spike('y', 21);
    await waitFor(async () => ((await interlock()).state === 'tripped' ? true : undefined), 'the over-current trip');
    expect((await interlock()).firstOut?.condition).toBe('over-current-y');
    const before = await alarm('current.x.H');

    await stop();
    await start();
    expect(await interlock()).toMatchObject({ state: 'tripped', firstOut: { condition: 'over-current-y' } });
    expect(await alarm('current.x.H')).toMatchObject({ state: 'acknowledged', raisedAt: before.raisedAt, valueAtRaise: before.valueAtRaise });
    expect(await alarm('flow.y.L')).toMatchObject({ state: 'shelved', shelf: { by: OPERATOR, reason: 'flow meter y recalibrated' } });
    expect(await alarm('flow.z.L')).toMatchObject({ state: 'out-of-service' });

    // With the controller back and still over its alarm level, the acknowledged alarm stays acknowledged.
    await connectFeed();
    feed.currents = { x: 19, y: 4, z: 6 };
    await waitFor(async () => ((await alarm('current.x.H')).value === 19 ? true : undefined), 'fresh telemetry');
    expect((await alarm('current.x.H')).state).toBe('acknowledged');
  });
});

describe('the latch reconciled with the controller at start', () => {
  let dir: string;
  let server: RunningServer;
  let controller: mqtt.MqttClient;

  beforeAll(async () => {
    dir = await makeDataDir();
    server = await startTestServer(dir);
  });
  afterAll(async () => {
    await controller?.endAsync();
    await server?.close();
    removeDataDir(dir);
  });

  it('shows a controller that holds with no trip on record as tripped, first-out unknown, found at start', async () => {
    const token = await signIn(server, 'viewer');
    controller = await connectController(server);
    const holding = { online: true, tMs: Date.now(), hardwareTripped: false, hardwareTripCause: null, hardwareTripAxis: null, softwareHold: true, mode: 'remote' };
    await controller.publishAsync(TOPICS.status, JSON.stringify(holding), { qos: 1, retain: true });
    const status = await waitFor(async () => {
      const s = (await callApi<InterlockStatus>(server, token, 'GET', '/api/interlock')).body;
      return s.state === 'tripped' ? s : undefined;
    }, 'the interlock to show the hold');
    expect(status.firstOut).toMatchObject({ condition: 'found-at-start', value: null });
    expect(status.trip?.reason).toMatch(/first-out unknown, found at start/);
    expect(status.history?.[0]).toMatchObject({ firstOut: { condition: 'found-at-start' }, reset: null });
  });
});
