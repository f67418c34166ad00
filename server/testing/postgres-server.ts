/**
 * A private PostgreSQL server for tests: Debian's PostgreSQL binaries (`/usr/lib/postgresql/N/bin`,
 * or `TILTWATCH_PG_BIN`), a cluster in a temporary folder, listening on 127.0.0.1 only, with
 * trust authentication for the `tiltwatch` role. PostgreSQL refuses to run as root: under root
 * the cluster belongs to the `postgres` system user (or `TILTWATCH_PG_USER`) and every command
 * runs through `runuser`.
 */
import { execFile } from 'node:child_process';
import { chownSync, existsSync, mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import pg from 'pg';

const run = promisify(execFile);

export interface PostgresServer {
  port: number;
  /** Connection string for `database` (default the maintenance database `postgres`). */
  url(database?: string): string;
  /** Creates an empty database with a fresh name and returns its connection string. */
  createDatabase(): Promise<string>;
  /** Stops the server (fast shutdown: open connections are ended, as in a restart). */
  stop(): Promise<void>;
  /** Starts it again on the same port and folder. */
  start(): Promise<void>;
  /** Stops the server and removes its folder. */
  close(): Promise<void>;
}

/** Folder of PostgreSQL's server binaries, or null when none is installed. */
export function postgresBinDir(): string | null {
  const configured = process.env.TILTWATCH_PG_BIN;
  if (configured) return existsSync(path.join(configured, 'pg_ctl')) ? configured : null;
  const root = '/usr/lib/postgresql';
  if (!existsSync(root)) return null;
  const versions = readdirSync(root).filter((v) => existsSync(path.join(root, v, 'bin', 'pg_ctl'))).sort((a, b) => Number(b) - Number(a));
  return versions[0] ? path.join(root, versions[0], 'bin') : null;
}

export async function startPostgres(): Promise<PostgresServer> {
  const bin = postgresBinDir();
  if (!bin) throw new Error('No PostgreSQL server binaries found (install Debian\'s postgresql, or set TILTWATCH_PG_BIN)');
  const asRoot = process.getuid?.() === 0;
  const user = process.env.TILTWATCH_PG_USER ?? 'postgres';
  const dir = mkdtempSync(path.join(tmpdir(), 'tiltwatch-pg-'));
  const dataDir = path.join(dir, 'data');
  if (asRoot) {
    const { stdout } = await run('id', ['-u', user]);
    const { stdout: gid } = await run('id', ['-g', user]);
    chownSync(dir, Number(stdout.trim()), Number(gid.trim()));
  }
  const pgRun = (tool: string, args: string[]) =>
    asRoot ? run('runuser', ['-u', user, '--', path.join(bin, tool), ...args]) : run(path.join(bin, tool), args);
  const port = await freePort();
  await pgRun('initdb', ['-D', dataDir, '-U', 'tiltwatch', '--auth=trust', '-E', 'UTF8', '--no-locale', '--no-sync']);
  const options = [`-p ${port}`, `-k ${dir}`, "-c listen_addresses='127.0.0.1'", '-c fsync=off', '-c full_page_writes=off', '-c max_connections=200'].join(' ');
  const start = async () => {
    await pgRun('pg_ctl', ['-D', dataDir, '-l', path.join(dir, 'server.log'), '-o', options, '-w', '-t', '60', 'start']);
  };
  const stop = async () => {
    await pgRun('pg_ctl', ['-D', dataDir, '-m', 'fast', '-w', '-t', '60', 'stop']);
  };
  await start();
  const url = (database = 'postgres') => `postgres://tiltwatch@127.0.0.1:${port}/${database}`;
  let databases = 0;
  return {
    port,
    url,
    async createDatabase() {
      const name = `tiltwatch_test_${process.pid}_${++databases}_${Math.random().toString(36).slice(2, 8)}`;
      await createDatabase(url(), name);
      return url(name);
    },
    stop,
    start,
    async close() {
      await stop().catch(() => {});
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** Creates an empty database `name` through the maintenance connection `adminUrl`. */
export async function createDatabase(adminUrl: string, name: string): Promise<void> {
  const client = new pg.Client({ connectionString: adminUrl });
  await client.connect();
  try {
    await client.query(`CREATE DATABASE "${name}"`);
  } finally {
    await client.end();
  }
}

/** A TCP port that was free a moment ago on 127.0.0.1. */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const address = server.address();
      const port = typeof address === 'object' && address ? address.port : 0;
      server.close(() => resolve(port));
    });
  });
}
