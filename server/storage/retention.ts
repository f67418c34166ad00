import { lt } from 'drizzle-orm';
import type { ServerConfig } from '../config.js';
import type { Db } from '../db/database.js';
import { fastBatches, predictionSamples, rollups1s, slowSamples } from '../db/schema.js';

/** How often old telemetry is pruned, ms. */
const PRUNE_INTERVAL_MS = 10 * 60_000;

/**
 * Deletes raw batches and slow samples older than `rawHours`, roll-ups and stored predictions
 * older than `rollupDays` (relative to `nowMs`, epoch ms). The audit trail is never pruned.
 */
export async function pruneTelemetry(db: Db, retention: ServerConfig['retention'], nowMs: number): Promise<void> {
  const rawCutoff = nowMs - retention.rawHours * 3600_000;
  const rollupCutoff = nowMs - retention.rollupDays * 86_400_000;
  await db.delete(fastBatches).where(lt(fastBatches.t1Ms, rawCutoff));
  await db.delete(slowSamples).where(lt(slowSamples.tMs, rawCutoff));
  await db.delete(rollups1s).where(lt(rollups1s.tMs, rollupCutoff));
  await db.delete(predictionSamples).where(lt(predictionSamples.tMs, rollupCutoff));
}

/** Prunes at start and every ten minutes until closed. */
export class RetentionTask {
  private readonly timer: NodeJS.Timeout;
  private running: Promise<void>;

  constructor(
    private readonly db: Db,
    private readonly retention: ServerConfig['retention'],
    private readonly onError: (error: Error) => void,
  ) {
    this.running = this.prune();
    this.timer = setInterval(() => {
      this.running = this.running.then(() => this.prune());
    }, PRUNE_INTERVAL_MS);
  }

  async close(): Promise<void> {
    clearInterval(this.timer);
    await this.running;
  }

  private async prune(): Promise<void> {
    try {
      await pruneTelemetry(this.db, this.retention, Date.now());
    } catch (error) {
      this.onError(error as Error);
    }
  }
}
