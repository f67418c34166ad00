import { asc, eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '../../shared/auth/roles.js';
import type { LevelSet, LevelSetVersion } from '../../shared/levels/level-set.js';
import type { ChannelBands } from '../../shared/live/channels.js';
import type { ChannelsMessage } from '../../shared/live/live-state.js';
import { openLiveSocket } from '../../test/support/live-socket.js';
import { waitFor } from '../../test/support/stack.js';
import { openDatabase } from '../db/database.js';
import { auditLog } from '../db/schema.js';
import type { InterlockState } from '../interlock/interlock.js';
import type { RunningServer } from '../server.js';
import { callApi, makeDataDir, removeDataDir, signIn, startTestServer } from '../testing/test-server.js';
import { DEMO_LEVEL_SET } from './demo-levels.js';

/** The stored, versioned level set against a real server and database. */
describe('levels API', () => {
  let dir: string;
  let server: RunningServer;
  const tokens = new Map<Role, string>();

  beforeAll(async () => {
    dir = await makeDataDir();
    server = await startTestServer(dir);
    for (const role of ['viewer', 'operator', 'lead'] as const) tokens.set(role, await signIn(server, role));
  });
  afterAll(async () => {
    await server?.close();
    removeDataDir(dir);
  });

  const call = <T>(role: Role, method: string, path: string, body?: unknown) => callApi<T>(server, tokens.get(role), method, path, body);
  const withTrips = (trips: Partial<LevelSet['trips']>): LevelSet => ({ ...DEMO_LEVEL_SET, trips: { ...DEMO_LEVEL_SET.trips, ...trips } });

  it('seeds the demo level set as version 1 and composes the bands Live draws from it and the alarm limits', async () => {
    const inForce = (await call<LevelSetVersion>('viewer', 'GET', '/api/levels')).body;
    expect(inForce).toMatchObject({ version: 1, createdBy: 'system', levels: DEMO_LEVEL_SET });
    const { body } = await call<ChannelBands>('viewer', 'GET', '/api/channels');
    expect(body.version).toBe(1);
    expect(body.bands['current.x']).toMatchObject({ scale: [-25, 25], normal: [-15, 15], high: 18, tripHigh: 20, absolute: true, unit: 'A' });
    expect(body.bands['flow.z']).toMatchObject({ low: 1.5, tripLow: 1, high: null, tripHigh: null });
    expect(body.bands['voltage.y']).toMatchObject({ high: null, low: null, tripHigh: null, tripLow: null });
    expect(body.bands.waterSupply).toMatchObject({ high: 25, low: 10, tripHigh: null });
  });

  it('lets only a lead change the levels, with a reason, and names the refused field as the form labels it', async () => {
    expect((await call('operator', 'PUT', '/api/levels', { levels: DEMO_LEVEL_SET, reason: 'try' })).status).toBe(403);
    const noReason = await call<{ error: string; field: string }>('lead', 'PUT', '/api/levels', { levels: DEMO_LEVEL_SET, reason: '  ' });
    expect(noReason.status).toBe(400);
    expect(noReason.body).toMatchObject({ field: 'reason', error: expect.stringMatching(/^Reason for this change is required/) });
    const inside = await call<{ error: string; field: string }>('lead', 'PUT', '/api/levels', { levels: withTrips({ currentHighA: 17 }), reason: 'lower the trip' });
    expect(inside.status).toBe(400);
    expect(inside.body).toEqual({
      field: 'levels.trips.currentHighA',
      error: 'Current trip level (A): on Coil current x, the high trip level at 17 A must lie above the high alarm (H) at 18 A; move that alarm limit first',
    });
    const badScale = { ...DEMO_LEVEL_SET, bands: { ...DEMO_LEVEL_SET.bands, flow: { scale: [6, 0], normal: [2, 5] } } };
    const scale = await call<{ error: string; field: string }>('lead', 'PUT', '/api/levels', { levels: badScale, reason: 'flip' });
    expect(scale.body).toEqual({ field: 'levels.bands.flow.scale.1', error: 'Coolant flow scale to (L/min) must be above Coolant flow scale from (L/min)' });
    expect((await call('lead', 'PUT', '/api/levels', { levels: withTrips({ temperatureHighC: 1e308 }), reason: 'huge' })).status).toBe(400);
    const huge = await call<{ error: string; field: string }>('lead', 'PUT', '/api/levels', { levels: withTrips({ temperatureHighC: 2e6 }), reason: 'huge' });
    expect(huge.body).toMatchObject({ field: 'levels.trips.temperatureHighC', error: expect.stringMatching(/^Coil temperature trip level \(°C\) must be a number between/) });
    expect((await call<LevelSetVersion>('viewer', 'GET', '/api/levels')).body.version).toBe(1);
  });

  it('puts a lead’s version in force for Live, the interlock and the live feed at once, and keeps every version', async () => {
    const socket = openLiveSocket(server.url, tokens.get('viewer')!);
    try {
      await waitFor(() => socket.messages.find((m): m is ChannelsMessage => m.type === 'channels'), 'the first channels message');
      const saved = await call<LevelSetVersion>('lead', 'PUT', '/api/levels', { levels: withTrips({ currentHighA: 19 }), reason: 'supply x derated' });
      expect(saved.status).toBe(200);
      expect(saved.body).toMatchObject({ version: 2, createdBy: 'lead@tiltwatch.example', reason: 'supply x derated', levels: { trips: { currentHighA: 19 } } });
      expect((await call<ChannelBands>('viewer', 'GET', '/api/channels')).body.bands['current.y'].tripHigh).toBe(19);
      const interlock = (await call<InterlockState>('viewer', 'GET', '/api/interlock')).body;
      expect(interlock.conditions.find((c) => c.name === 'over-current-x')).toMatchObject({ limit: 19 });
      const pushed = await waitFor(() => socket.messages.find((m): m is ChannelsMessage => m.type === 'channels' && m.version === 2), 'the pushed version 2');
      expect(pushed.bands['current.z'].tripHigh).toBe(19);

      const limit = await call('lead', 'PUT', '/api/alarm-limits/current.x.H', { limit: 17.5, reason: 'warn earlier' });
      expect(limit.status).toBe(200);
      expect((await call<ChannelBands>('viewer', 'GET', '/api/channels')).body.bands['current.x'].high).toBe(17.5);
      await waitFor(() => socket.messages.find((m) => m.type === 'channels' && m.bands['current.x'].high === 17.5), 'the pushed alarm level');
      const beyond = await call<{ field: string; error: string }>('lead', 'PUT', '/api/alarm-limits/current.y.H', { limit: 19.5, reason: 'beyond' });
      expect(beyond.body).toEqual({ field: 'limit', error: 'Limit: on Coil current y, the high alarm (H) at 19.5 A must lie below the high trip level at 19 A' });
    } finally {
      socket.close();
    }
    const history = (await call<{ versions: LevelSetVersion[] }>('viewer', 'GET', '/api/levels/history')).body.versions;
    expect(history.map((v) => v.version)).toEqual([2, 1]);
  });

  it('keeps the version in force across a restart and audits each change with old value, new value and reason', async () => {
    await server.close();
    const database = await openDatabase({ dataDir: dir, databaseUrl: null });
    try {
      const rows = await database.db.select().from(auditLog).where(eq(auditLog.action, 'levels.update')).orderBy(asc(auditLog.id));
      expect(rows).toHaveLength(1);
      expect(rows[0]).toMatchObject({
        actor: 'lead@tiltwatch.example',
        subject: 'levels:2',
        oldValue: { trips: { currentHighA: 20 } },
        newValue: { trips: { currentHighA: 19 } },
        reason: 'supply x derated',
      });
    } finally {
      await database.close();
    }
    server = await startTestServer(dir);
    tokens.set('viewer', await signIn(server, 'viewer'));
    expect((await call<LevelSetVersion>('viewer', 'GET', '/api/levels')).body.version).toBe(2);
    const interlock = (await call<InterlockState>('viewer', 'GET', '/api/interlock')).body;
    expect(interlock.conditions.find((c) => c.name === 'over-current-x')).toMatchObject({ limit: 19 });
  });
});
