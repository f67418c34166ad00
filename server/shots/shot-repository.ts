import { and, asc, eq, gte, inArray, lte, sql } from 'drizzle-orm';
import type { ShotMeasurement, ShotRow } from '../../shared/shots/shots-api.js';
import { appendAuditEntries, type AuditEntry } from '../audit/audit-log.js';
import type { Db } from '../db/database.js';
import { runs, shotMeasurements, shots } from '../db/schema.js';
import { MeasurementInputError, type MeasurementLine } from './measurement-csv.js';

/** Rows per INSERT statement (PostgreSQL takes at most 65 535 parameters per statement). */
const CHUNK = 1000;
/** Most shots one `GET /api/shots` answer holds. */
export const MAX_LISTED_SHOTS = 5000;

/** Which shots to list: those of one run, or those taken in a time window (inclusive). */
export type ShotSelection = { runId: number } | { from: Date; to: Date };

/**
 * Stores the measured TOF images of a file in one transaction with their audit entries: one
 * for the upload, and one per shot whose earlier value it replaces (old and new value). An
 * unknown shot id refuses the whole file (MeasurementInputError naming its line) and nothing
 * is stored.
 */
export async function storeMeasurements(db: Db, lines: readonly MeasurementLine[], by: { actor: string; sourceName: string; at: Date }): Promise<{ stored: number; replaced: number }> {
  return db.transaction(async (tx) => {
    const ids = lines.map((l) => l.shotId);
    const known = new Set<string>();
    const earlier = new Map<string, ShotMeasurement>();
    for (let i = 0; i < ids.length; i += CHUNK) {
      const part = ids.slice(i, i + CHUNK);
      for (const row of await tx.select({ id: shots.id }).from(shots).where(inArray(shots.id, part))) known.add(row.id);
      for (const row of await tx.select().from(shotMeasurements).where(inArray(shotMeasurements.shotId, part))) earlier.set(row.shotId, measurementOf(row));
    }
    const unknown = lines.find((l) => !known.has(l.shotId));
    if (unknown) throw new MeasurementInputError(`line ${unknown.line}, column shot: no shot with id ${unknown.shotId} (see the Shots page or GET /api/shots)`);
    const rows = lines.map((l) => ({ shotId: l.shotId, tofAspect: l.tofAspect, tofAngleDeg: l.tofAngleDeg, sigma: l.sigma, sourceName: by.sourceName, uploadedBy: by.actor, uploadedAt: by.at }));
    for (let i = 0; i < rows.length; i += CHUNK) {
      await tx
        .insert(shotMeasurements)
        .values(rows.slice(i, i + CHUNK))
        .onConflictDoUpdate({
          target: shotMeasurements.shotId,
          set: {
            tofAspect: sql`excluded.tof_aspect`,
            tofAngleDeg: sql`excluded.tof_angle_deg`,
            sigma: sql`excluded.sigma`,
            sourceName: sql`excluded.source_name`,
            uploadedBy: sql`excluded.uploaded_by`,
            uploadedAt: sql`excluded.uploaded_at`,
          },
        });
    }
    const replaced = lines.filter((l) => earlier.has(l.shotId));
    const entries: AuditEntry[] = [
      { actor: by.actor, action: 'shots.measurements.upload', subject: `file:${by.sourceName}`, newValue: { stored: lines.length, replaced: replaced.length }, at: by.at },
      ...replaced.map((l) => ({
        actor: by.actor,
        action: 'shot.measurement.replace',
        subject: `shot:${l.shotId}`,
        oldValue: earlier.get(l.shotId),
        newValue: measurementOf(l),
        reason: `re-uploaded in ${by.sourceName}, line ${l.line}`,
        at: by.at,
      })),
    ];
    for (let i = 0; i < entries.length; i += CHUNK) await appendAuditEntries(tx, entries.slice(i, i + CHUNK));
    return { stored: lines.length, replaced: replaced.length };
  });
}

/** True when a run with this id exists. */
export async function runExists(db: Db, runId: number): Promise<boolean> {
  const [row] = await db.select({ id: runs.id }).from(runs).where(eq(runs.id, runId));
  return row !== undefined;
}

/** Shots of the selection, oldest first, each with its measurement or null; at most `limit`. */
export async function listShots(db: Db, selection: ShotSelection, limit: number): Promise<ShotRow[]> {
  const where = 'runId' in selection ? eq(shots.runId, selection.runId) : and(gte(shots.at, selection.from), lte(shots.at, selection.to));
  const rows = await db
    .select({ shot: shots, measured: shotMeasurements })
    .from(shots)
    .leftJoin(shotMeasurements, eq(shotMeasurements.shotId, shots.id))
    .where(where)
    .orderBy(asc(shots.at), asc(shots.id))
    .limit(limit);
  return rows.map(({ shot, measured }) => ({
    id: shot.id,
    label: shot.label,
    at: shot.at.toISOString(),
    runId: shot.runId,
    field: shot.field,
    prediction: shot.prediction ?? null,
    measured: measured ? measurementOf(measured) : null,
  }));
}

function measurementOf(row: ShotMeasurement): ShotMeasurement {
  return { tofAspect: row.tofAspect, tofAngleDeg: row.tofAngleDeg, sigma: row.sigma };
}
