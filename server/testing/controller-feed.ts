import type mqtt from 'mqtt';
import type { PerAxis } from '../../shared/live/live-state.js';
import type { ControllerStatus } from '../../shared/telemetry/messages.js';
import { TOPICS } from '../../shared/telemetry/topics.js';
import { fastFrame, slowFrame } from './frames.js';

/** A scripted controller publishing telemetry at the demo rate through a controller-account client. */
export interface ControllerFeed {
  /** Currents (A) of the next fast frames; every sample carries them and the setpoints equal them. */
  currents: PerAxis<number>;
  /** Flows (L/min) of the next slow frames. */
  flows: PerAxis<number>;
  /** Trip and release commands received, in order. */
  commands: { topic: string; payload: unknown; at: number }[];
  /** True between a trip command and a release command, as the status reports it. */
  readonly holding: boolean;
  /** When the newest fast frame was handed to the client (performance clock, ms). */
  readonly lastFrameSentAt: number;
  /**
   * Publishes one fast frame now whose first sample is `peakA` on `axis` (the rest as
   * `currents`); returns when it was handed to the client (performance clock, ms).
   */
  spike(axis: 'x' | 'y' | 'z', peakA: number): number;
  /** Stops publishing telemetry (a silent controller); `resume()` starts again. */
  pause(): void;
  resume(): void;
  /** Publishes the retained status again (e.g. as after a restart of the controller). */
  publishStatus(overrides?: Partial<ControllerStatus>): Promise<void>;
  /** Stops the timer (the client stays open: its owner closes it). */
  stop(): void;
}

/** Fast-frame period, ms (20 samples at 1 kHz), and slow frames every fifth fast frame (10 Hz). */
const FRAME_MS = 20;
const SLOW_EVERY = 5;

/**
 * Starts publishing: the retained online status first, then fast frames every 20 ms and slow
 * frames at 10 Hz with consecutive sequence numbers. Like the real controller it holds (status
 * `softwareHold`) on a trip command until a release command.
 */
export async function startControllerFeed(client: mqtt.MqttClient): Promise<ControllerFeed> {
  let seq = 0;
  let slowSeq = 0;
  let tick = 0;
  let paused = false;
  let hold = false;
  let lastFrameSentAt = 0;
  const publishFast = (frame: ReturnType<typeof fastFrame>): number => {
    const payload = JSON.stringify(frame);
    lastFrameSentAt = performance.now();
    client.publish(TOPICS.fast, payload);
    return lastFrameSentAt;
  };
  const status = (overrides: Partial<ControllerStatus> = {}): ControllerStatus => ({
    online: true,
    tMs: Date.now(),
    hardwareTripped: false,
    hardwareTripCause: null,
    hardwareTripAxis: null,
    softwareHold: hold,
    mode: 'remote',
    ...overrides,
  });
  const publishStatus = async (overrides: Partial<ControllerStatus> = {}) => {
    await client.publishAsync(TOPICS.status, JSON.stringify(status(overrides)), { qos: 1, retain: true });
  };
  const feed: ControllerFeed = {
    currents: { x: 5, y: 4, z: 6 },
    flows: { x: 3.1, y: 3.2, z: 3.3 },
    commands: [],
    get holding() {
      return hold;
    },
    get lastFrameSentAt() {
      return lastFrameSentAt;
    },
    spike(axis, peakA) {
      const frame = fastFrame(seq++, Date.now(), feed.currents);
      frame.currentA[axis][0] = peakA;
      return publishFast(frame);
    },
    pause: () => (paused = true),
    resume: () => (paused = false),
    publishStatus,
    stop: () => clearInterval(timer),
  };
  client.on('message', (topic, payload) => {
    if (topic !== TOPICS.trip && topic !== TOPICS.release) return;
    feed.commands.push({ topic, payload: JSON.parse(payload.toString()), at: performance.now() });
    hold = topic === TOPICS.trip;
    // A command can arrive while the client is closing; its status then has nowhere to go.
    publishStatus().catch(() => undefined);
  });
  await client.subscribeAsync([TOPICS.trip, TOPICS.release], { qos: 1 });
  await publishStatus();
  const timer = setInterval(() => {
    if (paused) return;
    const now = Date.now();
    publishFast(fastFrame(seq++, now, feed.currents));
    if (tick++ % SLOW_EVERY === 0) client.publish(TOPICS.slow, JSON.stringify({ ...slowFrame(slowSeq++, now), flowLpm: { ...feed.flows } }));
  }, FRAME_MS);
  return feed;
}
