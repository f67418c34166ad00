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

  it.each(['controller', 'server'] as MqttRole[])('lets the %s account publish and read exactly the topics the embedded broker allows (MQTT 5)', async (role) => {
    const connect = (who: MqttRole) => mqtt.connectAsync(broker.url, { ...broker.credentials[who], protocolVersion: 5, reconnectPeriod: 0 });
    const client = await connect(role);
    const publishers = { controller: await connect('controller'), server: await connect('server') };
    try {
      // Publishing: MQTT 5 answers a refused QoS 1 publish with "not authorized".
      for (const topic of ALL_TOPICS) {
        const published = await client.publishAsync(topic, 'probe', { qos: 1 }).then(
          () => true,
          () => false,
        );
        expect([topic, published]).toEqual([topic, mayPublish(role, topic)]);
      }
      // Reading: mosquitto grants every subscription but delivers only what the account may read.
      const received = new Set<string>();
      client.on('message', (topic, payload) => {
        if (payload.toString() === 'marker') received.add(topic);
      });
      await client.subscribeAsync(ALL_TOPICS, { qos: 1 });
      for (const topic of ALL_TOPICS) {
        const owner: MqttRole = mayPublish('controller', topic) ? 'controller' : 'server';
        await publishers[owner].publishAsync(topic, 'marker', { qos: 1 });
      }
      const readable = ALL_TOPICS.filter((topic) => maySubscribe(role, topic));
      await waitFor(() => (readable.every((t) => received.has(t)) ? true : undefined), 'the readable markers');
      await new Promise((r) => setTimeout(r, 300)); // room for a marker that should not come
      expect([...received].sort()).toEqual([...readable].sort());
    } finally {
      await client.endAsync();
      await publishers.controller.endAsync();
      await publishers.server.endAsync();
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
