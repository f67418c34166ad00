/**
 * The publisher process of the pipeline benchmark: the simulated controller's own model and
 * frames (simulator/simulation.ts), published with the controller account at `rate` times the
 * demo rate for `seconds` (computed and serialised before the level starts, as a controller on
 * its own machine would cost this one nothing; it prints `ready` and starts sending when a line
 * comes on its standard input).
 * Everything is scaled: fast frames (20 samples at 1 kHz of data
 * time) and slow frames (10 Hz of data time) both come `rate` times as often, so data time runs
 * `rate` times faster than the wall clock; it starts `rate × seconds` in the past so that it
 * never runs ahead of the server's clock. Fast and slow sequence numbers start at `seqBase.fast`
 * and `seqBase.slow`: the bench carries them on from the level before, so the server sees one
 * controller whose numbers keep rising (a jump would be refused at the edge as it should be).
 *
 * Arguments: one JSON object { mqttUrl, username, password, rate, seconds, seqBase, out }.
 * Writes { fast, slow, seqLast, sentAt, t0Ms } to `out` (sentAt on the wall clock the
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
  seqBase: { fast: number; slow: number };
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
  seed: args.seqBase.fast + 1,
  thermalSpeedup: 1,
  demo: true,
  demoIdleMs: 3_600_000,
});
// A real controller is its own machine: its model costs the server's machine nothing. So every
// frame of the level is computed and serialised before the clock starts, and the level itself
// only sends prepared payloads on time.
const total = Math.round((args.seconds * 1000 * args.rate) / FRAME_MS);
const fastPayloads: string[] = [];
const slowPayloads: string[][] = [];
const t0Ms = new Float64Array(total);
let slow = 0;
const seqLast = { fast: args.seqBase.fast - 1, slow: args.seqBase.slow - 1 };
for (let i = 0; i < total; i++) {
  const { fast, slow: slowFrames } = sim.nextFrame();
  slowPayloads.push(
    slowFrames.map((s) => {
      seqLast.slow = s.seq + args.seqBase.slow;
      slow++;
      return JSON.stringify({ ...s, seq: seqLast.slow });
    }),
  );
  t0Ms[i] = fast.t0Ms;
  seqLast.fast = fast.seq + args.seqBase.fast;
  fastPayloads.push(JSON.stringify({ ...fast, seq: seqLast.fast }));
}

const client = await mqtt.connectAsync(args.mqttUrl, { protocolVersion: 4, username: args.username, password: args.password, clientId: `bench-publisher-${args.seqBase.fast}` });
(client.stream as { setNoDelay?: (on: boolean) => void }).setNoDelay?.(true);
// The bench takes its starting figures (counters, CPU) on this line, then says go.
console.log('ready');
await new Promise((resolve) => process.stdin.once('data', resolve));
process.stdin.destroy();

const sentAt = new Float64Array(total);
const t0 = performance.now();
for (let i = 0; i < total; ) {
  const due = t0 + (i * FRAME_MS) / args.rate;
  const wait = due - performance.now();
  // Sleep on a timer every time, also when the next frame is due within a millisecond: a loop
  // that never yields would hold every frame back until the level ends (the client's writes go
  // out only between event-loop turns), and one that yields with setImmediate spins a core that
  // the server under test shares.
  await new Promise((resolve) => setTimeout(resolve, Math.max(0, wait - 1)));
  // Publish every frame that is due now (a timer wakes at most every millisecond or so).
  while (i < total && t0 + (i * FRAME_MS) / args.rate <= performance.now()) {
    for (const payload of slowPayloads[i]) client.publish(TOPICS.slow, payload);
    client.publish(TOPICS.fast, fastPayloads[i]);
    sentAt[i] = epochNow();
    i++;
  }
}
await client.endAsync();
writeFileSync(args.out, JSON.stringify({ fast: total, slow, seqLast, sentAt: Array.from(sentAt), t0Ms: Array.from(t0Ms) }));
process.exit(0);
