import { randomUUID } from 'node:crypto';
import { mkdirSync, readFileSync, unlinkSync, writeFileSync } from 'node:fs';
import { hostname } from 'node:os';
import path from 'node:path';

/** Thrown when another live process owns the data folder. */
export class DataFolderLockedError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'DataFolderLockedError';
  }
}

interface LockContent {
  pid: number;
  host: string;
  token: string;
  startedAt: string;
}

export interface DataFolderLock {
  /** Removes the lock file if it is still ours. */
  release(): void;
}

export const LOCK_FILE_NAME = 'tiltwatch.lock';

/**
 * Makes this process the single owner of `dataDir` (PGlite does not lock its folder, and two
 * writers silently lose data). The lock is a file created exclusively (`wx`) holding the
 * owner's pid and host. A lock left by a dead process on this host is taken over; a live
 * owner — including this same process — or an owner on another host is refused with a
 * message saying what to do.
 */
export function lockDataFolder(dataDir: string): DataFolderLock {
  mkdirSync(dataDir, { recursive: true });
  const file = path.join(dataDir, LOCK_FILE_NAME);
  const mine: LockContent = { pid: process.pid, host: hostname(), token: randomUUID(), startedAt: new Date().toISOString() };

  for (let attempt = 0; attempt < 2; attempt++) {
    try {
      writeFileSync(file, JSON.stringify(mine), { flag: 'wx', mode: 0o600 });
      return {
        release() {
          if (readOwner(file)?.token === mine.token) unlinkSync(file);
        },
      };
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== 'EEXIST') throw error;
    }
    const owner = readOwner(file);
    if (owner && owner.host !== mine.host) {
      throw new DataFolderLockedError(
        `The data folder ${dataDir} is in use by process ${owner.pid} on host ${owner.host} (since ${owner.startedAt}). ` +
          `Stop that server, or, if it is gone, delete ${file}.`,
      );
    }
    if (owner && isAlive(owner.pid)) {
      throw new DataFolderLockedError(
        `The data folder ${dataDir} is already in use by Tiltwatch process ${owner.pid} (since ${owner.startedAt}). ` +
          `Stop that server first, or point TILTWATCH_DATA_DIR at another folder.`,
      );
    }
    // The owner is dead (or the file is unreadable half-written junk): take the folder over.
    unlinkSync(file);
  }
  throw new DataFolderLockedError(`Could not lock the data folder ${dataDir}: another process keeps taking ${file}.`);
}

function readOwner(file: string): LockContent | null {
  try {
    const content = JSON.parse(readFileSync(file, 'utf8')) as Partial<LockContent>;
    if (typeof content.pid !== 'number' || typeof content.host !== 'string' || typeof content.token !== 'string') return null;
    return content as LockContent;
  } catch {
    return null;
  }
}

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    // EPERM: the process exists but belongs to someone else.
    return (error as NodeJS.ErrnoException).code === 'EPERM';
  }
}
