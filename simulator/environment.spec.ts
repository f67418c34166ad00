import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { simulatorOptionsFromEnv } from './environment.js';

let dataDir: string;
beforeAll(async () => {
  dataDir = await mkdtemp(join(tmpdir(), 'tiltwatch-sim-env-'));
  await writeFile(
    join(dataDir, 'mqtt-credentials.json'),
    JSON.stringify({ controller: { username: 'controller', password: 'secret-controller-pw' }, server: { username: 'server', password: 'x' } }),
  );
});
afterAll(() => rm(dataDir, { recursive: true, force: true }));

describe('simulator environment', () => {
  it('reads the controller account from the data folder and applies the defaults', async () => {
    expect(await simulatorOptionsFromEnv({ TILTWATCH_DATA_DIR: dataDir })).toEqual({
      mqttUrl: 'mqtt://127.0.0.1:1883',
      username: 'controller',
      password: 'secret-controller-pw',
      protocolVersion: 4,
      controlPort: 4281,
      demo: true,
    });
  });

  it('speaks MQTT 5 when MQTT_PROTOCOL_VERSION says so, and refuses other versions', async () => {
    expect(await simulatorOptionsFromEnv({ TILTWATCH_DATA_DIR: dataDir, MQTT_PROTOCOL_VERSION: '5' })).toMatchObject({ protocolVersion: 5 });
    await expect(simulatorOptionsFromEnv({ TILTWATCH_DATA_DIR: dataDir, MQTT_PROTOCOL_VERSION: '3' })).rejects.toThrow(/MQTT_PROTOCOL_VERSION must be 3\.1\.1 or 5/);
  });

  it('takes explicit credentials, port and demo switch', async () => {
    const opts = await simulatorOptionsFromEnv({
      MQTT_URL: 'mqtt://broker.example:1884',
      MQTT_USERNAME: 'u',
      MQTT_PASSWORD: 'p',
      SIM_CONTROL_PORT: '0',
      SIM_DEMO: 'off',
      TILTWATCH_DATA_DIR: '/nonexistent',
    });
    expect(opts).toMatchObject({ mqttUrl: 'mqtt://broker.example:1884', username: 'u', controlPort: 0, demo: false });
  });

  it.each([
    [{ SIM_CONTROL_PORT: '70000' }, /SIM_CONTROL_PORT must be a port number/],
    [{ SIM_CONTROL_PORT: 'abc' }, /SIM_CONTROL_PORT must be a port number/],
    [{ SIM_DEMO: 'maybe' }, /SIM_DEMO must be on or off/],
    [{ MQTT_URL: 'localhost:1883' }, /MQTT_URL must look like mqtt:\/\/host:port/],
    [{ MQTT_USERNAME: 'u' }, /set both MQTT_USERNAME and MQTT_PASSWORD/],
  ])('says what to fix for %j', async (env, message) => {
    await expect(simulatorOptionsFromEnv({ TILTWATCH_DATA_DIR: dataDir, ...env })).rejects.toThrow(message);
  });

  it('says where the credentials were expected when the data folder has none', async () => {
    await expect(simulatorOptionsFromEnv({ TILTWATCH_DATA_DIR: join(dataDir, 'missing') })).rejects.toThrow(
      /cannot read the MQTT credentials at .*mqtt-credentials\.json.*set MQTT_USERNAME and MQTT_PASSWORD/,
    );
  });
});
