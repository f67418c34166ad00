/**
 * Fills the read-only part of a handover from the server's records for a period: the apparatus
 * as it stands now (live state and interlock), alarms away from normal, trips and resets, setting
 * changes from the audit trail, runs and their shots, and the logbook entries written in the period.
 */
import { and, asc, eq, gt, inArray, isNull, lte, notLike, or } from 'drizzle-orm';
import type { HandoverApparatus, HandoverChange, HandoverRecord, HandoverTrip } from '../../shared/handover/handover-api.js';
import type { AlarmBook } from '../alarms/alarm-book.js';
import { allAlarms } from '../alarms/alarm-body.js';
import type { Db } from '../db/database.js';
import { auditLog, interlockTrips, runs, sequences, shots } from '../db/schema.js';
import type { Interlock } from '../interlock/interlock.js';
import { interlockBody } from '../interlock/interlock-body.js';
import type { LiveStore } from '../live/live-store.js';
import { findEntries } from '../logbook/logbook-repository.js';

/** What a handover is filled from. */
export interface HandoverSources {
  db: Db;
  live: LiveStore;
  book: AlarmBook;
  interlock: Interlock;
  /** Writes alarm events and trips still queued, so the records are complete. */
  flush(): Promise<void>;
}

/**
 * Audit actions that are not setting changes: records with their own section (logbook, trips,
 * alarm actions, runs, handovers) and accounts.
 */
const NOT_CHANGES = ['logbook.%', 'handover.%', 'interlock.%', 'alarm.%', 'user.%', 'run.%'];
/** Most rows per section; a longer shift is summarised by its newest rows. */
const MAX_ROWS = 500;


export async function fillHandoverRecord(sources: HandoverSources, from: Date, to: Date): Promise<HandoverRecord> {
  await sources.flush();
  const [trips, runItems, changes, logbook] = await Promise.all([
    tripsIn(sources.db, from, to),
    runsIn(sources.db, from, to),
    changesIn(sources.db, from, to),
    findEntries(sources.db, { writtenFrom: from, writtenTo: to, limit: MAX_ROWS, oldestFirst: true }),
  ]);
  return {
    filledAt: to.toISOString(),
    apparatus: apparatusNow(sources),
    alarms: allAlarms(sources.book).filter((a) => a.state !== 'normal'),
    trips,
    changes,
    runs: { recorded: true, note: null, items: runItems },
    logbook,
  };
}

function apparatusNow(sources: HandoverSources): HandoverApparatus {
  const live = sources.live.snapshot();
  const interlock = interlockBody(sources.interlock.state(), live.controller);
  const firstOutLabel = interlock.firstOut
    ? (interlock.conditions.find((c) => c.name === interlock.firstOut?.condition)?.label ?? interlock.firstOut.condition)
    : null;
  return {
    telemetryAt: live.time,
    controllerOnline: live.controller.online,
    controllerMode: live.controller.mode,
    field: live.field ? { magnitudeG: live.field.magnitude, thetaDeg: live.field.thetaDeg, phiDeg: live.field.phiDeg } : null,
    currentsA: live.currents ? { ...live.currents } : null,
    setpointsA: live.setpoints ? { ...live.setpoints } : null,
    interlock: interlock.state,
    interlockFirstOut: firstOutLabel,
    hardwareTripped: interlock.hardwareTripped,
    hardwareTripCause: interlock.hardwareTripCause ?? null,
    calibration: live.calibration ? `${live.calibration.label} (version ${live.calibration.version})` : null,
  };
}

/** Trips that happened, or were reset, in the period, oldest first. */
async function tripsIn(db: Db, from: Date, to: Date): Promise<HandoverTrip[]> {
  const [fromMs, toMs] = [from.getTime(), to.getTime()];
  const rows = await db
    .select()
    .from(interlockTrips)
    .where(
      or(
        and(gt(interlockTrips.trippedAtMs, fromMs), lte(interlockTrips.trippedAtMs, toMs)),
        and(gt(interlockTrips.resetAtMs, fromMs), lte(interlockTrips.resetAtMs, toMs)),
      ),
    )
    .orderBy(asc(interlockTrips.trippedAtMs))
    .limit(MAX_ROWS);
  return rows.map((r) => ({
    trippedAt: new Date(r.trippedAtMs).toISOString(),
    firstOut: r.valuesAtTrip.find((c) => c.name === r.firstOut.condition)?.label ?? r.firstOut.condition,
    reason: r.reason,
    reset: r.resetAtMs !== null && r.resetBy !== null ? { at: new Date(r.resetAtMs).toISOString(), by: r.resetBy, reason: r.resetReason ?? '' } : null,
  }));
}

/** Runs that overlapped the period (started before its end, not ended before its start), with their shots in it. */
async function runsIn(db: Db, from: Date, to: Date): Promise<HandoverRecord['runs']['items']> {
  const rows = await db
    .select({ id: runs.id, state: runs.state, startedAt: runs.startedAt, endedAt: runs.endedAt, endReason: runs.endReason, actor: runs.actor, name: sequences.name, version: sequences.version })
    .from(runs)
    .innerJoin(sequences, eq(runs.sequenceId, sequences.id))
    .where(and(lte(runs.startedAt, to), or(isNull(runs.endedAt), gt(runs.endedAt, from))))
    .orderBy(asc(runs.startedAt))
    .limit(MAX_ROWS);
  if (rows.length === 0) return [];
  const shotRows = await db
    .select({ id: shots.id, runId: shots.runId })
    .from(shots)
    .where(and(inArray(shots.runId, rows.map((r) => r.id)), gt(shots.at, from), lte(shots.at, to)))
    .orderBy(asc(shots.at));
  return rows.map((r) => {
    const own = shotRows.filter((s) => s.runId === r.id).map((s) => s.id);
    const shotText = own.length === 0 ? 'no shots in this shift' : `${own.length} shot${own.length === 1 ? '' : 's'} in this shift (${own.length > 2 ? `${own[0]} … ${own.at(-1)}` : own.join(', ')})`;
    const state = r.state === 'running' ? 'still running' : `${r.state}${r.endReason ? ` (${r.endReason})` : ''}`;
    return { id: String(r.id), label: `Run ${r.id}: sequence "${r.name}" version ${r.version}, started by ${r.actor}, ${state}; ${shotText}`, at: r.startedAt.toISOString() };
  });
}

/** Calibration, profile, limit and other setting changes of the period, oldest first. */
async function changesIn(db: Db, from: Date, to: Date): Promise<HandoverChange[]> {
  const rows = await db
    .select({ at: auditLog.at, actor: auditLog.actor, action: auditLog.action, subject: auditLog.subject, reason: auditLog.reason })
    .from(auditLog)
    .where(and(gt(auditLog.at, from), lte(auditLog.at, to), ...NOT_CHANGES.map((pattern) => notLike(auditLog.action, pattern))))
    .orderBy(asc(auditLog.at), asc(auditLog.id))
    .limit(MAX_ROWS);
  return rows.map((r) => ({ at: r.at.toISOString(), actor: r.actor, action: r.action, subject: r.subject, reason: r.reason }));
}
