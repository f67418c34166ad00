import { desc, gte } from 'drizzle-orm';
import type { Logger } from 'pino';
import type { SecurityEvent } from '../../shared/auth/user-api.js';
import type { Db } from '../db/database.js';
import { securityEvents } from '../db/schema.js';

export interface SecurityEventInput {
  kind: string;
  email?: string | null;
  address?: string | null;
  detail?: Record<string, unknown>;
}

/** Most events one request lists. */
const MAX_LISTED = 1000;

/**
 * The security events an admin reviews (sign-in throttling, sign-in attempts on disabled
 * accounts, lifted throttles): written to `security_events` and to the server log as warnings.
 * `record` does not wait (sign-in must not stall on it); a failed write is logged. `recordNow`
 * waits, for events that are an admin's action.
 */
export class SecurityLog {
  private pending = new Set<Promise<void>>();

  constructor(
    private readonly db: Pick<Db, 'insert' | 'select'>,
    private readonly log: Logger,
  ) {}

  record(event: SecurityEventInput): void {
    const write = this.recordNow(event).catch((error: unknown) => this.log.error({ err: error, event }, 'storing a security event failed'));
    this.pending.add(write);
    void write.finally(() => this.pending.delete(write));
  }

  async recordNow(event: SecurityEventInput, db: Pick<Db, 'insert'> = this.db): Promise<void> {
    this.log.warn({ securityEvent: event }, `security event: ${event.kind}`);
    await db.insert(securityEvents).values({ kind: event.kind, email: event.email ?? null, address: event.address ?? null, detail: event.detail ?? null });
  }

  /** Events of the last `hours`, newest first (waits for writes still under way). */
  async recent(hours: number, now = Date.now()): Promise<SecurityEvent[]> {
    await Promise.all(this.pending);
    const rows = await this.db
      .select()
      .from(securityEvents)
      .where(gte(securityEvents.at, new Date(now - hours * 3_600_000)))
      .orderBy(desc(securityEvents.id))
      .limit(MAX_LISTED);
    return rows.map((r) => ({
      id: r.id,
      at: r.at.toISOString(),
      kind: r.kind,
      email: r.email,
      address: r.address,
      detail: (r.detail as Record<string, unknown> | null) ?? null,
    }));
  }

  /** Waits for writes under way (shutdown). */
  async drain(): Promise<void> {
    await Promise.all(this.pending);
  }
}
