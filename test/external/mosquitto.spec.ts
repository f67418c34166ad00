import mqtt from 'mqtt';
import { pino } from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mayPublish, maySubscribe, type MqttRole } from '../../broker/topic-access.js';
import { FrameGate } from '../../server/ingest/frame-gate.js';
import { startIngest } from '../../server/ingest/mqtt-ingest.js';
import { fastFrame } from '../../server/testing/frames.js';
import { startMosquitto, type MosquittoServer } from '../../server/testing/mosquitto-server.js';
import { connectController, makeDataDir, removeDataDir, startTestServer } from '../../server/testing/test-server.js';
import { TOPICS } from '../../shared/telemetry/topics.js';
import { waitFor } from '../support/stack.js';

/**
 * Mosquitto configured by `npm run mosquitto:config`'s generator enforces the embedded broker's
 * accounts and topic access list, over MQTT 5 and 3.1.1, and the server works with either.
 */
describe('mosquitto with the generated password file and access list', () => {
  let broker: MosquittoServer;
  beforeAll(async () => {
    broker = await startMosquitto();
  });
  afterAll(() => broker?.close());

  const ALL_TOPICS = Object.values(TOPICS);

  it.each(['controller', 'server'] as MqttRole[])('lets the %s account publish and subscribe exactly as the embedded broker does (MQTT 5 reason codes)', async (role) => {
    const client = await mqtt.connectAsync(broker.url, { ...broker.credentials[role], protocolVersion: 5, reconnectPeriod: 0 });
    try {
      for (const topic of ALL_TOPICS) {
        const published = await client.publishAsync(topic, '{}', { qos: 1 }).then(
          () => true,
          () => false,
        );
        expect([topic, published]).toEqual([topic, mayPublish(role, topic)]);
        const granted = await client.subscribeAsync(topic, { qos: 1 });
        expect([topic, granted[0]!.qos < 0x80]).toEqual([topic, maySubscribe(role, topic)]);
      }
    } finally {
      await client.endAsync();
    }
  });

  it('refuses a wrong password, and the server says which variables to check (MQTT 5 and 3.1.1)', async () => {
    for (const protocolVersion of [5, 4] as const) {
      await expect(
        startIngest({ url: broker.url, username: 'server', password: 'wrong', protocolVersion, gate: new FrameGate(), deliver: () => {}, log: pino({ level: 'silent' }) }),
      ).rejects.toThrow(/refused the server's credentials: check MQTT_USERNAME and MQTT_PASSWORD/);
    }
  });

  it('carries telemetry to a server speaking MQTT 3.1.1 as well', async () => {
    const dir = await makeDataDir();
    const server = await startTestServer(dir, undefined, { MQTT_PROTOCOL_VERSION: '3.1.1' });
    const controller = await connectController(server);
    try {
      for (let seq = 1; seq <= 5; seq++) await controller.publishAsync(TOPICS.fast, JSON.stringify(fastFrame(seq, Date.now())));
      await waitFor(() => (server.counters().frames.acceptedByKind.fast >= 5 ? true : undefined), 'frames over MQTT 3.1.1');
    } finally {
      await controller.endAsync();
      await server.close();
      removeDataDir(dir);
    }
  });
});
