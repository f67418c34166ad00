import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import type { z } from 'zod';
import { FaultSpec } from './faults.js';
import type { ResetOutcome } from './trip-chain.js';
import { listenProblem } from '../shared/net/listen-problem.js';

/** What the control endpoint can ask of the controller. */
export interface ControlActions {
  /** The internal truth for GET /state (JSON-serialisable). */
  state(): unknown;
  injectFault(fault: FaultSpec): void;
  clearFaults(): void;
  resetHardwareTrip(): ResetOutcome;
}

export interface ControlEndpoint {
  port: number;
  url: string;
  close(): Promise<void>;
}

/** Request bodies larger than this are refused; a fault description is a few hundred bytes. */
const MAX_BODY_BYTES = 16 * 1024;

class HttpError extends Error {
  constructor(readonly status: number, message: string) {
    super(message);
  }
}

/**
 * The controller's local control endpoint (plain node:http, bound to `host`, by default
 * 127.0.0.1 only): fault injection, the local hardware-trip reset and the internal state. It is
 * the "front panel" of the simulated controller, so the reset can only come from this machine,
 * never over MQTT.
 *
 *   GET    /state   internal truth
 *   POST   /faults  inject a fault: { "kind", "axis"?, … } → 201 { active }
 *   DELETE /faults  clear every fault → 200 { active: [] }
 *   POST   /reset   reset the latched hardware trip → 200, or 409 while its cause holds
 *
 * Cross-site requests are refused (403) before anything happens: a browser page elsewhere
 * could otherwise clear a hardware trip through this machine's browser. Refused are requests
 * whose `Host` is not a loopback name (DNS rebinding), that carry an `Origin` other than this
 * endpoint's own, or that a browser marks as cross-site (`Sec-Fetch-Site`); a request with a
 * body must send it as `application/json` (415 otherwise), which a form or a simple
 * cross-site request cannot. curl and scripts on this machine send none of these headers.
 */
export async function startControlEndpoint(actions: ControlActions, port: number, host = '127.0.0.1'): Promise<ControlEndpoint> {
  const server = createServer((req, res) => {
    handle(actions, req)
      .then(({ status, body }) => send(res, status, body))
      .catch((error: unknown) => {
        if (error instanceof HttpError) send(res, error.status, { error: error.message });
        else send(res, 500, { error: (error as Error).message });
      });
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', (error) => reject(new Error(listenProblem('The simulator\'s control endpoint', { port: 'SIM_CONTROL_PORT' }, host, port, error))));
    server.listen(port, host, () => resolve());
  });
  const bound = (server.address() as AddressInfo).port;
  return {
    port: bound,
    url: `http://${host.includes(':') ? `[${host}]` : host}:${bound}`,
    close: () =>
      new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  };
}

async function handle(actions: ControlActions, req: IncomingMessage): Promise<{ status: number; body: unknown }> {
  refuseCrossSite(req);
  const path = new URL(req.url ?? '/', 'http://localhost').pathname;
  const route = `${req.method} ${path}`;
  switch (route) {
    case 'GET /state':
      return { status: 200, body: actions.state() };
    case 'POST /faults': {
      const fault = parse(FaultSpec, await readJson(req));
      actions.injectFault(fault);
      return { status: 201, body: { injected: fault } };
    }
    case 'DELETE /faults':
      actions.clearFaults();
      return { status: 200, body: { active: [] } };
    case 'POST /reset': {
      const outcome = actions.resetHardwareTrip();
      if (!outcome.reset) throw new HttpError(409, `reset refused: ${outcome.reason}`);
      return { status: 200, body: { reset: true } };
    }
    default:
      if (['/state', '/faults', '/reset'].includes(path)) throw new HttpError(405, `${req.method} is not allowed on ${path}`);
      throw new HttpError(404, `no route ${path}; use GET /state, POST or DELETE /faults, POST /reset`);
  }
}

/** Names under which this machine reaches the endpoint. */
const LOOPBACK_HOST = /^(localhost|127(\.\d{1,3}){3}|\[::1\])(:\d+)?$/i;

function refuseCrossSite(req: IncomingMessage): void {
  const host = req.headers.host ?? '';
  if (!LOOPBACK_HOST.test(host)) {
    throw new HttpError(403, `refused: the control endpoint answers only requests addressed to this machine (Host localhost or 127.0.0.1), not ${JSON.stringify(host)}`);
  }
  const origin = req.headers.origin;
  if (origin !== undefined && origin !== `http://${host}`) {
    throw new HttpError(403, `refused: cross-site request from ${JSON.stringify(origin)}; use curl or a script on this machine`);
  }
  const site = req.headers['sec-fetch-site'];
  if (site !== undefined && site !== 'same-origin' && site !== 'none') {
    throw new HttpError(403, `refused: cross-site request (Sec-Fetch-Site: ${site}); use curl or a script on this machine`);
  }
  const hasBody = req.headers['content-length'] !== undefined ? req.headers['content-length'] !== '0' : req.headers['transfer-encoding'] !== undefined;
  const type = (req.headers['content-type'] ?? '').split(';')[0].trim().toLowerCase();
  if (hasBody && type !== 'application/json') {
    throw new HttpError(415, `send the body as JSON with "Content-Type: application/json" (got ${JSON.stringify(req.headers['content-type'] ?? 'no Content-Type')})`);
  }
}

async function readJson(req: IncomingMessage): Promise<unknown> {
  const chunks: Buffer[] = [];
  let size = 0;
  for await (const chunk of req as AsyncIterable<Buffer>) {
    size += chunk.length;
    if (size > MAX_BODY_BYTES) throw new HttpError(413, `body larger than ${MAX_BODY_BYTES} bytes`);
    chunks.push(chunk);
  }
  const text = Buffer.concat(chunks).toString('utf8');
  try {
    return JSON.parse(text);
  } catch {
    throw new HttpError(400, 'body must be JSON, e.g. { "kind": "cooling-loss", "axis": "x" }');
  }
}

function parse<T extends z.ZodType>(schema: T, body: unknown): z.infer<T> {
  if (typeof body !== 'object' || body === null || Array.isArray(body)) {
    throw new HttpError(400, 'body must be a JSON object, e.g. { "kind": "cooling-loss", "axis": "x" }');
  }
  const result = schema.safeParse(body);
  if (result.success) return result.data;
  const problems = result.error.issues.map((i) => `${i.path.length ? i.path.join('.') : 'body'}: ${i.message}`);
  throw new HttpError(400, problems.join('; '));
}

function send(res: ServerResponse, status: number, body: unknown): void {
  const text = JSON.stringify(body);
  res.writeHead(status, { 'content-type': 'application/json; charset=utf-8', 'content-length': Buffer.byteLength(text) });
  res.end(text);
}
