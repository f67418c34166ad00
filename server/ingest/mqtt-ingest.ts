import { randomUUID } from 'node:crypto';
import mqtt from 'mqtt';
import type { Logger } from 'pino';
import { isCredentialsRefusal, type MqttProtocolLevel } from '../../shared/telemetry/mqtt-protocol.js';
import { TOPICS } from '../../shared/telemetry/topics.js';
import type { AdmittedMessage, FrameGate } from './frame-gate.js';

export interface IngestOptions {
  url: string;
  username: string | null;
  password: string | null;
  /** MQTT protocol level: 4 (3.1.1, the default; the embedded broker) or 5. */
  protocolVersion?: MqttProtocolLevel;
  gate: FrameGate;
  /** Receives every admitted message, synchronously, in arrival order. */
  deliver: (message: AdmittedMessage) => void;
  log: Logger;
  /** How long to wait for the first connection, ms. */
  connectTimeoutMs?: number;
}

export interface RunningIngest {
  connected(): boolean;
  /** Exceptions thrown by `deliver` (each logged; the message is dropped, ingest goes on). */
  deliveryErrors(): number;
  /** Server time of the newest delivery error, epoch ms; null before the first. */
  lastDeliveryErrorAtMs(): number | null;
  /**
   * Publishes a command (trip, release, setpoints) with the server account. Returns at once:
   * the client writes it now when connected, or queues it until it reconnects.
   */
  publish(topic: string, payload: string, qos: 0 | 1): void;
  close(): Promise<void>;
}

/**
 * The server's MQTT subscription to the controller's telemetry and status (MQTT 3.1.1, or 5
 * with an external broker that speaks it; the server account). Every message goes through the frame gate before anything else sees it.
 * Resolves once subscribed; after a lost connection the client keeps reconnecting.
 */
export async function startIngest(opts: IngestOptions): Promise<RunningIngest> {
  const client = mqtt.connect(opts.url, {
    protocolVersion: opts.protocolVersion ?? 4,
    clientId: `tiltwatch-server-${randomUUID().slice(0, 8)}`,
    username: opts.username ?? undefined,
    password: opts.password ?? undefined,
    clean: true,
    reconnectPeriod: 1000,
    connectTimeout: 5000,
  });
  let deliveryErrors = 0;
  let lastDeliveryErrorAtMs: number | null = null;
  // Commands (a trip above all) must leave at once, not wait behind Nagle's algorithm for the
  // acknowledgement of the previous segment (tens of milliseconds on loopback).
  client.on('connect', () => (client.stream as { setNoDelay?: (noDelay: boolean) => void }).setNoDelay?.(true));

  client.on('message', (topic, payload) => {
    const message = opts.gate.admit(topic, payload);
    if (!message) return;
    try {
      opts.deliver(message);
    } catch (error) {
      deliveryErrors++;
      lastDeliveryErrorAtMs = Date.now();
      opts.log.error({ err: error, topic }, 'telemetry pipeline failed on an admitted message');
    }
  });

  try {
    await firstConnection(client, opts.url, opts.connectTimeoutMs ?? 10_000);
    await client.subscribeAsync({ [TOPICS.fast]: { qos: 0 }, [TOPICS.slow]: { qos: 0 }, [TOPICS.status]: { qos: 1 } });
  } catch (error) {
    await client.endAsync(true);
    throw error;
  }
  opts.log.info({ url: opts.url }, 'subscribed to controller telemetry');
  client.on('offline', () => opts.log.warn({ url: opts.url }, 'MQTT connection lost; reconnecting'));
  client.on('error', (error) => opts.log.warn({ err: error }, 'MQTT client error'));

  return {
    connected: () => client.connected,
    deliveryErrors: () => deliveryErrors,
    lastDeliveryErrorAtMs: () => lastDeliveryErrorAtMs,
    publish: (topic, payload, qos) => {
      client.publish(topic, payload, { qos }, (error) => {
        if (error) opts.log.error({ err: error, topic }, 'publishing a command failed');
      });
    },
    close: () => client.endAsync(true),
  };
}

function firstConnection(client: mqtt.MqttClient, url: string, timeoutMs: number): Promise<void> {
  return new Promise((resolve, reject) => {
    let lastError: string | null = null;
    const timer = setTimeout(() => {
      finish();
      const why = lastError ? ` (${lastError})` : '';
      reject(new Error(`Cannot reach the MQTT broker at ${url} within ${timeoutMs / 1000} s${why}: check MQTT_URL and that the broker runs`));
    }, timeoutMs);
    const onConnect = () => {
      finish();
      resolve();
    };
    const onError = (error: Error & { code?: number }) => {
      lastError = error.message;
      // Bad user name or password / not authorised (either protocol version): retrying will not help.
      if (isCredentialsRefusal(error.code)) {
        finish();
        reject(new Error(`The MQTT broker at ${url} refused the server's credentials: check MQTT_USERNAME and MQTT_PASSWORD`));
      }
    };
    const finish = () => {
      clearTimeout(timer);
      client.off('connect', onConnect);
      client.off('error', onError);
    };
    client.on('connect', onConnect);
    client.on('error', onError);
  });
}
