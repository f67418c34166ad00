import type { Request, RequestHandler, Response } from 'express';
import { describe, expect, it } from 'vitest';
import { composeChannelBands } from '../../shared/levels/channel-bands.js';
import { AlarmBook } from '../alarms/alarm-book.js';
import { loadAlarmLimits } from '../alarms/alarm-limit-repository.js';
import { alarmLimitHandlers } from '../alarms/alarm-limit-routes.js';
import type { Db } from '../db/database.js';
import { useTempDatabase } from '../testing/temp-database.js';
import { DEMO_LEVEL_SET } from './demo-levels.js';
import { levelHandlers } from './level-routes.js';
import { LevelStore } from './level-store.js';

/**
 * A level-set edit and an alarm-limit edit that arrive together are each checked against what
 * the other stored: on a real database whose writes are held back until both requests are in,
 * so the second check runs while the first write is still pending.
 */
describe('level set and alarm limits edited at the same moment', () => {
  const database = useTempDatabase();

  it('stores only one of two edits that are each valid alone but together put an alarm beyond its trip level', async () => {
    let release!: () => void;
    const held = new Promise<void>((resolve) => (release = resolve));
    const db = new Proxy(database.db, {
      get: (target, key, receiver) => (key === 'transaction' ? async (...args: unknown[]) => (await held, (target.transaction as (...a: unknown[]) => unknown)(...args)) : Reflect.get(target, key, receiver)),
    }) as Db;
    const levels = await LevelStore.load(db);
    const book = new AlarmBook(await loadAlarmLimits(db));
    const handlers = { ...levelHandlers(levels, book), ...alarmLimitHandlers(db, book, levels, () => undefined) };
    const answer = () => ({ json: () => undefined }) as unknown as Response;
    const request = (params: Record<string, string>, body: unknown) => ({ params, body, user: { email: 'lead@tiltwatch.example' } }) as unknown as Request;
    const put = (route: 'levels.update' | 'alarm-limits.update', req: Request) => (handlers[route] as RequestHandler)(req, answer(), () => undefined);
    const outcome = (done: unknown) => Promise.resolve(done).then(() => 'stored', (error: Error) => error.message);

    // Alone, each passes: a trip at 19 A lies above H at 18 A; H at 19.5 A lies below the trip at 20 A.
    const level = outcome(put('levels.update', request({}, { levels: { ...DEMO_LEVEL_SET, trips: { ...DEMO_LEVEL_SET.trips, currentHighA: 19 } }, reason: 'supply x derated' })));
    const limit = outcome(put('alarm-limits.update', request({ id: 'current.x.H' }, { limit: 19.5, reason: 'warn later' })));
    await new Promise((resolve) => setTimeout(resolve, 50));
    release();

    expect(await level).toBe('stored');
    expect(await limit).toMatch(/high alarm \(H\) at 19\.5 A must lie below the high trip level at 19 A/);
    const bands = composeChannelBands(levels.inForce(), book.limits()).bands['current.x'];
    expect(bands).toMatchObject({ high: 18, tripHigh: 19 });
  });
});
