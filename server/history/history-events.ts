/**
 * The records of a window as timeline marks: alarm transitions, interlock trips and resets,
 * logbook notes (at the time they refer to), runs (start and end), the start of each step of a
 * run (with how it ended), shots, and approvals,
 * profile activations and steering commands from the audit trail. Oldest first.
 */
import { and, asc, eq, gte, inArray, lt } from 'drizzle-orm';
import type { HistoryEvent, HistoryEventKind } from '../../shared/history/history-api.js';
import type { SequenceStep, StepOutcome } from '../../shared/steering/steering-api.js';
import type { Db } from '../db/database.js';
import { alarmEvents, auditLog, interlockTrips, logbookEntries, runs, runSteps, sequences, shots } from '../db/schema.js';

/** Most events per kind of record in one answer (the earliest ones). */
export const MAX_EVENTS_PER_KIND = 2000;

/** Audit actions shown as marks, with their kind. */
const AUDITED: Record<string, HistoryEventKind> = {
  'calibration.approve': 'calibration',
  'profile.activate': 'profile',
  'steering.target': 'steer',
  'steering.abort': 'steer',
  'steering.release': 'steer',
};

export async function historyEvents(db: Db, fromMs: number, toMs: number): Promise<HistoryEvent[]> {
  const [from, to] = [new Date(fromMs), new Date(toMs)];
  const lists = await Promise.all([alarms(db, fromMs, toMs), trips(db, fromMs, toMs), notes(db, from, to), runMarks(db, from, to), stepMarks(db, from, to), shotMarks(db, from, to), audited(db, from, to)]);
  return lists.flat().sort((a, b) => a.t - b.t);
}

function mark(t: number, kind: HistoryEventKind, id: string | number, label: string, actor: string | null = null, detail: string | null = null): HistoryEvent {
  return { at: new Date(t).toISOString(), t, kind, id: String(id), label, actor, detail };
}

async function alarms(db: Db, fromMs: number, toMs: number): Promise<HistoryEvent[]> {
  const rows = await db
    .select()
    .from(alarmEvents)
    .where(and(gte(alarmEvents.atMs, fromMs), lt(alarmEvents.atMs, toMs)))
    .orderBy(asc(alarmEvents.atMs), asc(alarmEvents.id))
    .limit(MAX_EVENTS_PER_KIND);
  return rows.map((r) => mark(r.atMs, 'alarm', r.alarmId, `Alarm ${r.alarmId} (${r.priority}): ${r.kind}, ${r.fromState} → ${r.toState}`, r.actor, r.reason));
}

async function trips(db: Db, fromMs: number, toMs: number): Promise<HistoryEvent[]> {
  const within = (column: typeof interlockTrips.trippedAtMs | typeof interlockTrips.resetAtMs) => and(gte(column, fromMs), lt(column, toMs));
  const [tripped, reset] = await Promise.all([
    db.select().from(interlockTrips).where(within(interlockTrips.trippedAtMs)).orderBy(asc(interlockTrips.trippedAtMs)).limit(MAX_EVENTS_PER_KIND),
    db.select().from(interlockTrips).where(within(interlockTrips.resetAtMs)).orderBy(asc(interlockTrips.resetAtMs)).limit(MAX_EVENTS_PER_KIND),
  ]);
  const firstOut = (r: (typeof tripped)[number]) => r.valuesAtTrip.find((c) => c.name === r.firstOut.condition)?.label ?? r.firstOut.condition;
  return [
    ...tripped.map((r) => mark(r.trippedAtMs, 'trip', r.id, `Interlock trip, first out: ${firstOut(r)}`, null, r.reason)),
    ...reset.map((r) => mark(r.resetAtMs ?? r.trippedAtMs, 'reset', r.id, 'Interlock reset', r.resetBy, r.resetReason)),
  ];
}

async function notes(db: Db, from: Date, to: Date): Promise<HistoryEvent[]> {
  const rows = await db
    .select({ id: logbookEntries.id, at: logbookEntries.at, author: logbookEntries.author, text: logbookEntries.text })
    .from(logbookEntries)
    .where(and(gte(logbookEntries.at, from), lt(logbookEntries.at, to)))
    .orderBy(asc(logbookEntries.at), asc(logbookEntries.id))
    .limit(MAX_EVENTS_PER_KIND);
  return rows.map((r) => mark(r.at.getTime(), 'note', r.id, `Logbook: ${firstLine(r.text)}`, r.author, r.text));
}

