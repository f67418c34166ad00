import { afterAll, beforeAll } from 'vitest';
import { openDatabase, type Db, type OpenDatabase } from '../db/database.js';
import { makeDataDir, removeDataDir } from './test-server.js';

/**
 * A migrated PGlite database in a fresh temporary data folder for the enclosing `describe`:
 * opened before its tests, closed and removed after them. Read `db` inside the tests.
 */
export function useTempDatabase(): { readonly db: Db; readonly database: OpenDatabase } {
  let dir: string;
  let database: OpenDatabase | undefined;
  beforeAll(async () => {
    dir = await makeDataDir();
    database = await openDatabase({ dataDir: dir, databaseUrl: null });
  });
  afterAll(async () => {
    await database?.close();
    removeDataDir(dir);
  });
  return {
    get db() {
      return database!.db;
    },
    get database() {
      return database!;
    },
  };
}
