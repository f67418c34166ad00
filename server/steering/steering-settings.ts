import { desc } from 'drizzle-orm';
import { appendAudit } from '../audit/audit-log.js';
import type { Db } from '../db/database.js';
import { steeringSettings } from '../db/schema.js';

/** The steering limits in force (the newest stored version). */
export interface SteeringSettings {
  version: number;
  collapseRatioLimit: number;
  createdBy: string;
  createdAt: string;
  reason: string;
}

/**
 * Demo limit of the fictional Lindqvist Hall lab (invented, demo only): plans may bring the gas
 * to at most 80 % of its predicted mean-field collapse strength. A lead sets the lab's own.
 */
export const DEMO_COLLAPSE_RATIO_LIMIT = 0.8;

function toSettings(row: typeof steeringSettings.$inferSelect): SteeringSettings {
  return { version: row.version, collapseRatioLimit: row.collapseRatioLimit, createdBy: row.createdBy, createdAt: row.createdAt.toISOString(), reason: row.reason };
}

/** Stores version 1 with the demo limit when no version exists yet. */
export async function seedSteeringSettings(db: Db): Promise<void> {
  await db
    .insert(steeringSettings)
    .values({ version: 1, collapseRatioLimit: DEMO_COLLAPSE_RATIO_LIMIT, createdBy: 'system', reason: 'Demo default of the Lindqvist Hall lab' })
    .onConflictDoNothing();
}

export async function currentSteeringSettings(db: Db): Promise<SteeringSettings> {
  const [row] = await db.select().from(steeringSettings).orderBy(desc(steeringSettings.version)).limit(1);
  if (!row) throw new Error('no steering settings stored: seedSteeringSettings() must run at start');
  return toSettings(row);
}

/** Stores the next version and its audit entry in one transaction. */
export async function saveSteeringSettings(db: Db, change: { collapseRatioLimit: number; reason: string; actor: string }): Promise<SteeringSettings> {
  return db.transaction(async (tx) => {
    const [previous] = await tx.select().from(steeringSettings).orderBy(desc(steeringSettings.version)).limit(1);
    const [row] = await tx
      .insert(steeringSettings)
      .values({ version: (previous?.version ?? 0) + 1, collapseRatioLimit: change.collapseRatioLimit, createdBy: change.actor, reason: change.reason })
      .returning();
    await appendAudit(tx, {
      actor: change.actor,
      action: 'steering.settings',
      subject: `steering-settings:${row.version}`,
      oldValue: previous ? { version: previous.version, collapseRatioLimit: previous.collapseRatioLimit } : null,
      newValue: { version: row.version, collapseRatioLimit: row.collapseRatioLimit },
      reason: change.reason,
    });
    return toSettings(row);
  });
}
