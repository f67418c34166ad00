import { asc, eq } from 'drizzle-orm';
import type { Calibration } from '../../shared/field/calibration.js';
import { DEMO_CALIBRATION } from '../../shared/field/demo-calibration.js';
import { appendAudit } from '../audit/audit-log.js';
import type { Db } from '../db/database.js';
import { calibrations } from '../db/schema.js';

/** A stored calibration version as the API returns it. */
export interface CalibrationRecord extends Calibration {
  createdBy: string;
  createdAt: string;
  approvedBy: string | null;
  approvedAt: string | null;
  active: boolean;
}

type Row = typeof calibrations.$inferSelect;

function toRecord(row: Row): CalibrationRecord {
  return {
    id: row.id,
    version: row.version,
    label: row.label,
    gaussPerAmp: row.gaussPerAmp,
    offsetGauss: row.offsetGauss,
    coilToTrap: row.coilToTrap,
    createdBy: row.createdBy,
    createdAt: row.createdAt.toISOString(),
    approvedBy: row.approvedBy,
    approvedAt: row.approvedAt?.toISOString() ?? null,
    active: row.active,
  };
}

/** Every version, oldest first. */
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
 * On a database without calibrations, stores the demo calibration as version 1, approved and
 * active, and records that in the audit trail. Does nothing otherwise.
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
        createdBy: 'system',
        createdAt: now,
        approvedBy: 'system',
        approvedAt: now,
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
