/**
 * What the database holds after the server stopped (its writer drained): opened directly from
 * the data folder's telemetry cluster, counted per benchmark level by sequence range, and the
 * bytes the telemetry tables take on disk (tables, indexes and TOAST).
 */
import { sql } from 'drizzle-orm';
import { openDatabase } from '../../../server/db/database.js';

export interface StoredLevel {
  fastFrames: number;
  slowFrames: number;
}

export interface StoredReport {
  levels: StoredLevel[];
  rollupSeconds: number;
  /** Bytes of fast_batches, slow_samples and rollups_1s with their indexes and TOAST. */
  telemetryBytes: number;
}

/** First and last sequence numbers (inclusive) of one level's fast and slow frames. */
export interface SeqRanges {
  fast: [number, number];
  slow: [number, number];
}

/** `ranges[i]` holds the sequence numbers level i published. */
export async function countStored(dataDir: string, ranges: SeqRanges[]): Promise<StoredReport> {
  const database = await openDatabase({ dataDir, databaseUrl: null, pgliteFolder: 'telemetry' });
  try {
    const levels: StoredLevel[] = [];
    for (const { fast: f, slow: s } of ranges) {
      const fast = await database.db.execute<{ n: string | null }>(
        sql`select sum(seq_last - seq_first + 1) as n from fast_batches where seq_first >= ${f[0]} and seq_last <= ${f[1]}`,
      );
      const slow = await database.db.execute<{ n: string }>(sql`select count(*) as n from slow_samples where seq >= ${s[0]} and seq <= ${s[1]}`);
      levels.push({ fastFrames: Number(rows<{ n: string | null }>(fast)[0]?.n ?? 0), slowFrames: Number(rows<{ n: string }>(slow)[0]?.n ?? 0) });
    }
    const rollups = await database.db.execute<{ n: string }>(sql`select count(*) as n from rollups_1s`);
    const size = await database.db.execute<{ bytes: string }>(
      sql`select pg_total_relation_size('fast_batches') + pg_total_relation_size('slow_samples') + pg_total_relation_size('rollups_1s') as bytes`,
    );
    return { levels, rollupSeconds: Number(rows<{ n: string }>(rollups)[0].n), telemetryBytes: Number(rows<{ bytes: string }>(size)[0].bytes) };
  } finally {
    await database.close();
  }
}

/** Rows of a raw query, whichever driver answered (PGlite gives `{ rows }`, node-postgres too). */
function rows<T>(result: unknown): T[] {
  return (result as { rows: T[] }).rows;
}
