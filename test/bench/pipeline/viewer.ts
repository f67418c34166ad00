/**
 * The viewer process of the pipeline benchmark: signs in as the viewer, opens the WebSocket and
 * records, for every `live` message with chart points, when it arrived (the wall clock the
 * processes share, ms) and the time of its newest chart point. Prints `ready` once greeted; on
 * SIGTERM writes { receivedAt, newestPointMs } to the file given as the second argument and exits.
 *
 * Arguments: BASE_URL OUT_FILE.
 */
import { writeFileSync } from 'node:fs';
import WebSocket from 'ws';
import type { ServerMessage } from '../../../shared/live/live-state.js';
import { TEST_PASSWORD } from '../../../server/testing/test-server.js';

const [baseUrl, out] = process.argv.slice(2);
// The wall clock both processes share (Date.now, to the millisecond), read through the monotonic
// clock; performance.timeOrigin alone can differ between processes by tens of milliseconds.
const clockOffset = Date.now() - performance.now();
const epochNow = () => performance.now() + clockOffset;
const res = await fetch(`${baseUrl}/api/auth/login`, {
  method: 'POST',
  headers: { 'content-type': 'application/json' },
  body: JSON.stringify({ email: 'viewer@tiltwatch.example', password: TEST_PASSWORD }),
});
if (res.status !== 200) throw new Error(`sign-in failed: ${res.status}`);
const { token } = (await res.json()) as { token: string };

const receivedAt: number[] = [];
const newestPointMs: number[] = [];
const ws = new WebSocket(`${baseUrl.replace(/^http/, 'ws')}/ws`);
ws.on('open', () => ws.send(JSON.stringify({ type: 'auth', token })));
ws.on('message', (data) => {
  const at = epochNow();
  const message = JSON.parse(data.toString()) as ServerMessage;
  if (message.type === 'hello') console.log('ready');
  if (message.type !== 'live' || message.series.t.length === 0) return;
  receivedAt.push(at);
  newestPointMs.push(message.series.t[message.series.t.length - 1]);
});
process.on('SIGTERM', () => {
  ws.close();
  writeFileSync(out, JSON.stringify({ receivedAt, newestPointMs }));
  process.exit(0);
});
