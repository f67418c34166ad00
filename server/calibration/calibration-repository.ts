import { and, asc, desc, eq, gte, isNotNull, lt, max } from 'drizzle-orm';
import type { CalibrationDetail, CalibrationRecord } from '../../shared/field/calibration-record.js';
import type { HistoryCalibration } from '../../shared/history/history-api.js';
import { DEMO_CALIBRATION, DEMO_COVARIANCE } from '../../shared/field/demo-calibration.js';
import { appendAudit } from '../audit/audit-log.js';
import type { Db } from '../db/database.js';
import { calibrations } from '../db/schema.js';
import type { CalibrationFit } from './fit/calibration-fit.js';

export type { CalibrationRecord } from '../../shared/field/calibration-record.js';

type Row = typeof calibrations.$inferSelect;
type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

function toRecord(row: Row): CalibrationRecord {
  return {
    id: row.id,
    version: row.version,
    label: row.label,
    gaussPerAmp: row.gaussPerAmp,
    offsetGauss: row.offsetGauss,
    coilToTrap: row.coilToTrap,
    covariance: row.covariance,
    state: row.state,
    kind: row.kind,
    fit: row.fit,
    sourceName: row.sourceName,
    mhzPerGauss: row.mhzPerGauss,
    createdBy: row.createdBy,
    createdAt: row.createdAt.toISOString(),
    approvedBy: row.approvedBy,
    approvedAt: row.approvedAt?.toISOString() ?? null,
    approvalReason: row.approvalReason,
    active: row.active,
  };
}

/** Every version, oldest first, without the per-line residuals. */
export async function listCalibrations(db: Db): Promise<CalibrationRecord[]> {
  return (await db.select().from(calibrations).orderBy(asc(calibrations.version))).map(toRecord);
}

export async function findActiveCalibration(db: Db): Promise<CalibrationRecord | null> {
  const [row] = await db.select().from(calibrations).where(eq(calibrations.active, true));
  return row ? toRecord(row) : null;
}

export async function findCalibration(db: Db, id: number): Promise<CalibrationRecord | null> {
  const [row] = await db.select().from(calibrations).where(eq(calibrations.id, id));
  return row ? toRecord(row) : null;
}

/**
 * The versions in force over [fromMs, toMs), oldest first: the one approved last before
 * `fromMs`, then each approved inside the window (approval makes a version active at once).
 */
export async function calibrationsOver(db: Db, fromMs: number, toMs: number): Promise<HistoryCalibration[]> {
  const at = calibrations.approvedAt;
  const columns = { id: calibrations.id, version: calibrations.version, label: calibrations.label, approvedBy: calibrations.approvedBy, approvedAt: at };
  const [before, inside] = await Promise.all([
    db.select(columns).from(calibrations).where(and(isNotNull(at), lt(at, new Date(fromMs)))).orderBy(desc(at)).limit(1),
    db.select(columns).from(calibrations).where(and(gte(at, new Date(fromMs)), lt(at, new Date(toMs)))).orderBy(asc(at)),
  ]);
  return [...before, ...inside].map(({ approvedAt, ...rest }) => ({ t: approvedAt!.getTime(), ...rest }));
}

/** A version with the residual of every file line. */
export async function findCalibrationDetail(db: Db, id: number): Promise<CalibrationDetail | null> {
  const [row] = await db.select().from(calibrations).where(eq(calibrations.id, id));
  return row ? { ...toRecord(row), points: row.fitPoints } : null;
}

/** What a fit upload stores. */
export interface DraftRequest {
  fit: CalibrationFit;
  sourceName: string;
  mhzPerGauss: number | null;
  actor: string;
}

