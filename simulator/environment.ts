import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { z } from 'zod';
import { mqttProtocolLevel } from '../shared/telemetry/mqtt-protocol.js';
import type { SimulatorOptions } from './controller.js';

const flag = (name: string) =>
  z
    .enum(['1', '0', 'true', 'false', 'on', 'off', 'yes', 'no'], { error: `${name} must be on or off (also 1/0, true/false, yes/no)` })
    .transform((v) => ['1', 'true', 'on', 'yes'].includes(v));

const Environment = z.object({
  MQTT_URL: z
    .string()
    .default('mqtt://127.0.0.1:1883')
    .refine((v) => /^(mqtts?|wss?):\/\/[^/]+/.test(v), 'MQTT_URL must look like mqtt://host:port (or mqtts://, ws://, wss://)'),
  MQTT_USERNAME: z.string().min(1, 'MQTT_USERNAME must not be empty').optional(),
  MQTT_PASSWORD: z.string().min(1, 'MQTT_PASSWORD must not be empty').optional(),
  MQTT_PROTOCOL_VERSION: z
    .string()
    .optional()
    .refine((v) => mqttProtocolLevel(v) !== null, 'MQTT_PROTOCOL_VERSION must be 3.1.1 or 5')
    .transform((v) => mqttProtocolLevel(v) ?? 4),
  SIM_CONTROL_PORT: z
    .string()
    .default('4281')
    .refine((v) => /^\d+$/.test(v) && Number(v) <= 65535, 'SIM_CONTROL_PORT must be a port number 0…65535 (0 = any free port)')
    .transform(Number),
  SIM_DEMO: flag('SIM_DEMO').default(true),
  TILTWATCH_DATA_DIR: z.string().min(1, 'TILTWATCH_DATA_DIR must not be empty').default('./data'),
});

const CredentialsFile = z.object({
  controller: z.object({ username: z.string().min(1), password: z.string().min(1) }),
});

/**
 * Simulator options from environment variables (see README.md). Throws an Error that says what
 * to fix when a variable is malformed or the MQTT credentials cannot be found.
 */
export async function simulatorOptionsFromEnv(env: NodeJS.ProcessEnv): Promise<SimulatorOptions> {
  const parsed = Environment.safeParse(env);
  if (!parsed.success) {
    throw new Error(parsed.error.issues.map((i) => i.message).join('; '));
  }
  const e = parsed.data;
  if ((e.MQTT_USERNAME === undefined) !== (e.MQTT_PASSWORD === undefined)) {
    throw new Error('set both MQTT_USERNAME and MQTT_PASSWORD, or neither (then the controller account is read from the data folder)');
  }
  const account = e.MQTT_USERNAME !== undefined && e.MQTT_PASSWORD !== undefined
    ? { username: e.MQTT_USERNAME, password: e.MQTT_PASSWORD }
    : await controllerAccount(join(e.TILTWATCH_DATA_DIR, 'mqtt-credentials.json'));
  return { mqttUrl: e.MQTT_URL, ...account, protocolVersion: e.MQTT_PROTOCOL_VERSION, controlPort: e.SIM_CONTROL_PORT, demo: e.SIM_DEMO };
}

async function controllerAccount(path: string): Promise<{ username: string; password: string }> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (error) {
    throw new Error(
      `cannot read the MQTT credentials at ${path} (${(error as NodeJS.ErrnoException).code}); start the broker once ` +
        '(it writes them), point TILTWATCH_DATA_DIR at its data folder, or set MQTT_USERNAME and MQTT_PASSWORD',
    );
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch {
    throw new Error(`${path} is not valid JSON; let the broker regenerate it or set MQTT_USERNAME and MQTT_PASSWORD`);
  }
  const parsed = CredentialsFile.safeParse(json);
  if (!parsed.success) {
    throw new Error(`${path} has no controller account { "controller": { "username", "password" } }; set MQTT_USERNAME and MQTT_PASSWORD`);
  }
  return parsed.data.controller;
}
