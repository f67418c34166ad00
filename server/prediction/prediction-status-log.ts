import { and, asc, desc, gte, lt } from 'drizzle-orm';
import type { HistoryPredictionStatus } from '../../shared/history/history-api.js';
import type { PredictionStatus } from '../../shared/live/live-state.js';
import type { Db } from '../db/database.js';
import { predictionStatusChanges } from '../db/schema.js';

type Row = typeof predictionStatusChanges.$inferInsert;

/** How often changes are written, ms: the frame path only appends to a list. */
const WRITE_MS = 1000;
/** Changes held while the database refuses them; beyond this new ones are counted and dropped. */
export const MAX_PENDING_CHANGES = 10_000;
/** Most changes in one history answer (the earliest ones). */
export const MAX_STATUS_ROWS = 20_000;

/**
 * Keeps each change of whether the live prediction describes the gas (table
 * `prediction_status_changes`), so Replay can grey the prediction where Live did and say why.
 * `record` is called on the frame path and only compares and appends; a timer writes what
 * gathered once a second in one transaction (which also drops changes older than the
 * roll-ups' retention), in order, keeping a refused write for the next turn. A change is what
 * Replay words differently: the state, the least orienting field, or a new stale stretch (its
 * growing age is worded from the last frame's time); a |B| that moves within one state is not,
 * Replay reads |B| from the recorded field. The owner calls `close()`.
 */
export class PredictionStatusLog {
  private pending: Row[] = [];
  private lastKey: string | null = null;
  private writing: Promise<void> = Promise.resolve();
  private readonly timer: NodeJS.Timeout;
  /** Set while changes are dropped for want of room, so that is reported once per stretch. */
  private dropping = false;

  constructor(
    private readonly deps: {
      db: Db;
      /** Changes older than this are removed, days (the roll-ups' retention). */
      retentionDays: number;
      onError: (error: unknown) => void;
      now?: () => number;
    },
  ) {
    this.timer = setInterval(() => this.flush().catch(deps.onError), WRITE_MS);
    this.timer.unref();
  }

  /**
   * Takes the status published at `atMs` (server time, Unix epoch ms); `lastFrameAtMs` is when
   * the newest frame arrived (null before the first).
   */
  record(status: PredictionStatus, atMs: number, lastFrameAtMs: number | null): void {
    const staleSince = status.state === 'stale' ? lastFrameAtMs : null;
    const key = `${status.state}|${status.minFieldG}|${staleSince}`;
    if (key === this.lastKey) return;
    this.lastKey = key;
    if (this.pending.length >= MAX_PENDING_CHANGES) {
      if (!this.dropping) this.deps.onError(new Error(`${MAX_PENDING_CHANGES} prediction status changes wait for the database; newer ones are not kept`));
      this.dropping = true;
      return;
    }
    this.pending.push({ tMs: atMs, state: status.state, fieldG: status.fieldG, minFieldG: status.minFieldG, reason: status.reason, lastFrameAtMs: staleSince });
  }

  /** Writes what gathered so far (after any write under way); rejects when the database refuses it, which keeps it for the next turn. */
  flush(): Promise<void> {
    this.writing = this.writing.catch(() => undefined).then(() => this.write());
    return this.writing;
  }

  /** Stops the timer and writes what is left. */
  async close(): Promise<void> {
    clearInterval(this.timer);
    await this.flush().catch(this.deps.onError);
  }

  private async write(): Promise<void> {
    if (this.pending.length === 0) return;
    const rows = this.pending;
    this.pending = [];
    const cutoffMs = (this.deps.now ?? Date.now)() - this.deps.retentionDays * 86_400_000;
    try {
      await this.deps.db.transaction(async (tx) => {
        await tx.insert(predictionStatusChanges).values(rows);
        await tx.delete(predictionStatusChanges).where(lt(predictionStatusChanges.tMs, cutoffMs));
      });
      this.dropping = false;
    } catch (error) {
      this.pending = [...rows, ...this.pending];
      throw error;
    }
  }
}

/** The stored changes over [fromMs, toMs): the one in force at `fromMs`, then those inside, oldest first. */
export async function predictionStatusOver(db: Db, fromMs: number, toMs: number): Promise<HistoryPredictionStatus> {
  const t = predictionStatusChanges.tMs;
  const [before, inside] = await Promise.all([
    db.select().from(predictionStatusChanges).where(lt(t, fromMs)).orderBy(desc(t), desc(predictionStatusChanges.id)).limit(1),
    db
      .select()
      .from(predictionStatusChanges)
      .where(and(gte(t, fromMs), lt(t, toMs)))
      .orderBy(asc(t), asc(predictionStatusChanges.id))
      .limit(MAX_STATUS_ROWS),
  ]);
  const rows = [...before, ...inside];
  return {
    t: rows.map((r) => r.tMs),
    state: rows.map((r) => r.state),
    fieldG: rows.map((r) => r.fieldG),
    minFieldG: rows.map((r) => r.minFieldG),
    reason: rows.map((r) => r.reason),
    lastFrameAtMs: rows.map((r) => r.lastFrameAtMs),
  };
}
