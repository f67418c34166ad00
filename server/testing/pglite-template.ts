import { createHash } from 'node:crypto';
import { cpSync, existsSync, mkdtempSync, readdirSync, readFileSync, renameSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { migrationsFolder, openDatabase } from '../db/database.js';
import { projectRoot } from '../project-root.js';

/**
 * A PGlite cluster with every migration applied, built once per schema and shared by test
 * processes through the temporary folder. Creating a cluster (initdb in WebAssembly) takes
 * seconds; copying a finished one takes milliseconds, and the copy is an ordinary PGlite
 * folder. The folder name carries a hash of the migrations and the PGlite version, so a
 * schema change builds a new template.
 */
async function template(): Promise<string> {
  const hash = createHash('sha256');
  const pglite = JSON.parse(readFileSync(path.join(projectRoot(), 'node_modules/@electric-sql/pglite/package.json'), 'utf8')) as { version: string };
  hash.update(pglite.version);
  for (const file of readdirSync(migrationsFolder(), { recursive: true }).map(String).sort()) {
    const full = path.join(migrationsFolder(), file);
    if (file.endsWith('.sql') || file.endsWith('.json')) hash.update(file).update(readFileSync(full));
  }
  const dir = path.join(tmpdir(), `tiltwatch-pglite-template-${hash.digest('hex').slice(0, 16)}`);
  if (existsSync(dir)) return dir;
  const building = mkdtempSync(path.join(tmpdir(), 'tiltwatch-pglite-building-'));
  const database = await openDatabase({ dataDir: building, databaseUrl: null });
  await database.close();
  try {
    renameSync(path.join(building, 'pglite'), dir);
  } catch (error) {
    // Another test process finished first; its template is as good as ours.
    if (!existsSync(dir)) throw error;
  }
  rmSync(building, { recursive: true, force: true });
  return dir;
}

let shared: Promise<string> | null = null;

/** Copies the migrated template cluster to `${dataDir}/pglite` and, for the storage worker, to `${dataDir}/telemetry`. */
export async function seedPglite(dataDir: string): Promise<void> {
  shared ??= template();
  const source = await shared;
  for (const folder of ['pglite', 'telemetry']) cpSync(source, path.join(dataDir, folder), { recursive: true });
}
