/**
 * The publisher process of the pipeline benchmark: the simulated controller's own model and
 * frames (simulator/simulation.ts), published with the controller account at `rate` times the
 * demo rate for `seconds`. Everything is scaled: fast frames (20 samples at 1 kHz of data
 * time) and slow frames (10 Hz of data time) both come `rate` times as often, so data time runs
 * `rate` times faster than the wall clock; it starts `rate × seconds` in the past so that it
 * never runs ahead of the server's clock. Sequence numbers start at `seqBase`.
 *
 * Arguments: one JSON object { mqttUrl, username, password, rate, seconds, seqBase, out }.
 * Writes { fast, slow, sentAt, lastSampleMs } to `out` (sentAt on the wall clock the
 * processes share, ms) and exits.
 */
import { writeFileSync } from 'node:fs';
import mqtt from 'mqtt';
import { TOPICS } from '../../../shared/telemetry/topics.js';
import { DEMO_PARAMETERS } from '../../../shared/apparatus/coil-data.js';
import { Simulation } from '../../../simulator/simulation.js';

interface Args {
  mqttUrl: string;
  username: string;
  password: string;
  rate: number;
  seconds: number;
  seqBase: number;
  out: string;
}

const args = JSON.parse(process.argv[2]) as Args;
const FRAME_MS = 20;
// The wall clock both processes share (Date.now, to the millisecond), read through the monotonic
// clock; performance.timeOrigin alone can differ between processes by tens of milliseconds.
const clockOffset = Date.now() - performance.now();
const epochNow = () => performance.now() + clockOffset;

const wallStart = Date.now();
const sim = new Simulation({
  params: DEMO_PARAMETERS,
  startMs: wallStart - args.rate * args.seconds * 1000,
  sampleRateHz: 1000,
  frameMs: FRAME_MS,
  seed: args.seqBase + 1,
  thermalSpeedup: 1,
  demo: true,
  demoIdleMs: 3_600_000,
});
const client = await mqtt.connectAsync(args.mqttUrl, { protocolVersion: 4, username: args.username, password: args.password, clientId: `bench-publisher-${args.seqBase}` });
(client.stream as { setNoDelay?: (on: boolean) => void }).setNoDelay?.(true);

const total = Math.round((args.seconds * 1000 * args.rate) / FRAME_MS);
const sentAt = new Float64Array(total);
const lastSampleMs = new Float64Array(total);
let slow = 0;
const t0 = performance.now();
for (let i = 0; i < total; ) {
  const due = t0 + (i * FRAME_MS) / args.rate;
  const wait = due - performance.now();
  if (wait > 1) await new Promise((resolve) => setTimeout(resolve, wait - 1));
  // Publish every frame that is due now (a timer wakes at most every millisecond or so).
  while (i < total && t0 + (i * FRAME_MS) / args.rate <= performance.now()) {
    const { fast, slow: slowFrames } = sim.nextFrame();
    for (const s of slowFrames) {
      client.publish(TOPICS.slow, JSON.stringify({ ...s, seq: s.seq + args.seqBase }));
      slow++;
    }
    lastSampleMs[i] = fast.t0Ms + fast.currentA.x.length - 1;
    client.publish(TOPICS.fast, JSON.stringify({ ...fast, seq: fast.seq + args.seqBase }));
    sentAt[i] = epochNow();
    i++;
  }
}
await client.endAsync();
writeFileSync(args.out, JSON.stringify({ fast: total, slow, sentAt: Array.from(sentAt), lastSampleMs: Array.from(lastSampleMs) }));
process.exit(0);
