/**
 * Writes the demo lab's invented measurement CSV (demo-imaging.ts) for the shots of one run of
 * a running demo server to stdout, ready for the Shots page's upload:
 *
 *   node --import tsx server/shots/examples/demo-imaging-cli.ts --run 1 > imaging.csv
 *
 * Options: --url (default http://localhost:4280); the demo operator signs in with
 * TILTWATCH_DEMO_PASSWORD (default tiltwatch-demo).
 */
import { parseArgs } from 'node:util';
import type { ShotsResponse } from '../../../shared/shots/shots-api.js';
import { demoMeasurementCsv } from './demo-imaging.js';

async function main(): Promise<void> {
  const { values } = parseArgs({ options: { run: { type: 'string' }, url: { type: 'string', default: 'http://localhost:4280' } } });
  if (!values.run) throw new Error('give the run: --run ID (see the Shots or Sequences page)');
  const login = await fetch(`${values.url}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: 'operator@tiltwatch.example', password: process.env.TILTWATCH_DEMO_PASSWORD ?? 'tiltwatch-demo' }),
  });
  if (!login.ok) throw new Error(`sign-in as the demo operator failed (${login.status}); is the server running with --demo?`);
  const { token } = (await login.json()) as { token: string };
  const res = await fetch(`${values.url}/api/shots?run=${encodeURIComponent(values.run)}`, { headers: { authorization: `Bearer ${token}` } });
  if (!res.ok) throw new Error(`GET /api/shots failed (${res.status}): ${await res.text()}`);
  process.stdout.write(demoMeasurementCsv(((await res.json()) as ShotsResponse).shots));
}

main().catch((error: unknown) => {
  process.stderr.write(`${(error as Error).message}\n`);
  process.exitCode = 1;
});
