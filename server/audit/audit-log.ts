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
}

type Writer = Pick<Db, 'insert'>;

/** Appends an entry; pass a transaction as `db` to make it part of the change it records. */
export async function appendAudit(db: Writer, entry: AuditEntry): Promise<void> {
  await db.insert(auditLog).values({
    actor: entry.actor,
    action: entry.action,
    subject: entry.subject,
    oldValue: entry.oldValue ?? null,
    newValue: entry.newValue ?? null,
    reason: entry.reason ?? null,
  });
}
