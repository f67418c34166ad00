import { connect as mqttConnect, type IClientOptions, type MqttClient } from 'mqtt';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest';
import { CONTROLLER_TOPICS, SERVER_TOPICS, TOPICS } from '../shared/telemetry/topics.js';
import { startBroker, type RunningBroker } from './broker.js';
import { loadOrCreateCredentials, type BrokerCredentials, type MqttAccount } from './credentials.js';

describe('startBroker', () => {
  let dataDir: string;
  let credentials: BrokerCredentials;
  let broker: RunningBroker;
  const clients: MqttClient[] = [];

  beforeAll(async () => {
    dataDir = await mkdtemp(join(tmpdir(), 'tiltwatch-broker-'));
    credentials = await loadOrCreateCredentials(dataDir);
  });
  beforeEach(async () => {
    broker = await startBroker({ port: 0, credentials });
  });
  afterEach(async () => {
    await Promise.all(clients.splice(0).map((client) => client.endAsync(true)));
    await broker.close();
  });
  afterAll(async () => {
    await rm(dataDir, { recursive: true, force: true });
  });

  /** Opens an MQTT 3.1.1 client that never reconnects; the suite closes it afterwards. */
  function open(account: MqttAccount | undefined, options: IClientOptions = {}): MqttClient {
    const client = mqttConnect(broker.url, {
      protocolVersion: 4,
      reconnectPeriod: 0,
      username: account?.username,
      password: account?.password,
      ...options,
    });
    clients.push(client);
    return client;
  }

  async function connect(account: MqttAccount, options: IClientOptions = {}): Promise<MqttClient> {
    const client = open(account, options);
    await when(client, 'connect');
    return client;
  }

  /** Resolves on the client's first `event`, rejects with its first error (e.g. a refused CONNACK). */
  function when(client: MqttClient, event: 'connect' | 'close'): Promise<void> {
    return new Promise((resolve, reject) => {
      client.once(event, () => resolve());
      client.once('error', reject);
    });
  }

  /** Records every message the client receives, as text. */
  function inbox(client: MqttClient): { topic: string; text: string }[] {
    const received: { topic: string; text: string }[] = [];
    client.on('message', (topic, payload) => received.push({ topic, text: payload.toString() }));
    return received;
  }

  /**
   * Resolves when `text` arrives on `topic`. Each sender's messages reach a subscriber in the
   * order the broker handled them, so waiting for a message sent after a refused one proves the
   * refused one was never delivered.
   */
  function arrival(client: MqttClient, topic: string, text: string): Promise<void> {
    return new Promise((resolve) => {
      client.on('message', (t, payload) => {
        if (t === topic && payload.toString() === text) resolve();
      });
    });
  }

  /** Waits until the broker has refused `count` publishes; fails fast when it never does. */
  async function refusals(count: number): Promise<void> {
    await vi.waitFor(() => expect(broker.counters().refusedPublishes).toBe(count), { timeout: 5_000 });
  }

  it('listens on the port it reports and names it in its URL', () => {
    expect(broker.port).toBeGreaterThan(0);
    expect(broker.url).toBe(`mqtt://127.0.0.1:${broker.port}`);
  });

  it.each([
    ['without credentials', () => undefined],
    ['with a wrong password', () => ({ username: credentials.controller.username, password: 'not-the-password' })],
    ["with one account's password for the other", () => ({ ...credentials.server, password: credentials.controller.password })],
  ])('refuses a client %s and counts the refusal', async (_case, account: () => MqttAccount | undefined) => {
    await expect(when(open(account()), 'connect')).rejects.toMatchObject({ code: 4 });
    expect(broker.counters()).toMatchObject({ clients: 0, refusedLogins: 1 });
  });

  it('counts connected clients as they come and go', async () => {
    const controller = await connect(credentials.controller);
    await connect(credentials.server);
    expect(broker.counters().clients).toBe(2);

    await controller.endAsync();
    await vi.waitFor(() => expect(broker.counters().clients).toBe(1));
  });

  it.each([
    ['controller', 'server', CONTROLLER_TOPICS],
    ['server', 'controller', SERVER_TOPICS],
  ] as const)('delivers every topic the %s may publish to the %s', async (sender, receiver, topics) => {
    const subscriber = await connect(credentials[receiver]);
    await subscriber.subscribeAsync([...topics]);
    const received = inbox(subscriber);
    const publisher = await connect(credentials[sender]);

    const last = arrival(subscriber, topics[2], topics[2]);
    for (const topic of topics) await publisher.publishAsync(topic, topic);
    await last;

    expect(received).toEqual(topics.map((topic) => ({ topic, text: topic })));
  });

  it.each([
    ...SERVER_TOPICS.map((topic) => ['controller', topic, 'server'] as const),
    ...CONTROLLER_TOPICS.map((topic) => ['server', topic, 'controller'] as const),
  ])('disconnects the %s when it publishes to %s and drops the message', async (role, topic, owner) => {
    const listener = await connect(credentials[role], { clientId: `${role}-listener` });
    await listener.subscribeAsync(topic);
    const received = inbox(listener);
    const forger = await connect(credentials[role], { clientId: `${role}-forger` });
    const rightful = await connect(credentials[owner]);

    const forgerClosed = when(forger, 'close');
    forger.publish(topic, 'forged');
    await refusals(1);
    await forgerClosed;
    const genuine = arrival(listener, topic, 'genuine');
    await rightful.publishAsync(topic, 'genuine');
    await genuine;

    expect(received.map((m) => m.text)).toEqual(['genuine']);
  });

  it.each([
    ['server', '#'],
    ['server', 'tiltwatch/v1/controller/#'],
    ['server', 'tiltwatch/v1/controller/telemetry/+'],
    ['server', TOPICS.setpoints],
    ['controller', TOPICS.fast],
    ['controller', 'tiltwatch/v1/controller/cmd/#'],
  ] as const)('answers a %s subscription to %s with a failure code and keeps it connected', async (role, filter) => {
    const client = await connect(credentials[role]);

    await expect(client.subscribeAsync(filter)).rejects.toMatchObject({ packet: { granted: [0x80] } });
    expect(client.connected).toBe(true);
    expect(broker.counters().refusedSubscribes).toBe(1);
  });

  it('delivers the controller’s last will on the status topic when its connection drops', async () => {
    const server = await connect(credentials.server);
    await server.subscribeAsync(TOPICS.status);
    const controller = await connect(credentials.controller, {
      will: { topic: TOPICS.status, payload: Buffer.from('{"online":false}'), qos: 1, retain: true },
    });

    const will = arrival(server, TOPICS.status, '{"online":false}');
    controller.stream.destroy();
    await will;
  });

  it('drops a last will the server account leaves on the status topic', async () => {
    const listener = await connect(credentials.server, { clientId: 'server-listener' });
    await listener.subscribeAsync(TOPICS.status);
    const received = inbox(listener);
    const forger = await connect(credentials.server, {
      clientId: 'server-forger',
      will: { topic: TOPICS.status, payload: Buffer.from('forged'), qos: 0, retain: false },
    });
    const controller = await connect(credentials.controller);

    forger.stream.destroy();
    await refusals(1);
    const genuine = arrival(listener, TOPICS.status, 'genuine');
    await controller.publishAsync(TOPICS.status, 'genuine');
    await genuine;

    expect(received.map((m) => m.text)).toEqual(['genuine']);
  });

  it('closes connected clients when the broker closes', async () => {
    const controller = await connect(credentials.controller);
    const closed = when(controller, 'close');

    await broker.close();
    await closed;

    expect(controller.connected).toBe(false);
  });
});
