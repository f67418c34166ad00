/**
 * A private Eclipse Mosquitto 2 broker for tests, configured by the same generator as real
 * deployments (broker/mosquitto-config.ts): fresh random accounts, the embedded broker's access
 * list, one listener on 127.0.0.1. Found at `/usr/sbin/mosquitto` or `TILTWATCH_MOSQUITTO`.
 */
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { connect } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { randomBytes } from 'node:crypto';
import type { BrokerCredentials } from '../../broker/credentials.js';
import { writeMosquittoFiles } from '../../broker/mosquitto-config.js';
import { MQTT_USERS } from '../../shared/telemetry/topics.js';
import { freePort } from './postgres-server.js';

export interface MosquittoServer {
  url: string;
  credentials: BrokerCredentials;
  close(): Promise<void>;
}

/** Path of the mosquitto binary, or null when it is not installed. */
export function mosquittoBinary(): string | null {
  const candidate = process.env.TILTWATCH_MOSQUITTO ?? '/usr/sbin/mosquitto';
  return existsSync(candidate) ? candidate : null;
}

export async function startMosquitto(): Promise<MosquittoServer> {
  const binary = mosquittoBinary();
  if (!binary) throw new Error('mosquitto is not installed (apt-get install mosquitto, or set TILTWATCH_MOSQUITTO)');
  const dir = mkdtempSync(path.join(tmpdir(), 'tiltwatch-mosquitto-'));
  const credentials: BrokerCredentials = {
    controller: { username: MQTT_USERS.controller, password: randomBytes(18).toString('base64url') },
    server: { username: MQTT_USERS.server, password: randomBytes(18).toString('base64url') },
  };
  const port = await freePort();
  // Under root mosquitto would switch to its own user, which cannot read a private temp folder.
  const extra = process.getuid?.() === 0 ? ['user root'] : [];
  const files = await writeMosquittoFiles(dir, credentials, { port, host: '127.0.0.1', extra: [...extra, 'persistence false'] });
  const child = spawn(binary, ['-c', files.configFile], { stdio: ['ignore', 'ignore', 'pipe'] });
  let output = '';
  child.stderr.on('data', (chunk: Buffer) => (output += chunk.toString()));
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
  try {
    await waitForPort(port, () => child.exitCode !== null);
  } catch (error) {
    child.kill('SIGKILL');
    rmSync(dir, { recursive: true, force: true });
    throw new Error(`mosquitto did not start: ${(error as Error).message}\n${output}`);
  }
  return {
    url: `mqtt://127.0.0.1:${port}`,
    credentials,
    async close() {
      child.kill('SIGTERM');
      await exited;
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

async function waitForPort(port: number, gone: () => boolean): Promise<void> {
  const until = Date.now() + 10_000;
  for (;;) {
    if (gone()) throw new Error('the process exited');
    const open = await new Promise<boolean>((resolve) => {
      const socket = connect(port, '127.0.0.1');
      socket.once('connect', () => {
        socket.destroy();
        resolve(true);
      });
      socket.once('error', () => resolve(false));
    });
    if (open) return;
    if (Date.now() > until) throw new Error(`nothing listens on port ${port} after 10 s`);
    await new Promise((r) => setTimeout(r, 25));
  }
}