/** Stores a fit as the next version in state `draft` (not active) and audits it, in one transaction. */
export async function saveDraft(db: Db, request: DraftRequest): Promise<CalibrationDetail> {
  return db.transaction(async (tx) => {
    const [{ latest }] = await tx.select({ latest: max(calibrations.version) }).from(calibrations);
    const version = (latest ?? 0) + 1;
    const { report } = request.fit;
    const [row] = await tx
      .insert(calibrations)
      .values({
        version,
        label: `${report.kind === 'vector' ? 'Vector-probe' : '|B|'} fit of ${request.sourceName}`,
        gaussPerAmp: report.gaussPerAmp as Row['gaussPerAmp'],
        offsetGauss: report.offsetGauss,
        coilToTrap: request.fit.coilToTrap as Row['coilToTrap'],
        covariance: request.fit.covariance,
        state: 'draft',
        kind: report.kind,
        fit: report,
        fitPoints: request.fit.points,
        sourceName: request.sourceName,
        mhzPerGauss: request.mhzPerGauss,
        createdBy: request.actor,
        active: false,
      })
      .returning();
    await appendAudit(tx, {
      actor: request.actor,
      action: 'calibration.fit',
      subject: `calibration:${row.id}`,
      newValue: { version, state: 'draft', sourceName: request.sourceName, mhzPerGauss: request.mhzPerGauss, fit: report, coilToTrap: row.coilToTrap },
    });
    return { ...toRecord(row), points: row.fitPoints };
  });
}

export type ApproveOutcome = { ok: true; record: CalibrationRecord } | { ok: false; status: 404 | 409; message: string };

/**
 * Approves a draft and makes it the active version in one transaction with its audit entry:
 * the previous version stays stored, approved and unchanged. Approved versions are immutable
 * (also enforced by a database trigger), so approving one again is refused.
 */
export async function approveCalibration(db: Db, request: { id: number; reason: string; actor: string }): Promise<ApproveOutcome> {
  return db.transaction(async (tx): Promise<ApproveOutcome> => {
    const [target] = await tx.select().from(calibrations).where(eq(calibrations.id, request.id)).for('update');
    if (!target) return { ok: false, status: 404, message: `No calibration version with id ${request.id}: see GET /api/calibrations` };
    if (target.state === 'approved') {
      return { ok: false, status: 409, message: `Calibration v${target.version} is already approved (by ${target.approvedBy}); approved versions do not change` };
    }
    const previous = await deactivateCurrent(tx);
    const [row] = await tx
      .update(calibrations)
      .set({ state: 'approved', approvedBy: request.actor, approvedAt: new Date(), approvalReason: request.reason, active: true })
      .where(eq(calibrations.id, request.id))
      .returning();
    await appendAudit(tx, {
      actor: request.actor,
      action: 'calibration.approve',
      subject: `calibration:${row.id}`,
      oldValue: previous ? { activeId: previous.id, activeVersion: previous.version } : null,
      newValue: { id: row.id, version: row.version, state: 'approved', active: true },
      reason: request.reason,
    });
    return { ok: true, record: toRecord(row) };
  });
}

/** Clears the active mark first: the database allows one active row at a time. */
async function deactivateCurrent(tx: Tx): Promise<Row | null> {
  const [row] = await tx.update(calibrations).set({ active: false }).where(eq(calibrations.active, true)).returning();
  return row ?? null;
}

/**
 * On a database without calibrations, stores the demo calibration as version 1, approved and
 * active, with its invented covariance, and records that in the audit trail. Does nothing otherwise.
 */
export async function seedDemoCalibration(db: Db): Promise<void> {
  await db.transaction(async (tx) => {
    const existing = await tx.select({ id: calibrations.id }).from(calibrations).limit(1);
    if (existing.length > 0) return;
    const now = new Date();
    const [row] = await tx
      .insert(calibrations)
      .values({
        version: 1,
        label: 'Lindqvist Hall demo calibration',
        ...DEMO_CALIBRATION,
        covariance: DEMO_COVARIANCE,
        state: 'approved',
        kind: 'demo',
        createdBy: 'system',
        createdAt: now,
        approvedBy: 'system',
        approvedAt: now,
        approvalReason: 'first start: demo calibration',
        active: true,
      })
      .returning();
    await appendAudit(tx, {
      actor: 'system',
      action: 'calibration.seed',
      subject: `calibration:${row.id}`,
      newValue: { version: row.version, label: row.label, ...DEMO_CALIBRATION },
      reason: 'first start: demo calibration seeded and activated',
    });
  });
}
