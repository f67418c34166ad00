/**
 * The level set in force (display bands, trip levels, operating settings) and its stored
 * versions in `level_sets`. Loading seeds version 1 from the demo set when the table is empty;
 * a lead's save adds the next version with its audit entry in one transaction, and only then
 * becomes the level set in force and is handed on to every listener (interlock, fan-out).
 */
import { and, asc, desc, gte, lt } from 'drizzle-orm';
import type { LevelSet, LevelSetVersion } from '../../shared/levels/level-set.js';
import { appendAudit } from '../audit/audit-log.js';
import type { Db } from '../db/database.js';
import { levelSets } from '../db/schema.js';
import { DEMO_LEVEL_SET } from './demo-levels.js';
import { parseLevelSet } from './level-set-schema.js';

const SYSTEM = 'system';

type Row = typeof levelSets.$inferSelect;

function versionOf(row: Row): LevelSetVersion {
  return { version: row.version, levels: parseLevelSet(row.body), createdBy: row.createdBy, createdAt: row.createdAt.toISOString(), reason: row.reason };
}

export class LevelStore {
  private readonly listeners: ((set: LevelSetVersion) => void)[] = [];
  /** Edits run one after another (see `exclusive`), so each version follows the one in force. */
  private editing: Promise<unknown> = Promise.resolve();

  private constructor(
    private readonly db: Db,
    private current: LevelSetVersion,
  ) {}

  /** Loads the newest stored version, seeding the demo set as version 1 into an empty table. */
  static async load(db: Db): Promise<LevelStore> {
    await db
      .insert(levelSets)
      .values({ version: 1, body: DEMO_LEVEL_SET, createdBy: SYSTEM, reason: 'Demo levels of the Lindqvist Hall apparatus (seed)' })
      .onConflictDoNothing({ target: levelSets.version });
    const [row] = await db.select().from(levelSets).orderBy(desc(levelSets.version)).limit(1);
    try {
      return new LevelStore(db, versionOf(row));
    } catch (error) {
      throw new Error(`The stored level set version ${row.version} (table level_sets) is not valid: ${(error as Error).message}`);
    }
  }

  /** The version in force. */
  inForce(): LevelSetVersion {
    return this.current;
  }

  /** Called with every new version in force, after it is stored. */
  onChange(listener: (set: LevelSetVersion) => void): void {
    this.listeners.push(listener);
  }

  /** Stored versions, newest first (at most `limit`). */
  async history(limit = 50): Promise<LevelSetVersion[]> {
    const rows = await this.db.select().from(levelSets).orderBy(desc(levelSets.version)).limit(limit);
    return rows.map(versionOf);
  }

  /**
   * The versions in force over [fromMs, toMs), oldest first: the one in force at `fromMs`, then
   * each saved inside the window.
   */
  async versionsOver(fromMs: number, toMs: number): Promise<LevelSetVersion[]> {
    const at = levelSets.createdAt;
    const [before, inside] = await Promise.all([
      this.db.select().from(levelSets).where(lt(at, new Date(fromMs))).orderBy(desc(levelSets.version)).limit(1),
      this.db.select().from(levelSets).where(and(gte(at, new Date(fromMs)), lt(at, new Date(toMs)))).orderBy(asc(levelSets.version)),
    ]);
    return [...before, ...inside].map(versionOf);
  }

  /**
   * Runs `edit` once no other edit of the level set or of an alarm limit is running. The two
   * are checked against each other (no alarm limit beyond its trip level), so each edit's check
   * and write happen inside this, and the next edit checks against what the one before stored.
   */
  exclusive<T>(edit: () => Promise<T>): Promise<T> {
    const done = this.editing.then(edit);
    this.editing = done.catch(() => undefined);
    return done;
  }

  /**
   * Stores `levels` (already validated against the alarm limits, inside `exclusive`) as the
   * next version with its audit entry, in one transaction; then puts it in force and hands it
   * on. A failed write changes nothing.
   */
  async save(levels: LevelSet, actor: string, reason: string): Promise<LevelSetVersion> {
    const previous = this.current;
    const row = await this.db.transaction(async (tx) => {
      const [stored] = await tx.insert(levelSets).values({ version: previous.version + 1, body: levels, createdBy: actor, reason }).returning();
      await appendAudit(tx, { actor, action: 'levels.update', subject: `levels:${stored.version}`, oldValue: previous.levels, newValue: levels, reason });
      return stored;
    });
    this.current = versionOf(row);
    for (const listener of this.listeners) listener(this.current);
    return this.current;
  }
}
