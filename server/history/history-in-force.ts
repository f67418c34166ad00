/**
 * The versions in force over a history window (level set with its gauge bands, calibration,
 * sample profile, alarm limits), so Replay draws and names what was in force at its clock, not
 * what is now.
 */
import type { HistoryInForce } from '../../shared/history/history-api.js';
import { composeChannelBands } from '../../shared/levels/channel-bands.js';
import { alarmLimitsOver } from '../alarms/alarm-limit-repository.js';
import { calibrationsOver } from '../calibration/calibration-repository.js';
import type { Db } from '../db/database.js';
import type { LevelStore } from '../levels/level-store.js';
import { profilesOver } from '../profiles/profile-repository.js';

export interface InForceSources {
  db: Db;
  levels: Pick<LevelStore, 'versionsOver'>;
}

export async function historyInForce(sources: InForceSources, fromMs: number, toMs: number): Promise<HistoryInForce> {
  const [levels, calibrations, profiles, alarmLimits] = await Promise.all([
    sources.levels.versionsOver(fromMs, toMs),
    calibrationsOver(sources.db, fromMs, toMs),
    profilesOver(sources.db, fromMs, toMs),
    alarmLimitsOver(sources.db, fromMs, toMs),
  ]);
  return {
    // The alarm marks change apart from the level set: Replay marks `alarmLimits` at its clock.
    levels: levels.map((v) => ({ t: Date.parse(v.createdAt), version: v.version, createdBy: v.createdBy, reason: v.reason, bands: composeChannelBands(v, []) })),
    calibrations,
    profiles,
    alarmLimits,
  };
}
