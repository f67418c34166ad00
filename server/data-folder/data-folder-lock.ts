import { randomUUID } from 'node:crypto';
import { mkdirSync, readFileSync, statSync, unlinkSync, writeFileSync } from 'node:fs';
import { hostname } from 'node:os';
import path from 'node:path';
import { ConfigError } from '../config.js';
import { isAlive, processIdentity } from './process-identity.js';

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
  /** Boot id and start time of the owner (see process-identity.ts); absent in older lock files. */
  identity?: string | null;
}

export interface DataFolderLock {
  /** Removes the lock file if it is still ours. */
  release(): void;
}

export const LOCK_FILE_NAME = 'tiltwatch.lock';

/**
 * Makes this process the single owner of `dataDir` (PGlite does not lock its folder, and two
 * writers silently lose data). The lock is a file created exclusively (`wx`) holding the
 * owner's pid, host and process identity (boot id and start time, so a PID reused by another
 * process — PID 1 in a restarted container — is not mistaken for the owner). A lock left by a
 * process that is gone is taken over; a running owner — including this same process — or an
 * owner on another host is refused with a message saying what to do.
 */
export function lockDataFolder(dataDir: string): DataFolderLock {
  ensureFolder(dataDir);
  const file = path.join(dataDir, LOCK_FILE_NAME);
  const mine: LockContent = {
    pid: process.pid,
    host: hostname(),
    token: randomUUID(),
    startedAt: new Date().toISOString(),
    identity: processIdentity(process.pid),
  };

  for (let attempt = 0; attempt < 2; attempt++) {
    try {
      writeFileSync(file, JSON.stringify(mine), { flag: 'wx', mode: 0o600 });
      return {
        release() {
          if (readOwner(file)?.token === mine.token) unlinkSync(file);
        },
      };
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== 'EEXIST') throw folderProblem(dataDir, error as NodeJS.ErrnoException);
    }
    const problem = dataFolderInUse(dataDir);
    if (problem) throw new DataFolderLockedError(problem);
    // The owner is gone (or the file is unreadable half-written junk): take the folder over.
    unlinkSync(file);
  }
  throw new DataFolderLockedError(`Could not lock the data folder ${dataDir}: another process keeps taking ${file}.`);
}

/**
 * Why `dataDir` cannot be taken now (a running owner here or an owner on another host), or
 * null when it is free or its lock is stale. Takes nothing: the pre-start check uses it.
 */
export function dataFolderInUse(dataDir: string): string | null {
  const file = path.join(dataDir, LOCK_FILE_NAME);
  const owner = readOwner(file);
  if (!owner) return null;
  if (owner.host !== hostname()) {
    return (
      `The data folder ${dataDir} is in use by process ${owner.pid} on host ${owner.host} (since ${owner.startedAt}). ` +
      `Stop that server, or, if it is gone, delete ${file}.`
    );
  }
  if (ownerRuns(owner)) {
    return (
      `The data folder ${dataDir} is already in use by Tiltwatch process ${owner.pid} (since ${owner.startedAt}). ` +
      `Stop that server first, or point TILTWATCH_DATA_DIR at another folder.`
    );
  }
  return null;
}

/** Creates the folder if needed; a path that is not a usable folder is a configuration error. */
function ensureFolder(dataDir: string): void {
  try {
    mkdirSync(dataDir, { recursive: true });
    if (!statSync(dataDir).isDirectory()) throw Object.assign(new Error('not a folder'), { code: 'ENOTDIR' });
  } catch (error) {
    throw folderProblem(dataDir, error as NodeJS.ErrnoException);
  }
}

function folderProblem(dataDir: string, error: NodeJS.ErrnoException): Error {
  const why: Record<string, string> = {
    EEXIST: 'is a file, not a folder',
    ENOTDIR: 'is not a folder (it or a parent is a file)',
    EACCES: 'cannot be written by this user',
    EPERM: 'cannot be written by this user',
    EROFS: 'is on a read-only file system',
  };
  const reason = error.code ? why[error.code] : undefined;
  if (!reason) return error;
  return new ConfigError([`TILTWATCH_DATA_DIR=${JSON.stringify(dataDir)} ${reason}; point TILTWATCH_DATA_DIR at a folder this user may write`]);
}

/** Whether the lock's owner still runs: the PID exists and, where it can be told, is the same process. */
function ownerRuns(owner: LockContent): boolean {
  if (!isAlive(owner.pid)) return false;
  const now = processIdentity(owner.pid);
  if (owner.identity && now) return now === owner.identity;
  // An older lock without identity: a PID that is our own cannot be an earlier owner still running.
  if (!owner.identity && now && owner.pid === process.pid) return false;
  return true;
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
