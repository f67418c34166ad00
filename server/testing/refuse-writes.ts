import { sql } from 'drizzle-orm';
import type { Db } from '../db/database.js';

/**
 * Makes every insert and update of `table` fail inside the database itself (as a full disk or a
 * lost connection would) until `allow()`: a trigger, so the server's own code runs unchanged.
 */
export async function refuseWrites(db: Db, table: string): Promise<{ allow(): Promise<void> }> {
  const trigger = `test_refuse_${table}`;
  await db.execute(sql.raw(`CREATE OR REPLACE FUNCTION test_refuse_write() RETURNS trigger AS $$
    BEGIN RAISE EXCEPTION 'storage refused for the test'; END $$ LANGUAGE plpgsql`));
  await db.execute(sql.raw(`CREATE TRIGGER ${trigger} BEFORE INSERT OR UPDATE ON ${table} FOR EACH ROW EXECUTE FUNCTION test_refuse_write()`));
  return { allow: async () => void (await db.execute(sql.raw(`DROP TRIGGER ${trigger} ON ${table}`))) };
}
