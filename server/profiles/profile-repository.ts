import { and, asc, desc, eq, gte, inArray, lt } from 'drizzle-orm';
import { DEMO_PROFILE } from '../../shared/profiles/demo-profile.js';
import type { HistoryProfile } from '../../shared/history/history-api.js';
import type { ProfileRecord } from '../../shared/profiles/profile-record.js';
import type { SampleProfile } from '../../shared/profiles/sample-profile.js';
import { appendAudit } from '../audit/audit-log.js';
import type { Db } from '../db/database.js';
import { auditLog, sampleProfiles } from '../db/schema.js';

type Row = typeof sampleProfiles.$inferSelect;
type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

function toRecord(row: Row): ProfileRecord {
  return {
    id: row.id,
    name: row.name,
    version: row.version,
    profile: row.body,
    active: row.active,
    createdBy: row.createdBy,
    createdAt: row.createdAt.toISOString(),
    reason: row.reason,
  };
}

/** How a version is named in the audit trail's old and new values. */
function auditRef(row: Row): { id: number; name: string; version: number } {
  return { id: row.id, name: row.name, version: row.version };
}

/** Every version, grouped by name, oldest version first. */
export async function listProfiles(db: Db): Promise<ProfileRecord[]> {
  return (await db.select().from(sampleProfiles).orderBy(asc(sampleProfiles.name), asc(sampleProfiles.version))).map(toRecord);
}

export async function findActiveProfile(db: Db): Promise<ProfileRecord | null> {
  const [row] = await db.select().from(sampleProfiles).where(eq(sampleProfiles.active, true));
  return row ? toRecord(row) : null;
}

/** Audit actions that make a version the active profile. */
const ACTIVATIONS = ['profile.activate', 'profile.seed'];

/**
 * The versions in force over [fromMs, toMs), oldest first, from the audit trail's activations:
 * the one activated last before `fromMs`, then each activated inside the window.
 */
export async function profilesOver(db: Db, fromMs: number, toMs: number): Promise<HistoryProfile[]> {
  const activations = inArray(auditLog.action, ACTIVATIONS);
  const columns = { at: auditLog.at, value: auditLog.newValue };
  const [before, inside] = await Promise.all([
    db.select(columns).from(auditLog).where(and(activations, lt(auditLog.at, new Date(fromMs)))).orderBy(desc(auditLog.at), desc(auditLog.id)).limit(1),
    db.select(columns).from(auditLog).where(and(activations, gte(auditLog.at, new Date(fromMs)), lt(auditLog.at, new Date(toMs)))).orderBy(asc(auditLog.at), asc(auditLog.id)),
  ]);
  const entries = [...before, ...inside].map((e) => ({ t: e.at.getTime(), id: (e.value as { id: number }).id }));
  if (entries.length === 0) return [];
  const rows = await db.select().from(sampleProfiles).where(inArray(sampleProfiles.id, [...new Set(entries.map((e) => e.id))]));
  const byId = new Map(rows.map((r) => [r.id, toRecord(r)]));
  return entries.flatMap((e) => {
    const profile = byId.get(e.id);
    return profile ? [{ t: e.t, profile }] : [];
  });
}

/**
 * Stores `profile` (already validated) as the next version under its name, or version 1 of a
 * new name, never active: activation is a separate, deliberate step (`activateProfile`). The
 * save and its audit entry (who, when, old and new value, reason) commit together.
 */
export async function saveProfile(db: Db, request: { profile: SampleProfile; reason: string; actor: string }): Promise<ProfileRecord> {
  return db.transaction(async (tx) => {
    const { profile, reason, actor } = request;
    const [previous] = await tx
      .select()
      .from(sampleProfiles)
      .where(eq(sampleProfiles.name, profile.name))
      .orderBy(desc(sampleProfiles.version))
      .limit(1);
    const [row] = await tx
      .insert(sampleProfiles)
      .values({ name: profile.name, version: (previous?.version ?? 0) + 1, body: profile, active: false, createdBy: actor, reason })
      .returning();
    await appendAudit(tx, {
      actor,
      action: 'profile.save',
      subject: `profile:${row.id}`,
      oldValue: previous ? { ...auditRef(previous), profile: previous.body } : null,
      newValue: { ...auditRef(row), profile: row.body },
      reason,
    });
    return toRecord(row);
  });
}

/**
 * Makes version `id` the active profile and records that in the audit trail; null when no
 * such version exists. Activating the version that is already active changes nothing and
 * writes no entry.
 */
export async function activateProfile(db: Db, request: { id: number; reason: string; actor: string }): Promise<ProfileRecord | null> {
  return db.transaction(async (tx) => {
    const [target] = await tx.select().from(sampleProfiles).where(eq(sampleProfiles.id, request.id));
    if (!target) return null;
    if (target.active) return toRecord(target);
    const deactivated = await deactivateCurrent(tx);
    const [row] = await tx.update(sampleProfiles).set({ active: true }).where(eq(sampleProfiles.id, request.id)).returning();
    await auditActivation(tx, request.actor, deactivated, row, request.reason);
    return toRecord(row);
  });
}

/**
 * On a database without sample profiles, stores the demo profile as version 1, active, and
 * records that in the audit trail. Does nothing otherwise.
 */
export async function seedDemoProfile(db: Db): Promise<void> {
  await db.transaction(async (tx) => {
    const existing = await tx.select({ id: sampleProfiles.id }).from(sampleProfiles).limit(1);
    if (existing.length > 0) return;
    const reason = 'first start: demo sample profile seeded and activated';
    const [row] = await tx
      .insert(sampleProfiles)
      .values({ name: DEMO_PROFILE.name, version: 1, body: DEMO_PROFILE, active: true, createdBy: 'system', reason })
      .returning();
    await appendAudit(tx, { actor: 'system', action: 'profile.seed', subject: `profile:${row.id}`, newValue: { ...auditRef(row), profile: row.body }, reason });
  });
}

/** Clears the active mark first: the database allows one active row at a time. */
async function deactivateCurrent(tx: Tx): Promise<Row | null> {
  const [row] = await tx.update(sampleProfiles).set({ active: false }).where(eq(sampleProfiles.active, true)).returning();
  return row ?? null;
}

async function auditActivation(tx: Tx, actor: string, previous: Row | null, next: Row, reason: string): Promise<void> {
  await appendAudit(tx, {
    actor,
    action: 'profile.activate',
    subject: `profile:${next.id}`,
    oldValue: previous ? auditRef(previous) : null,
    newValue: auditRef(next),
    reason,
  });
}
