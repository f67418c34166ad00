import { describe, expect, it } from 'vitest';
import { useTempDatabase } from '../testing/temp-database.js';
import { alarmLimitsOver, loadAlarmLimits, saveAlarmLimit } from './alarm-limit-repository.js';

const LEAD = 'lead@tiltwatch.example';
const pause = () => new Promise((resolve) => setTimeout(resolve, 20));

describe('alarmLimitsOver: the alarm limits in force over a window, rebuilt from the audited edits', () => {
  const temp = useTempDatabase();

  it('gives the limits in force before, between and after two edits of one limit', async () => {
    const db = temp.db;
    const seeded = await loadAlarmLimits(db);
    const original = seeded.find((l) => l.id === 'current.x.H')!;
    await pause();
    const beforeMs = Date.now();
    await pause();
    const first = { ...original, limit: 17 };
    await saveAlarmLimit(db, first, original, LEAD, 'supply derated');
    await pause();
    const betweenMs = Date.now();
    await pause();
    await saveAlarmLimit(db, { ...first, limit: 16.5 }, first, LEAD, 'derated further');
    await pause();
    const afterMs = Date.now();

    const currentX = (limits: { id: string; limit: number }[]) => limits.find((l) => l.id === 'current.x.H')?.limit;
    const over = await alarmLimitsOver(db, beforeMs, afterMs);
    expect(over.map((s) => [currentX(s.limits), s.changedId, s.changedBy, s.reason])).toEqual([
      [18, null, null, null],
      [17, 'current.x.H', LEAD, 'supply derated'],
      [16.5, 'current.x.H', LEAD, 'derated further'],
    ]);
    expect(over[0].t).toBe(beforeMs);
    expect(over[1].t).toBeGreaterThanOrEqual(beforeMs);
    expect(over[2].t).toBeGreaterThan(betweenMs);
    // Every other limit stays as seeded.
    const others = (limits: { id: string }[]) => limits.filter((l) => l.id !== 'current.x.H');
    expect(others(over[2].limits)).toEqual(others(over[0].limits));
    expect(over[0].limits).toHaveLength(seeded.length);
    expect(over[0].limits.find((l) => l.id === 'current.y.H')).toEqual({ id: 'current.y.H', channel: 'current.y', level: 'H', limit: 18 });

    // A window before the first edit holds the seeded value only; one between them starts at the first edit.
    expect((await alarmLimitsOver(db, beforeMs - 10, beforeMs)).map((s) => currentX(s.limits))).toEqual([18]);
    const between = await alarmLimitsOver(db, betweenMs, betweenMs + 1);
    expect(between.map((s) => [currentX(s.limits), s.t === over[1].t, s.reason])).toEqual([[17, true, 'supply derated']]);
    const after = await alarmLimitsOver(db, afterMs, afterMs + 1000);
    expect(after.map((s) => [currentX(s.limits), s.t === over[2].t])).toEqual([[16.5, true]]);
  });
});
