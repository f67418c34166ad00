import { randomBytes } from 'node:crypto';
import { link, mkdir, readFile, unlink, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { z } from 'zod';
import { MQTT_USERS } from '../shared/telemetry/topics.js';

/** One MQTT login. */
export interface MqttAccount {
  username: string;
  password: string;
}

/** The two logins the broker admits: the coil controller and the Tiltwatch server. */
export interface BrokerCredentials {
  controller: MqttAccount;
  server: MqttAccount;
}

const CREDENTIALS_FILE = 'mqtt-credentials.json';

/** 24 random bytes = 192 bits of secret per password, far beyond any online guessing. */
const PASSWORD_BYTES = 24;

const accountSchema = z.object({ username: z.string().min(1), password: z.string().min(16) });
const credentialsSchema = z.object({ controller: accountSchema, server: accountSchema });

/** Path of the credentials file inside a data folder. */
export function credentialsFile(dataDir: string): string {
  return join(dataDir, CREDENTIALS_FILE);
}

/**
 * Returns the broker's MQTT credentials from `${dataDir}/mqtt-credentials.json`, generating
 * random passwords and writing the file (mode 0600) on first start.
 *
 * The file is written under a temporary name and then hard-linked into place, so a reader never
 * sees a half-written file and two processes starting at once agree on one set of credentials:
 * the loser of the race finds the link taken and reads the winner's file.
 */
export async function loadOrCreateCredentials(dataDir: string): Promise<BrokerCredentials> {
  const path = credentialsFile(dataDir);
  const existing = await readCredentials(path);
  if (existing) return existing;

  await mkdir(dataDir, { recursive: true });
  const fresh: BrokerCredentials = {
    controller: { username: MQTT_USERS.controller, password: newPassword() },
    server: { username: MQTT_USERS.server, password: newPassword() },
  };
  const temporary = `${path}.${process.pid}.${randomBytes(4).toString('hex')}.tmp`;
  await writeFile(temporary, JSON.stringify(fresh, null, 2) + '\n', { mode: 0o600, flag: 'wx' });
  try {
    await link(temporary, path);
    return fresh;
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code !== 'EEXIST') throw error;
    const winner = await readCredentials(path);
    if (!winner) throw new Error(`${path} vanished while it was being created; start again`);
    return winner;
  } finally {
    await unlink(temporary);
  }
}

/** Reads and validates the file; `undefined` when it does not exist yet. */
async function readCredentials(path: string): Promise<BrokerCredentials | undefined> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'ENOENT') return undefined;
    throw error;
  }
  const fix = 'delete it to generate new MQTT credentials (then restart every MQTT client)';
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch {
    throw new Error(`${path} is not valid JSON; ${fix}`);
  }
  const parsed = credentialsSchema.safeParse(json);
  if (!parsed.success) {
    throw new Error(`${path} is malformed (${z.prettifyError(parsed.error)}); ${fix}`);
  }
  const { controller, server } = parsed.data;
  if (controller.username !== MQTT_USERS.controller || server.username !== MQTT_USERS.server) {
    throw new Error(
      `${path} must name the users '${MQTT_USERS.controller}' and '${MQTT_USERS.server}'; ${fix}`,
    );
  }
  return parsed.data;
}

function newPassword(): string {
  return randomBytes(PASSWORD_BYTES).toString('base64url');
}
