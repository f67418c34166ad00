/**
 * What a logbook entry may link to, and whether the target exists: an alarm by its id (the
 * alarm limits in force), an interlock trip by the time it tripped (ISO 8601, as `GET /api/interlock` lists it;
 * one trip at a time, so the time identifies it), a run by its number, a shot by its id.
 */
import { eq } from 'drizzle-orm';
import type { LogbookLink } from '../../shared/logbook/logbook-api.js';
import type { Db } from '../db/database.js';
import { interlockTrips, runs, shots } from '../db/schema.js';

export interface LinkTargets {
  /** Ids of the alarms the book knows. */
  alarmIds(): readonly string[];
  db: Db;
}

/** Why `link` cannot be stored, or null when its target exists. */
export async function linkProblem(targets: LinkTargets, link: LogbookLink): Promise<string | null> {
  switch (link.kind) {
    case 'alarm':
      return targets.alarmIds().includes(link.ref) ? null : `there is no alarm "${link.ref}" (GET /api/alarm-limits lists them)`;
    case 'trip': {
      const atMs = /^\d{4}-\d{2}-\d{2}T/.test(link.ref) ? Date.parse(link.ref) : NaN;
      const [row] = Number.isNaN(atMs) ? [] : await targets.db.select({ id: interlockTrips.id }).from(interlockTrips).where(eq(interlockTrips.trippedAtMs, atMs));
      return row ? null : `there is no interlock trip at ${link.ref} (write trip:<time it tripped>, as the Interlocks page lists it)`;
    }
    case 'run': {
      const id = /^\d{1,9}$/.test(link.ref) ? Number(link.ref) : null;
      const [row] = id === null ? [] : await targets.db.select({ id: runs.id }).from(runs).where(eq(runs.id, id));
      return row ? null : `there is no run number ${link.ref}`;
    }
    case 'shot': {
      const [row] = await targets.db.select({ id: shots.id }).from(shots).where(eq(shots.id, link.ref));
      return row ? null : `there is no shot "${link.ref}"`;
    }
  }
}
