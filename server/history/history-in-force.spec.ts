import { describe, expect, it } from 'vitest';
import { DEMO_CALIBRATION } from '../../shared/field/demo-calibration.js';
import { DEMO_PROFILE } from '../../shared/profiles/demo-profile.js';
import { approveCalibration, seedDemoCalibration } from '../calibration/calibration-repository.js';
import { calibrations } from '../db/schema.js';
import { LevelStore } from '../levels/level-store.js';
import { activateProfile, saveProfile, seedDemoProfile } from '../profiles/profile-repository.js';
import { useTempDatabase } from '../testing/temp-database.js';
import { historyInForce } from './history-in-force.js';

const LEAD = 'lead@tiltwatch.example';
const pause = () => new Promise((resolve) => setTimeout(resolve, 20));

describe('historyInForce: the versions in force over a history window', () => {
  const temp = useTempDatabase();

  it('gives the level set (with its bands), calibration and profile in force at the start, then each change inside the window', async () => {
    const db = temp.db;
    await seedDemoCalibration(db);
    await seedDemoProfile(db);
    const levels = await LevelStore.load(db);
    await pause();
    const fromMs = Date.now();
    await pause();

    const first = levels.inForce().levels;
    await levels.save({ ...first, bands: { ...first.bands, current: { scale: [-30, 30], normal: [-20, 20] } } }, LEAD, 'wider current band after the supply upgrade');
    const [draft] = await db
      .insert(calibrations)
      .values({ version: 2, label: 'Second fit', ...DEMO_CALIBRATION, state: 'draft', kind: 'demo', createdBy: LEAD })
      .returning();
    expect((await approveCalibration(db, { id: draft.id, reason: 'new probe', actor: LEAD })).ok).toBe(true);
    const saved = await saveProfile(db, { profile: { ...DEMO_PROFILE, atomNumber: 8e4 }, reason: 'more atoms', actor: LEAD });
    await activateProfile(db, { id: saved.id, reason: 'sample of the night', actor: LEAD });
    await pause();
    const toMs = Date.now();

    const sources = { db, levels };
    const over = await historyInForce(sources, fromMs, toMs);
    expect(over.levels.map((l) => l.version)).toEqual([1, 2]);
    expect(over.levels[0].t).toBeLessThan(fromMs);
    expect(over.levels[1].t).toBeGreaterThanOrEqual(fromMs);
    expect(over.levels[0].bands.bands['current.x']).toMatchObject({ normal: [-15, 15], high: null });
    expect(over.levels[1].bands.bands['current.x']).toMatchObject({ scale: [-30, 30], normal: [-20, 20], high: null });
    expect(over.levels[1]).toMatchObject({ createdBy: LEAD, reason: 'wider current band after the supply upgrade' });
    expect(over.calibrations.map((c) => [c.version, c.label, c.approvedBy])).toEqual([
      [1, 'Lindqvist Hall demo calibration', 'system'],
      [2, 'Second fit', LEAD],
    ]);
    expect(over.calibrations[1].t).toBeGreaterThanOrEqual(fromMs);
    expect(over.profiles.map((p) => [p.profile.name, p.profile.version, p.profile.profile.atomNumber])).toEqual([
      [DEMO_PROFILE.name, 1, 5e4],
      [DEMO_PROFILE.name, 2, 8e4],
    ]);

    expect(over.alarmLimits.map((a) => [a.t, a.limits.length])).toEqual([[fromMs, 0]]); // none seeded here, none edited

    // After the changes only the versions then in force remain.
    const later = await historyInForce(sources, toMs, toMs + 1000);
    expect([later.levels.map((l) => l.version), later.calibrations.map((c) => c.version), later.profiles.map((p) => p.profile.version)]).toEqual([[2], [2], [2]]);
  });
});
