/**
 * Software-interlock benchmark with real parts (server, embedded broker, PGlite): a scripted
 * controller on the controller account publishes telemetry at the demo rate.
 *  - Trip latency: from handing one over-current frame to the MQTT client until the
 *    TripCommand arrives at the controller's subscription, over many trips (each reset through
 *    the API before the next).
 *  - Silent controller: from the last fast frame sent until the TripCommand arrives, against
 *    the configured stale limit.
 */
import mqtt from 'mqtt';
import { TOPICS } from '../../shared/telemetry/topics.js';
import { startControllerFeed } from '../../server/testing/controller-feed.js';
import { signIn, startStack, waitFor } from '../support/stack.js';
import { quantile, type Figure } from './figures.js';

const TRIPS = 100;
const SILENCES = 5;
const TARGET_P99_MS = 20;
const STALE_LIMIT_MS = 250;
/** Over the 20 A trip level and inside the current converter's ±25 A range (a frame beyond it is refused at the edge). */
const SPIKE_A = 24;

export async function benchTrip(): Promise<Figure[]> {
  const stack = await startStack({ simulator: false, env: { LOG_LEVEL: 'error', TILTWATCH_STALE_TRIP_MS: String(STALE_LIMIT_MS) } });
  const client = await mqtt.connectAsync(stack.server.mqttUrl, { ...stack.server.brokerCredentials!.controller, protocolVersion: 4, clientId: 'bench-trip-controller' });
  // A controller sends each frame at once (TCP_NODELAY): with Nagle's algorithm a frame would
  // wait for the acknowledgement of the previous one, tens of milliseconds on loopback.
  (client.stream as { setNoDelay?: (noDelay: boolean) => void }).setNoDelay?.(true);
  const feed = await startControllerFeed(client);
  const token = await signIn(stack.server.url, 'operator');
  let onTrip: ((at: number) => void) | null = null;
  client.on('message', (topic) => {
    if (topic === TOPICS.trip) onTrip?.(performance.now());
  });
  // A trip that never comes fails the bench instead of hanging it.
  const nextTrip = (what: string) =>
    new Promise<number>((resolve, reject) => {
      const timer = setTimeout(() => reject(new Error(`no TripCommand within 5 s after ${what}`)), 5000);
      onTrip = (at) => {
        clearTimeout(timer);
        resolve(at);
      };
    });
  const reset = async () => {
    await waitFor(async () => {
      const res = await fetch(`${stack.server.url}/api/interlock/reset`, {
        method: 'POST',
        headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' },
        body: JSON.stringify({ reason: 'benchmark: injected trip' }),
      });
      await res.arrayBuffer();
      return res.status === 200 ? true : undefined;
    }, 'the interlock reset');
  };
  try {
    // Let the first telemetry arm the interlock.
    await new Promise((r) => setTimeout(r, 500));
    const latencies: number[] = [];
    for (let i = 0; i < TRIPS; i++) {
      // A random offset from the frame timer, so the spike lands anywhere between two frames.
      await new Promise((r) => setTimeout(r, 50 + Math.random() * 50));
      const arrived = nextTrip(`an over-current frame (${SPIKE_A} A)`);
      const sentAt = feed.spike('x', SPIKE_A);
      latencies.push((await arrived) - sentAt);
      await reset();
    }

    const detections: number[] = [];
    for (let i = 0; i < SILENCES; i++) {
      await new Promise((r) => setTimeout(r, 200 + Math.random() * 100));
      const arrived = nextTrip('the controller fell silent');
      feed.pause();
      detections.push((await arrived) - feed.lastFrameSentAt);
      feed.resume();
      await reset();
    }

    const p99 = quantile(latencies, 0.99);
    const detectP50 = quantile(detections, 0.5);
    const detectMax = Math.max(...detections);
    return [
      { name: 'trip latency p50 (offending frame → TripCommand at the controller)', value: quantile(latencies, 0.5), unit: 'ms', note: `${latencies.length} injected trips` },
      { name: 'trip latency p99', value: p99, unit: 'ms', note: `target < ${TARGET_P99_MS} ms: ${(TARGET_P99_MS / p99).toFixed(1)}× headroom` },
      {
        name: 'silent controller detected after, median',
        value: detectP50,
        unit: 'ms',
        note: `stale limit ${STALE_LIMIT_MS} ms: measured/limit = ${(detectP50 / STALE_LIMIT_MS).toFixed(2)}; worst of ${detections.length}: ${(detectMax / STALE_LIMIT_MS).toFixed(2)}`,
      },
    ];
  } finally {
    onTrip = null;
    feed.stop();
    await client.endAsync();
    await stack.close();
  }
}
