import { Aedes, type AuthenticateError, type Client } from 'aedes';
import { createHash, timingSafeEqual } from 'node:crypto';
import { createServer, type Socket } from 'node:net';
import { listenProblem } from '../shared/net/listen-problem.js';
import type { BrokerCredentials } from './credentials.js';
import { mayPublish, maySubscribe, type MqttRole } from './topic-access.js';

/** Live counts since start; `clients` is the number currently connected and authenticated. */
export interface BrokerCounters {
  clients: number;
  refusedLogins: number;
  refusedPublishes: number;
  refusedSubscribes: number;
}

/** A listening broker; its owner must call `close()`. */
export interface RunningBroker {
  /** The TCP port actually bound (useful after asking for port 0). */
  port: number;
  /** `mqtt://host:port`, ready for an MQTT client. */
  url: string;
  counters(): BrokerCounters;
  /** Closes the listener, every client connection and the broker; resolves when all are closed. */
  close(): Promise<void>;
}

export interface BrokerOptions {
  /** TCP port; 0 picks a free one. */
  port: number;
  /** Interface to bind; default 127.0.0.1 so the broker is not reachable from other machines. */
  host?: string;
  credentials: BrokerCredentials;
  log?: (msg: string, fields?: object) => void;
}

/** MQTT 3.1.1 CONNACK return code 4: bad user name or password. */
const BAD_USERNAME_OR_PASSWORD = 4;

/**
 * Starts an MQTT 3.1.1 broker (aedes) that admits only the controller and server accounts and
 * enforces the topic access list of `topic-access.ts`. A refused publish closes the offending
 * connection without delivering the message (aedes semantics, MQTT-3.3.5-2); a refused
 * subscription is answered with failure code 0x80 in the SUBACK.
 */
export async function startBroker(opts: BrokerOptions): Promise<RunningBroker> {
  const host = opts.host ?? '127.0.0.1';
  const log = opts.log ?? (() => {});
  const refused = { logins: 0, publishes: 0, subscribes: 0 };
  const roles = new WeakMap<Client, MqttRole>();

  const accounts: { role: MqttRole; username: string; digest: Buffer }[] = (
    ['controller', 'server'] as const
  ).map((role) => ({
    role,
    username: opts.credentials[role].username,
    digest: sha256(Buffer.from(opts.credentials[role].password, 'utf8')),
  }));

  const aedes = await Aedes.createBroker({
    authenticate(client, username, password, done) {
      const account = accounts.find((a) => a.username === username);
      // Comparing fixed-length digests in constant time hides how much of a guess was right.
      if (account && password && timingSafeEqual(sha256(password), account.digest)) {
        roles.set(client, account.role);
        done(null, true);
        return;
      }
      refused.logins++;
      log('mqtt login refused', { clientId: client.id, username: username ?? null });
      const error = new Error('bad user name or password') as AuthenticateError;
      error.returnCode = BAD_USERNAME_OR_PASSWORD;
      done(error, false);
    },
    authorizePublish(client, packet, done) {
      const role = client ? roles.get(client) : undefined;
      if (role && mayPublish(role, packet.topic)) {
        done(null);
        return;
      }
      refused.publishes++;
      log('mqtt publish refused', { clientId: client?.id ?? null, role: role ?? null, topic: packet.topic });
      done(new Error(`${role ?? 'unknown client'} may not publish to ${packet.topic}`));
    },
    authorizeSubscribe(client, subscription, done) {
      const role = roles.get(client);
      if (role && maySubscribe(role, subscription.topic)) {
        done(null, subscription);
        return;
      }
      refused.subscribes++;
      log('mqtt subscribe refused', { clientId: client.id, role: role ?? null, topic: subscription.topic });
      done(null, null);
    },
  });
  aedes.on('clientReady', (client) => log('mqtt client connected', { clientId: client.id, role: roles.get(client) }));
  aedes.on('clientDisconnect', (client) => log('mqtt client disconnected', { clientId: client.id, role: roles.get(client) }));

  // aedes closes only clients that completed CONNECT; sockets still in the handshake are ours.
  const sockets = new Set<Socket>();
  // No Nagle delay: a trip command or frame must not wait for the previous segment's acknowledgement.
  const server = createServer({ noDelay: true }, aedes.handle);
  server.on('connection', (socket) => {
    sockets.add(socket);
    socket.on('close', () => sockets.delete(socket));
  });

  try {
    await listen(server, opts.port, host);
  } catch (error) {
    await new Promise<void>((resolve) => aedes.close(() => resolve()));
    throw new Error(listenProblem('The embedded MQTT broker', { port: 'MQTT_PORT', host: 'MQTT_HOST' }, host, opts.port, error as NodeJS.ErrnoException));
  }
  server.on('error', (error) => log('mqtt listener error', { error: error.message }));

  const address = server.address();
  const port = typeof address === 'object' && address !== null ? address.port : opts.port;
  let closing: Promise<void> | undefined;

  return {
    port,
    url: `mqtt://${host.includes(':') ? `[${host}]` : host}:${port}`,
    counters: () => ({
      clients: aedes.connectedClients,
      refusedLogins: refused.logins,
      refusedPublishes: refused.publishes,
      refusedSubscribes: refused.subscribes,
    }),
    close() {
      closing ??= (async () => {
        const listenerClosed = new Promise<void>((resolve) => server.close(() => resolve()));
        await new Promise<void>((resolve) => aedes.close(() => resolve()));
        for (const socket of sockets) socket.destroy();
        await listenerClosed;
      })();
      return closing;
    },
  };
}

function listen(server: ReturnType<typeof createServer>, port: number, host: string): Promise<void> {
  return new Promise((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, host, () => {
      server.off('error', reject);
      resolve();
    });
  });
}

function sha256(data: Buffer): Buffer {
  return createHash('sha256').update(data).digest();
}
