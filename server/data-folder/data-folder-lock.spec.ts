import { spawnSync } from 'node:child_process';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { hostname } from 'node:os';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { makeEmptyDir, removeDataDir } from '../testing/test-server.js';
import { DataFolderLockedError, LOCK_FILE_NAME, lockDataFolder } from './data-folder-lock.js';

describe('lockDataFolder', () => {
  let dir: string;
  beforeEach(() => {
    dir = makeEmptyDir();
  });
  afterEach(() => removeDataDir(dir));

  it('refuses a second owner while the first holds the folder, and admits one after release', () => {
    const first = lockDataFolder(dir);
    expect(() => lockDataFolder(dir)).toThrow(DataFolderLockedError);
    expect(() => lockDataFolder(dir)).toThrow(/already in use by Tiltwatch process \d+.*TILTWATCH_DATA_DIR/);
    first.release();
    expect(existsSync(path.join(dir, LOCK_FILE_NAME))).toBe(false);
    lockDataFolder(dir).release();
  });

  it('takes over a lock left by a process that no longer exists', () => {
    const dead = spawnSync(process.execPath, ['-e', '0']).pid;
    writeFileSync(path.join(dir, LOCK_FILE_NAME), JSON.stringify({ pid: dead, host: hostname(), token: 'old', startedAt: 'earlier' }));
    const lock = lockDataFolder(dir);
    expect(JSON.parse(readFileSync(path.join(dir, LOCK_FILE_NAME), 'utf8')).pid).toBe(process.pid);
    lock.release();
  });

  it('refuses a lock held from another host and says how to clear it', () => {
    writeFileSync(path.join(dir, LOCK_FILE_NAME), JSON.stringify({ pid: 1, host: 'other-host.example', token: 't', startedAt: 'earlier' }));
    expect(() => lockDataFolder(dir)).toThrow(/on host other-host\.example.*delete .*tiltwatch\.lock/);
  });

  it('takes over an unreadable lock file', () => {
    writeFileSync(path.join(dir, LOCK_FILE_NAME), '{half');
    lockDataFolder(dir).release();
  });
});
