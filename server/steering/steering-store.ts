/**
 * The steering state kept in the database so it outlives a restart: the target in force (or
 * the ramp under way), who set it and why, and why steering last stopped. A steer command
 * writes it in the transaction of its audit entry; every other change (run steps, a ramp
 * reaching its target, a trip) is written right after it happens, one write after another.
 */
import { eq } from 'drizzle-orm';
import type { Logger } from 'pino';
import { appendAudit, type AuditEntry } from '../audit/audit-log.js';
import type { Db } from '../db/database.js';
import { steeringState } from '../db/schema.js';
import type { StoredSteering } from './stored-steering.js';

const ROW_ID = 1;

type Writer = Pick<Db, 'insert'>;

export async function saveSteering(db: Writer, state: StoredSteering): Promise<void> {
  const row = { id: ROW_ID, state, updatedAtMs: Date.now() };
  await db.insert(steeringState).values(row).onConflictDoUpdate({ target: steeringState.id, set: { state, updatedAtMs: row.updatedAtMs } });
}

export async function loadSteering(db: Db): Promise<StoredSteering | null> {
  const [row] = await db.select().from(steeringState).where(eq(steeringState.id, ROW_ID));
  return row?.state ?? null;
}

/** Writes an audit entry and the steering state it leads to in one transaction. */
export function auditWithState(db: Db): (entry: AuditEntry, state: StoredSteering) => Promise<void> {
  return (entry, state) =>
    db.transaction(async (tx) => {
      await appendAudit(tx, entry);
      await saveSteering(tx, state);
    });
}

/** Writes each change in order; `drain()` waits for the writes handed over so far. */
export class SteeringWriter {
  private queue: Promise<void> = Promise.resolve();

  constructor(
    private readonly db: Db,
    private readonly log: Pick<Logger, 'error'>,
  ) {}

  write(state: StoredSteering): void {
    this.queue = this.queue
      .then(() => saveSteering(this.db, state))
      .catch((error) => this.log.error({ err: error }, 'the steering state could not be stored; after a restart the Steer page may show an older state'));
  }

  drain(): Promise<void> {
    return this.queue;
  }
}