async function runMarks(db: Db, from: Date, to: Date): Promise<HistoryEvent[]> {
  const columns = { id: runs.id, state: runs.state, startedAt: runs.startedAt, endedAt: runs.endedAt, actor: runs.actor, reason: runs.reason, endReason: runs.endReason, name: sequences.name, version: sequences.version };
  const query = (column: typeof runs.startedAt | typeof runs.endedAt) =>
    db.select(columns).from(runs).innerJoin(sequences, eq(runs.sequenceId, sequences.id)).where(and(gte(column, from), lt(column, to))).orderBy(asc(column)).limit(MAX_EVENTS_PER_KIND);
  const [started, ended] = await Promise.all([query(runs.startedAt), query(runs.endedAt)]);
  return [
    ...started.map((r) => mark(r.startedAt.getTime(), 'run', r.id, `Run ${r.id} started: sequence "${r.name}" version ${r.version}`, r.actor, r.reason)),
    ...ended.map((r) => mark((r.endedAt ?? r.startedAt).getTime(), 'run', r.id, `Run ${r.id} ${r.state}`, null, r.endReason)),
  ];
}

async function stepMarks(db: Db, from: Date, to: Date): Promise<HistoryEvent[]> {
  const rows = await db
    .select()
    .from(runSteps)
    .where(and(gte(runSteps.startedAt, from), lt(runSteps.startedAt, to)))
    .orderBy(asc(runSteps.startedAt), asc(runSteps.runId), asc(runSteps.stepIndex))
    .limit(MAX_EVENTS_PER_KIND);
  return rows.map((r) =>
    mark(r.startedAt.getTime(), 'step', `${r.runId}.${r.stepIndex + 1}`, `Run ${r.runId} step ${r.stepIndex + 1}: ${stepText(r.step)}`, null, stepEnd(r.outcome, r.endedAt && r.endedAt.getTime() - r.startedAt.getTime())),
  );
}

function stepText(step: SequenceStep): string {
  switch (step.kind) {
    case 'ramp':
      return `ramp to |B| ${step.magnitudeG} G, θ ${step.thetaDeg}°, φ ${step.phiDeg}° over ${seconds(step.durationMs)}`;
    case 'hold':
      return `hold for ${seconds(step.durationMs)}`;
    default:
      return `shot "${step.label}"`;
  }
}

const OUTCOME_TEXT: Record<StepOutcome, string> = { done: 'Done', aborted: 'Aborted', tripped: 'Interrupted by an interlock trip' };

/** How a step ended, e.g. "Aborted after 0.4 s"; null while it goes. */
function stepEnd(outcome: StepOutcome | null, ms: number | null): string | null {
  return outcome && ms !== null ? `${OUTCOME_TEXT[outcome]} after ${seconds(ms)}` : null;
}

function seconds(ms: number): string {
  return `${(ms / 1000).toFixed(1)} s`;
}

async function shotMarks(db: Db, from: Date, to: Date): Promise<HistoryEvent[]> {
  const rows = await db
    .select({ id: shots.id, runId: shots.runId, label: shots.label, at: shots.at })
    .from(shots)
    .where(and(gte(shots.at, from), lt(shots.at, to)))
    .orderBy(asc(shots.at))
    .limit(MAX_EVENTS_PER_KIND);
  return rows.map((r) => mark(r.at.getTime(), 'shot', r.id, `Shot ${r.id} (${r.label}), run ${r.runId}`));
}

async function audited(db: Db, from: Date, to: Date): Promise<HistoryEvent[]> {
  const rows = await db
    .select()
    .from(auditLog)
    .where(and(gte(auditLog.at, from), lt(auditLog.at, to), inArray(auditLog.action, Object.keys(AUDITED))))
    .orderBy(asc(auditLog.at), asc(auditLog.id))
    .limit(MAX_EVENTS_PER_KIND);
  return rows.map((r) => mark(r.at.getTime(), AUDITED[r.action], r.subject.split(':').at(-1) ?? r.subject, auditLabel(r.action, r.newValue), r.actor, r.reason));
}

function auditLabel(action: string, value: unknown): string {
  const v = (value ?? {}) as Record<string, unknown>;
  switch (action) {
    case 'calibration.approve':
      return `Calibration version ${String(v['version'])} approved and active`;
    case 'profile.activate':
      return `Sample profile "${String(v['name'])}" version ${String(v['version'])} active`;
    case 'steering.target':
      return `Steer to |B| ${fixed(v['magnitudeG'], 3)} G, θ ${fixed(v['thetaDeg'], 1)}°, φ ${fixed(v['phiDeg'], 1)}° over ${fixed(Number(v['rampMs']) / 1000, 1)} s`;
    case 'steering.abort':
      return 'Steering aborted: holding the present field';
    default:
      return 'Steering released to the controller';
  }
}

function fixed(v: unknown, digits: number): string {
  return typeof v === 'number' && Number.isFinite(v) ? v.toFixed(digits) : '?';
}

function firstLine(text: string): string {
  const line = text.split('\n', 1)[0].trim();
  return line.length > 80 ? `${line.slice(0, 79)}…` : line;
}
