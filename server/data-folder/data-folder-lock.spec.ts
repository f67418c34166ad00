import { spawnSync } from 'node:child_process';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { hostname } from 'node:os';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { makeEmptyDir, removeDataDir } from '../testing/test-server.js';
import { ConfigError } from '../config.js';
import { DataFolderLockedError, LOCK_FILE_NAME, dataFolderInUse, lockDataFolder } from './data-folder-lock.js';
import { processIdentity } from './process-identity.js';

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

  it('takes over a lock whose PID now belongs to another process (PID reuse, e.g. PID 1 in a restarted container)', () => {
    const file = path.join(dir, LOCK_FILE_NAME);
    writeFileSync(file, JSON.stringify({ pid: 1, host: hostname(), token: 'old', startedAt: 'earlier', identity: 'an-earlier-boot:42' }));
    lockDataFolder(dir).release();
    // The restarted container's server is itself PID 1: a lock naming its own PID from an earlier life is stale.
    writeFileSync(file, JSON.stringify({ pid: process.pid, host: hostname(), token: 'old', startedAt: 'earlier', identity: 'an-earlier-boot:42' }));
    lockDataFolder(dir).release();
    writeFileSync(file, JSON.stringify({ pid: process.pid, host: hostname(), token: 'old', startedAt: 'earlier' }));
    lockDataFolder(dir).release();
  });

  it('records the owner\'s identity so the same running process is still refused', () => {
    const first = lockDataFolder(dir);
    const content = JSON.parse(readFileSync(path.join(dir, LOCK_FILE_NAME), 'utf8'));
    expect(content.identity).toBe(processIdentity(process.pid));
    expect(dataFolderInUse(dir)).toMatch(/already in use by Tiltwatch process/);
    first.release();
    expect(dataFolderInUse(dir)).toBeNull();
  });

  it('names TILTWATCH_DATA_DIR when the data folder is a file', () => {
    const file = path.join(dir, 'plain-file');
    writeFileSync(file, 'x');
    expect(() => lockDataFolder(file)).toThrow(ConfigError);
    expect(() => lockDataFolder(file)).toThrow(/TILTWATCH_DATA_DIR=".*plain-file" is a file, not a folder/);
    expect(() => lockDataFolder(path.join(file, 'below'))).toThrow(/TILTWATCH_DATA_DIR=.* is not a folder/);
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
