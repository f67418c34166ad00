import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PROFILE } from '../../shared/profiles/demo-profile.js';
import type { RunningServer } from '../server.js';
import { makeDataDir, removeDataDir, signIn, startTestServer } from '../testing/test-server.js';

/**
 * Hostile text and numbers are refused with 400 at the edge, on any route, before anything is
 * stored; nothing answers 500. (The attack suite walks every write route; this checks the
 * shared rule on representative routes and on the path and query.)
 */
describe('hostile input at the HTTP edge', () => {
  let dir: string;
  let server: RunningServer;
  let lead: string;

  beforeAll(async () => {
    dir = await makeDataDir();
    server = await startTestServer(dir);
    lead = await signIn(server, 'lead');
  });
  afterAll(async () => {
    await server?.close();
    removeDataDir(dir);
  });

  /** Sends the raw JSON text, so lone surrogates and 1e999 reach the server as written. */
  const send = async (method: string, path: string, json?: string) => {
    const res = await fetch(`${server.url}${path}`, {
      method,
      headers: { authorization: `Bearer ${lead}`, 'content-type': 'application/json' },
      body: json,
    });
    const body = (await res.json()) as { error?: string; field?: string };
    return { status: res.status, error: body.error ?? '', field: body.field };
  };
  const profile = (name: string, atomNumber = '4e4') =>
    JSON.stringify({ profile: { ...DEMO_PROFILE, name: 'NAME', atomNumber: 0 }, reason: 'edge check' })
      .replace('"NAME"', `"${name}"`)
      .replace('"atomNumber":0', `"atomNumber":${atomNumber}`);

  it.each([
    ['a NUL in a profile name', 'POST', '/api/profiles', profile('a\\u0000b'), /^Name: must not contain a NUL/],
    ['a lone surrogate in a profile name', 'POST', '/api/profiles', profile('a\\ud800b'), /^Name: must be well-formed Unicode/],
    ['1e300 atoms', 'POST', '/api/profiles', profile('Edge', '1e300'), /^Atom number: must lie between/],
    ['an atom number of 1e999 (Infinity once parsed)', 'POST', '/api/profiles', profile('Edge', '1e999'), /^Atom number: must be a finite number/],
    ['a limit of −1e308', 'PUT', '/api/alarm-limits/waterReturn.x.H', '{"limit":-1e308,"reason":"edge check"}', /^Limit: must lie between/],
    ['a NUL in a shelving reason', 'POST', '/api/alarms/current.x.H/shelve', '{"minutes":5,"reason":"\\u0000"}', /^Reason: must not contain a NUL/],
    ['a lone surrogate in a reset reason', 'POST', '/api/interlock/reset', '{"reason":"\\udc00"}', /^Reason for the reset: must be well-formed Unicode/],
    ['a control character in a field name', 'POST', '/api/interlock/reset', '{"reason":"ok","\\u0001":1}', /field name that must not contain control characters/],
    ['a NUL in the sign-in e-mail', 'POST', '/api/auth/login', '{"email":"lead@tiltwatch.example\\u0000","password":"x"}', /^Email: must not contain a NUL/],
    ['a NUL in the query', 'GET', '/api/alarms?state=%00', undefined, /Invalid request query: state must not contain a NUL/],
    ['a NUL in the path', 'POST', '/api/alarms/x%00y/acknowledge', undefined, /Invalid request path: it must not contain a NUL/],
    ['broken percent-encoding in the path', 'POST', '/api/alarms/%ED%A0%80/acknowledge', undefined, /not valid percent-encoded UTF-8/],
  ])('refuses %s with 400 naming the field', async (_what, method, path, json, message) => {
    const answer = await send(method, path, json);
    expect(answer.status).toBe(400);
    expect(answer.error).toMatch(message);
  });

  it('sends the path of the refused field, so that the form shows the message next to it', async () => {
    const answer = await send('PUT', '/api/alarm-limits/waterReturn.x.H', '{"limit":5,"rationale":{"cause":"a\\u0000b"},"reason":"edge check"}');
    expect(answer).toEqual({ status: 400, error: 'Cause: must not contain a NUL character', field: 'rationale.cause' });
  });

  it('stored nothing from the refused requests', async () => {
    const res = await fetch(`${server.url}/api/profiles`, { headers: { authorization: `Bearer ${lead}` } });
    const { profiles } = (await res.json()) as { profiles: { name: string }[] };
    expect(profiles.map((p) => p.name)).not.toContain('Edge');
  });
});
