import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { API_ROUTES } from '../../server/http/route-table.js';
import type { RunningServer } from '../../server/server.js';
import { makeDataDir, removeDataDir, signIn, startTestServer } from '../../server/testing/test-server.js';

/**
 * Every write route of the route table, walked with bad bodies and bad path parameters as the
 * most privileged account: malformed JSON, wrong types, NUL and lone surrogates, absurd numbers,
 * deep nesting, bodies of the wrong media type. Each answer must be a 4xx with a JSON message,
 * never a 5xx; malformed JSON is exactly 400. New routes are picked up from the table.
 */
const WRITE_ROUTES = API_ROUTES.filter((route) => route.method !== 'get');

/** Values for every `:param` of a path: an existing alarm id, unknown ids, hostile text. */
const PARAMS = ['1', 'current.x.H', 'no-such-id', '99999999999999999999999', '%00', '%ED%A0%80', '-1e308'];

interface BadBody {
  name: string;
  text: string | null;
  type?: string;
  /** The status this body must get whatever the route; otherwise any 4xx. */
  exactly?: number;
}

const deep = (n: number) => '{"a":'.repeat(n) + '1' + '}'.repeat(n);

const BODIES: BadBody[] = [
  { name: 'no body', text: null },
  { name: 'malformed JSON', text: '{"reason": ', exactly: 400 },
  { name: 'not JSON at all', text: 'reason=because', exactly: 400 },
  { name: 'a JSON array', text: '[]' },
  { name: 'JSON null', text: 'null' },
  { name: 'a JSON string', text: '"reset"' },
  { name: 'a JSON number', text: '1e308' },
  { name: 'an empty object', text: '{}' },
  { name: 'wrong types', text: '{"reason":123,"minutes":"ten","on":"yes","email":[],"password":{},"profile":"x"}' },
  { name: 'NUL in text', text: '{"reason":"ok\\u0000then","email":"a\\u0000@b.example","password":"x\\u0000"}' },
  { name: 'a lone surrogate', text: '{"reason":"\\ud800","email":"\\udfff@b.example","password":"\\ud800"}' },
  { name: 'absurd numbers', text: '{"reason":"absurd numbers","minutes":1e308,"limit":-1e308,"deadband":1e308,"onDelayMs":-1}' },
  { name: 'a huge profile', text: '{"reason":"huge","profile":{"species":"167Er","atomNumber":1e300,"trapHz":[-1e308,1e308,0]}}' },
  { name: 'prototype keys', text: '{"__proto__":{"admin":true},"constructor":{"prototype":{"x":1}},"reason":"proto"}' },
  { name: 'deep nesting', text: deep(5000) },
  { name: 'too large', text: JSON.stringify({ reason: 'x'.repeat(200_000) }), exactly: 413 },
  { name: 'text/plain JSON', text: '{"reason":"plain"}', type: 'text/plain' },
  { name: 'a form post', text: 'reason=form&minutes=10', type: 'application/x-www-form-urlencoded' },
];

const cases = WRITE_ROUTES.flatMap((route) => {
  const paths = route.path.includes(':') ? PARAMS.map((p) => route.path.replace(/:[A-Za-z]+/g, p)) : [route.path];
  return paths.flatMap((path) => BODIES.map((body) => ({ route, path, body })));
});

/** Cases per run, quoted by the README's Reliability section. */
export const BAD_BODY_CASES = cases.length;

describe(`bad bodies on every write route (${WRITE_ROUTES.length} routes, ${cases.length} requests)`, () => {
  let dir: string;
  let server: RunningServer;
  let token: string;
  const seen = new Map<number, number>();

  beforeAll(async () => {
    dir = await makeDataDir();
    server = await startTestServer(dir);
    token = await signIn(server, 'admin');
  });
  afterAll(async () => {
    await server?.close();
    removeDataDir(dir);
  });

  it('answers each with a 4xx and a JSON message, never a 5xx', { timeout: 300_000 }, async () => {
    const failures: string[] = [];
    for (const { route, path, body } of cases) {
      const headers: Record<string, string> = { authorization: `Bearer ${token}` };
      if (body.text !== null) headers['content-type'] = body.type ?? 'application/json';
      const res = await fetch(`${server.url}${path}`, { method: route.method.toUpperCase(), headers, body: body.text ?? undefined });
      const text = await res.text();
      seen.set(res.status, (seen.get(res.status) ?? 0) + 1);
      const what = `${route.method.toUpperCase()} ${path} with ${body.name}: ${res.status} ${text.slice(0, 160)}`;
      if (res.status >= 500) failures.push(what);
      else if (body.exactly !== undefined && res.status !== body.exactly) failures.push(`${what} (expected ${body.exactly})`);
      else if (res.status >= 400 && !/^\{"error":"[^"]+/.test(text)) failures.push(`${what} (no JSON error message)`);
    }
    expect(failures).toEqual([]);
    // Only the route table's own refusal statuses (2xx where a body is simply not needed).
    for (const status of seen.keys()) expect([200, 201, 400, 401, 403, 404, 409, 413, 415, 422, 429]).toContain(status);
  });
});
