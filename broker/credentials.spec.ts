import { mkdtemp, readdir, rm, stat, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { MQTT_USERS } from '../shared/telemetry/topics.js';
import { credentialsFile, loadOrCreateCredentials } from './credentials.js';

describe('loadOrCreateCredentials', () => {
  let dataDir: string;

  beforeEach(async () => {
    dataDir = await mkdtemp(join(tmpdir(), 'tiltwatch-credentials-'));
  });
  afterEach(async () => {
    await rm(dataDir, { recursive: true, force: true });
  });

  it('creates random passwords for the controller and server accounts on first start', async () => {
    const credentials = await loadOrCreateCredentials(dataDir);

    expect(credentials.controller.username).toBe(MQTT_USERS.controller);
    expect(credentials.server.username).toBe(MQTT_USERS.server);
    expect(credentials.controller.password).toMatch(/^[A-Za-z0-9_-]{32}$/);
    expect(credentials.server.password).not.toBe(credentials.controller.password);
  });

  it('keeps the credentials file readable by its owner only', async () => {
    await loadOrCreateCredentials(dataDir);

    const { mode } = await stat(credentialsFile(dataDir));
    expect(mode & 0o777).toBe(0o600);
  });

  it('reuses the stored credentials on later starts', async () => {
    const first = await loadOrCreateCredentials(dataDir);
    const second = await loadOrCreateCredentials(dataDir);

    expect(second).toEqual(first);
  });

  it('creates the data folder when it does not exist yet', async () => {
    const nested = join(dataDir, 'not', 'there');

    await loadOrCreateCredentials(nested);

    expect(await readdir(nested)).toEqual(['mqtt-credentials.json']);
  });

  it('agrees on one set of credentials when two starts race', async () => {
    const [a, b] = await Promise.all([loadOrCreateCredentials(dataDir), loadOrCreateCredentials(dataDir)]);

    expect(a).toEqual(b);
    expect(await readdir(dataDir)).toEqual(['mqtt-credentials.json']);
  });

  it('refuses a damaged credentials file and says how to recover', async () => {
    await writeFile(credentialsFile(dataDir), '{"controller":');

    await expect(loadOrCreateCredentials(dataDir)).rejects.toThrow(/not valid JSON; delete it/);
  });

  it('refuses a credentials file that lacks an account', async () => {
    await writeFile(credentialsFile(dataDir), JSON.stringify({ controller: { username: 'controller', password: 'x'.repeat(32) } }));

    await expect(loadOrCreateCredentials(dataDir)).rejects.toThrow(/malformed .*server/s);
  });
});
