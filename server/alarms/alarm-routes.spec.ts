import { asc, like } from 'drizzle-orm';
import type mqtt from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ActiveAlarm, AlarmActionResult, AlarmHealthReport, AlarmHistoryEvent, AlarmListItem } from '../../shared/alarms/alarm-api.js';
import type { Role } from '../../shared/auth/roles.js';
import { waitFor } from '../../test/support/stack.js';
import { openDatabase } from '../db/database.js';
import { auditLog } from '../db/schema.js';
import type { RunningServer } from '../server.js';
import { startControllerFeed, type ControllerFeed } from '../testing/controller-feed.js';
import { callApi, connectController, makeDataDir, removeDataDir, signIn, startTestServer } from '../testing/test-server.js';
import type { AlarmLimit } from './alarm-limit.js';
import { databaseUrlFor } from '../testing/external-services.js';

/** Alarm routes against a real server, broker and database, with a scripted controller feeding telemetry. */
describe('alarm routes', () => {
  let dir: string;
  let server: RunningServer;
  let controller: mqtt.MqttClient;
  let feed: ControllerFeed;
  const tokens = new Map<Role, string>();

  beforeAll(async () => {
    dir = await makeDataDir();
    server = await startTestServer(dir);
    for (const role of ['viewer', 'operator', 'lead', 'admin'] as const) tokens.set(role, await signIn(server, role));
    controller = await connectController(server);
    feed = await startControllerFeed(controller);
  });
  afterAll(async () => {
    feed?.stop();
    await controller?.endAsync();
    await server?.close();
    removeDataDir(dir);
  });

  const call = <T>(role: Role, method: string, path: string, body?: unknown) => callApi<T>(server, tokens.get(role), method, path, body);

  const activeAlarm = (id: string) => async () =>
    (await call<{ alarms: ActiveAlarm[] }>('viewer', 'GET', '/api/alarms?state=active')).body.alarms.find((a) => a.id === id);

  it('raises a current alarm from telemetry and lists it as active, and every alarm with state=all', async () => {
    feed.currents = { x: 19, y: 4, z: 6 };
    const alarm = await waitFor(activeAlarm('current.x.H'), 'current.x.H to be raised');
    expect(alarm).toMatchObject({ channel: 'current.x', priority: 'medium', state: 'unacknowledged', limit: 18, level: 'H' });
    expect(alarm.value).toBeCloseTo(19, 6);
    expect(Date.parse(alarm.raisedAt)).toBeGreaterThan(Date.now() - 60_000);
    const all = (await call<{ alarms: AlarmListItem[] }>('viewer', 'GET', '/api/alarms?state=all')).body.alarms;
    expect(all.length).toBeGreaterThan(20);
    expect(all.find((a) => a.id === 'current.y.H')).toMatchObject({ state: 'normal', raisedAt: null, shelf: null });
    expect((await call<{ error: string }>('viewer', 'GET', '/api/alarms?state=some')).body.error).toMatch(/state must be "active" or "all"/);
  });

  it('lets an operator acknowledge an alarm but not a viewer, and answers 404 for an unknown alarm', async () => {
    expect((await call('viewer', 'POST', '/api/alarms/current.x.H/acknowledge')).status).toBe(403);
    const ack = await call<AlarmActionResult>('operator', 'POST', '/api/alarms/current.x.H/acknowledge');
    expect(ack.status).toBe(200);
    expect(ack.body).toMatchObject({ changed: true, alarm: { id: 'current.x.H', state: 'acknowledged' } });
    const again = await call<AlarmActionResult>('operator', 'POST', '/api/alarms/current.x.H/acknowledge');
    expect(again.body.changed).toBe(false);
    const missing = await call<{ error: string }>('operator', 'POST', '/api/alarms/no.such.alarm/acknowledge');
    expect(missing.status).toBe(404);
    expect(missing.body.error).toMatch(/no alarm with id "no.such.alarm"/);
  });

  it('shelves with minutes and a reason only, and unshelves', async () => {
    const path = '/api/alarms/current.x.H/shelve';
    const noReason = await call<{ error: string }>('operator', 'POST', path, { minutes: 30 });
    expect(noReason.status).toBe(400);
    expect(noReason.body.error).toMatch(/^Reason: is required for shelving/);
    for (const minutes of [0, 481, 'ten', null]) {
      const bad = await call<{ error: string }>('operator', 'POST', path, { minutes, reason: 'known fault on supply x' });
      expect(bad.status).toBe(400);
      expect(bad.body.error).toMatch(/^Minutes: must be a number of minutes above 0 and at most 480/);
    }
    expect((await call('viewer', 'POST', path, { minutes: 30, reason: 'x' })).status).toBe(403);
    const shelved = await call<AlarmActionResult>('operator', 'POST', path, { minutes: 30, reason: 'known fault on supply x' });
    expect(shelved.status).toBe(200);
    expect(shelved.body.alarm).toMatchObject({ state: 'shelved', shelf: { by: 'operator@tiltwatch.example', reason: 'known fault on supply x' } });
    expect(await activeAlarm('current.x.H')()).toBeUndefined();
    const twice = await call<{ error: string }>('operator', 'POST', path, { minutes: 30, reason: 'again' });
    expect(twice.status).toBe(409);
    expect(twice.body.error).toMatch(/already shelved/);
    const back = await call<AlarmActionResult>('operator', 'POST', '/api/alarms/current.x.H/unshelve', {});
    expect(back.body.alarm.state).toBe('acknowledged');
    feed.currents = { x: 5, y: 4, z: 6 };
  });

  it('takes an alarm out of service only as a lead, with a reason', async () => {
    const path = '/api/alarms/waterSupply.L/out-of-service';
    expect((await call('operator', 'POST', path, { on: true, reason: 'chiller sensor replaced' })).status).toBe(403);
    const noReason = await call<{ error: string }>('lead', 'POST', path, { on: true });
    expect(noReason.status).toBe(400);
    expect(noReason.body.error).toMatch(/^Reason: is required/);
    const noFlag = await call<{ error: string }>('lead', 'POST', path, { reason: 'chiller sensor replaced' });
    expect(noFlag.body.error).toMatch(/^Out of service: must be true/);
    const off = await call<AlarmActionResult>('lead', 'POST', path, { on: true, reason: 'chiller sensor replaced' });
    expect(off.body.alarm.state).toBe('out-of-service');
    const on = await call<AlarmActionResult>('lead', 'POST', path, { on: false, reason: 'sensor back' });
    expect(on.body.alarm.state).toBe('normal');
  });

  it('lets only a lead edit a limit, with a reason, and refuses a set that would invert the levels', async () => {
    const path = '/api/alarm-limits/flow.x.LL';
    expect((await call('operator', 'PUT', path, { offDelayMs: 0, reason: 'faster test' })).status).toBe(403);
    const noReason = await call<{ error: string }>('lead', 'PUT', path, { offDelayMs: 0 });
    expect(noReason.status).toBe(400);
    expect(noReason.body).toMatchObject({ field: 'reason', error: expect.stringMatching(/^Reason for this change is required/) });
    const rename = await call<{ error: string }>('lead', 'PUT', path, { channel: 'flow.y', reason: 'move it' });
    expect(rename.body.error).toMatch(/cannot change channel/);
    const inverted = await call<{ error: string }>('lead', 'PUT', path, { limit: 2, reason: 'above L' });
    expect(inverted.status).toBe(400);
    expect(inverted.body).toEqual({ field: 'limit', error: 'Limit: on Coolant flow x, the low-low alarm (LL) at 2 L/min must lie below the low alarm (L) at 1.5 L/min' });
    const beyondTrip = await call<{ error: string; field: string }>('lead', 'PUT', path, { limit: 0.8, reason: 'below the trip' });
    expect(beyondTrip.status).toBe(400);
    expect(beyondTrip.body).toEqual({ field: 'limit', error: 'Limit: on Coolant flow x, the low-low alarm (LL) at 0.8 L/min must lie above the low trip level at 1 L/min' });
    const badDelay = await call<{ error: string; field: string }>('lead', 'PUT', path, { onDelayMs: -1, reason: 'x' });
    expect(badDelay.body).toMatchObject({ field: 'onDelayMs', error: expect.stringMatching(/On-delay \(ms\) must be 0 ms or more/) });
    const edited = await call<{ limit: AlarmLimit; previous: AlarmLimit }>('lead', 'PUT', path, {
      offDelayMs: 0,
      rationale: { respondWithinMin: 1 },
      reason: 'clear the latch as soon as the flow is back',
    });
    expect(edited.status).toBe(200);
    expect(edited.body.previous).toMatchObject({ offDelayMs: 3000, rationale: { respondWithinMin: expect.any(Number) } });
    expect(edited.body.limit).toMatchObject({ id: 'flow.x.LL', offDelayMs: 0, rationale: { respondWithinMin: 1, cause: edited.body.previous.rationale.cause } });
    const limits = (await call<{ limits: AlarmLimit[] }>('viewer', 'GET', '/api/alarm-limits')).body.limits;
    expect(limits.find((l) => l.id === 'flow.x.LL')?.offDelayMs).toBe(0);
  });

  it('latches a high-priority alarm, refuses its reset while the condition holds, resets it after, and mails the on-call list', async () => {
    feed.flows = { x: 1.1, y: 3.2, z: 3.3 };
    await waitFor(activeAlarm('flow.x.LL'), 'flow.x.LL to be raised');
    const early = await call<{ error: string }>('operator', 'POST', '/api/alarms/flow.x.LL/reset', { reason: 'valve reopened' });
    expect(early.status).toBe(409);
    expect(early.body.error).toMatch(/its condition still holds/);
    const ack = await call<{ error: string }>('operator', 'POST', '/api/alarms/flow.x.LL/acknowledge');
    expect(ack.status).toBe(200);
    feed.flows = { x: 3.1, y: 3.2, z: 3.3 };
    const latched = await waitFor(async () => {
      const a = await activeAlarm('flow.x.LL')();
      return a?.state === 'latched' ? a : undefined;
    }, 'flow.x.LL to latch');
    expect(latched.priority).toBe('high');
    const noReason = await call<{ error: string }>('operator', 'POST', '/api/alarms/flow.x.LL/reset', {});
    expect(noReason.status).toBe(400);
    expect((await call('viewer', 'POST', '/api/alarms/flow.x.LL/reset', { reason: 'valve reopened' })).status).toBe(403);
    const reset = await call<AlarmActionResult>('operator', 'POST', '/api/alarms/flow.x.LL/reset', { reason: 'valve reopened' });
    expect(reset.body).toMatchObject({ changed: true, alarm: { state: 'normal' } });

    const mail = await waitFor(async () => {
      const { body } = await call<{ messages: { to: string[]; subject: string; text: string }[] }>('admin', 'GET', '/api/admin/outbox');
      return body.messages.find((m) => m.subject.includes('High-priority alarm') && m.subject.includes('Coolant flow x'));
    }, 'the alarm notice in the outbox');
    expect(mail.to).toEqual(['oncall@lindqvist-hall.example']);
    expect(mail.text).toContain('supervisory');
    expect((await call('lead', 'GET', '/api/admin/outbox')).status).toBe(403);
  });

  it('keeps the history of raises and operator actions and reports alarm-system health', async () => {
    const { body } = await call<{ events: AlarmHistoryEvent[] }>('viewer', 'GET', '/api/alarms/history?hours=1');
    const kinds = body.events.filter((e) => e.alarmId === 'flow.x.LL').map((e) => e.kind);
    expect(kinds.reverse()).toEqual(['raise', 'acknowledge', 'clear', 'reset']);
    expect(body.events.find((e) => e.kind === 'shelve')).toMatchObject({ alarmId: 'current.x.H', actor: 'operator@tiltwatch.example', reason: 'known fault on supply x' });
    expect((await call<{ error: string }>('viewer', 'GET', '/api/alarms/history?hours=0')).status).toBe(400);
    const health = (await call<AlarmHealthReport>('viewer', 'GET', '/api/alarms/health?hours=1')).body;
    expect(health.recentCount).toBeGreaterThanOrEqual(2);
    expect(health.flooding).toBe(false);
    expect(health.rules).toMatchObject({ intervalMinutes: 10, floodAbove: 10 });
    expect(health.intervals).toHaveLength(6);
  });

  it('writes every operator action and limit change to the audit trail with old value, new value and reason', async () => {
    feed.stop();
    await server.close();
    const database = await openDatabase({ dataDir: dir, databaseUrl: databaseUrlFor(dir) });
    try {
      const rows = await database.db.select().from(auditLog).where(like(auditLog.action, 'alarm%')).orderBy(asc(auditLog.id));
      const pick = (action: string) => rows.filter((r) => r.action === action).map(({ actor, subject, oldValue, newValue, reason }) => ({ actor, subject, oldValue, newValue, reason }));
      expect(pick('alarm.acknowledge')[0]).toEqual({
        actor: 'operator@tiltwatch.example',
        subject: 'alarm:current.x.H',
        oldValue: { state: 'unacknowledged' },
        newValue: { state: 'acknowledged' },
        reason: null,
      });
      expect(pick('alarm.shelve')[0]).toMatchObject({ subject: 'alarm:current.x.H', reason: 'known fault on supply x', newValue: { state: 'shelved' } });
      expect(pick('alarm.out-of-service')[0]).toMatchObject({ actor: 'lead@tiltwatch.example', reason: 'chiller sensor replaced' });
      expect(pick('alarm.reset')[0]).toMatchObject({ subject: 'alarm:flow.x.LL', reason: 'valve reopened', newValue: { state: 'normal' } });
      const [limitChange] = pick('alarm-limit.update');
      expect(limitChange).toMatchObject({
        actor: 'lead@tiltwatch.example',
        subject: 'alarm-limit:flow.x.LL',
        oldValue: { offDelayMs: 3000 },
        newValue: { offDelayMs: 0 },
        reason: 'clear the latch as soon as the flow is back',
      });
    } finally {
      await database.close();
    }
  });
});
