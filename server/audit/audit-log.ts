import type { Db } from '../db/database.js';
import { auditLog } from '../db/schema.js';

/** One entry of the append-only audit trail. */
export interface AuditEntry {
  /** E-mail of the person acting, or `system`. */
  actor: string;
  /** What happened, e.g. `calibration.activate`, `user.create`. */
  action: string;
  /** What it happened to, e.g. `calibration:3`, `user:lead@tiltwatch.example`. */
  subject: string;
  oldValue?: unknown;
  newValue?: unknown;
  reason?: string | null;
  /** When it happened, when recorded later than it happened (default: the time of writing). */
  at?: Date;
}

type Writer = Pick<Db, 'insert'>;

/** Appends an entry; pass a transaction as `db` to make it part of the change it records. */
export async function appendAudit(db: Writer, entry: AuditEntry): Promise<void> {
  await appendAuditEntries(db, [entry]);
}

/** Appends several entries in one statement (e.g. queued operator actions). */
export async function appendAuditEntries(db: Writer, entries: readonly AuditEntry[]): Promise<void> {
  if (entries.length === 0) return;
  await db.insert(auditLog).values(
    entries.map((entry) => ({
      actor: entry.actor,
      action: entry.action,
      subject: entry.subject,
      oldValue: entry.oldValue ?? null,
      newValue: entry.newValue ?? null,
      reason: entry.reason ?? null,
      ...(entry.at ? { at: entry.at } : {}),
    })),
  );
}
