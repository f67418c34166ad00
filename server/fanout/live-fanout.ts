import type { IncomingMessage, Server } from 'node:http';
import type { Duplex } from 'node:stream';
import { ipKeyGenerator } from 'express-rate-limit';
import type { Logger } from 'pino';
import { WebSocket, WebSocketServer } from 'ws';
import { z } from 'zod';
import { hasRole, type Role } from '../../shared/auth/roles.js';
import type { AlarmsMessage } from '../../shared/alarms/alarm-api.js';
import type { ChannelBands } from '../../shared/live/channels.js';
import type { ChannelsMessage, SeriesChunk, ServerMessage, SlowChunk } from '../../shared/live/live-state.js';
import type { AccessControl, SignedInUser, SocketSession } from '../auth/access-control.js';
import type { LiveStore } from '../live/live-store.js';
import { appendSeriesChunk, appendSlowChunk, DECIMATED_RATE_HZ, emptySeriesChunk, emptySlowChunk } from '../live/series-chunk.js';
import type { LiveSink } from '../live/live-sink.js';
import type { AccountEvents } from '../users/account-events.js';

export const WS_PATH = '/ws';
/** Close codes: sign-in missing, late, invalid, expired or revoked / role too low. */
export const WS_CLOSE_UNAUTHENTICATED = 4401;
export const WS_CLOSE_FORBIDDEN = 4403;
/** Standard close code 1013: try again later (too many connections from one address). */
export const WS_CLOSE_TRY_AGAIN_LATER = 1013;
/** Longest delay a Node timer takes, ms. */
const MAX_TIMER_MS = 2 ** 31 - 1;
/** Everyone signed in may watch; the check stays explicit so a later change is one line. */
const WATCH_ROLE: Role = 'viewer';

const AuthMessage = z.object({ type: z.literal('auth'), token: z.string().min(1).max(4096) });

export interface FanoutOptions {
  /** Time allowed for the `auth` message after connecting, ms. */
  authTimeoutMs?: number;
  /** Least time between two messages to one client, ms (33 ms ≈ 30 per second). */
  minIntervalMs?: number;
  /** Unsent bytes above which a client counts as slow and its updates are skipped. */
  maxBufferedBytes?: number;
  /** A client slow for this long is disconnected, ms. */
  maxSlowMs?: number;
  /** Connections (waiting to sign in or signed in) allowed from one client address. */
  maxSocketsPerAddress?: number;
  /** Of those, connections allowed to wait for sign-in at once from one address. */
  maxPendingPerAddress?: number;
  /** How often every session is re-checked against the accounts, ms (catches changes made by another process). */
  recheckIntervalMs?: number;
}

export interface FanoutCounters {
  /** Signed-in clients now connected. */
  clients: number;
  /** Connections still waiting to sign in. */
  pendingSignIn: number;
  messagesSent: number;
  /** Updates not sent because the client's send buffer was full. */
  skippedUpdates: number;
  /** Clients disconnected for staying slow. */
  droppedClients: number;
}

interface Viewer {
  ws: WebSocket;
  user: SignedInUser;
  token: string;
  expiryTimer: NodeJS.Timeout;
  slowSince: number | null;
}

/**
 * WebSocket fan-out of the live state on `/ws` of the HTTP server. Protocol: the client's
 * first message is `{"type":"auth","token":…}` within 5 s (else close 4401); the server
 * answers `hello` and the present state, then `live` messages carrying the chart points
 * gathered since the previous message, at most one per `minIntervalMs`, the same text for every
 * client (serialised once). A client whose send buffer is over the bound has updates skipped
 * (their points are gone for it; the charts reload history) and is dropped if that lasts; the
 * pipeline only appends to one shared chunk, so neither the number of browsers nor a slow one
 * can slow ingest.
 *
 * Sessions: a socket is closed (4401) when its token expires, and re-checked when its account
 * changes (disabled, password changed, removed: the token is revoked → 4401; a role changed in
 * place → the socket stays and gets a new `hello` with the new role, which applies at once:
 * every message a socket gets needs only the viewer role, the least there is), on changes
 * another process announces (see account-change-listener.ts), and every `recheckIntervalMs`.
 * Connections are capped per client address (1013 beyond the cap), so idle sockets from one
 * place cannot lock out viewers elsewhere.
 */
export class LiveFanout implements LiveSink {
  private readonly wss = new WebSocketServer({ noServer: true, maxPayload: 8 * 1024 });
  private readonly viewers = new Set<Viewer>();
  private readonly waiting = new Map<WebSocket, NodeJS.Timeout>();
  /** Open connections per client address: all, and those still waiting to sign in. */
  private readonly perAddress = new Map<string, { open: number; pending: number }>();
  private readonly recheckTimer: NodeJS.Timeout;
  private readonly stopAccountEvents: () => void;
  private readonly counts = { messagesSent: 0, skippedUpdates: 0, droppedClients: 0 };
  /** Chart points gathered since the last `live` message, the same for every client. */
  private series = emptySeriesChunk();
  private slow = emptySlowChunk();
  private lastTickAt = -Infinity;
  private tickTimer: NodeJS.Timeout | null = null;
  private readonly opts: Required<FanoutOptions>;
  private closing: Promise<void> | undefined;
  /** The newest `alarms` message, sent to each client right after `hello`. */
  private alarms: AlarmsMessage | null = null;
  /** The newest `channels` message, sent to each client right after `hello`. */
  private channels: ChannelsMessage | null = null;
  private readonly onUpgrade = (req: IncomingMessage, socket: Duplex, head: Buffer) => this.upgrade(req, socket, head);

  constructor(
    private readonly server: Server,
    private readonly access: AccessControl,
    private readonly live: LiveStore,
    private readonly log: Logger,
    opts: FanoutOptions = {},
    accountEvents?: AccountEvents,
  ) {
    this.opts = {
      authTimeoutMs: 5000,
      minIntervalMs: 33,
      maxBufferedBytes: 1 << 20,
      maxSlowMs: 10_000,
      maxSocketsPerAddress: 32,
      maxPendingPerAddress: 8,
      recheckIntervalMs: 60_000,
      ...opts,
    };
    server.on('upgrade', this.onUpgrade);
    this.stopAccountEvents = accountEvents?.onChange((userId) => this.recheck((v) => userId === null || v.user.id === userId)) ?? (() => {});
    this.recheckTimer = setInterval(() => this.recheck(() => true), this.opts.recheckIntervalMs);
    this.recheckTimer.unref();
  }

  /**
   * Takes a frame's chart points. The work per frame is the same however many clients watch:
   * the points join one shared chunk, and a single timer sends it to everyone.
   */
  publishSeries(series: SeriesChunk): void {
    appendSeriesChunk(this.series, series);
    this.schedule();
  }

  publishSlow(slow: SlowChunk): void {
    appendSlowChunk(this.slow, slow);
    this.schedule();
  }

  /** The live state changed without new chart points (a status, a prediction): the next `live` message carries it. */
  publishStateChange(): void {
    this.schedule();
  }

  /**
   * Sends the interlock state and active alarms to every client at once (not paced: they
   * change rarely and every screen shows the interlock banner), and keeps it for new clients.
   */
  publishAlarms(message: AlarmsMessage): void {
    this.alarms = message;
    this.broadcast(message);
  }

  /**
   * Sends the display bands in force to every client at once when a lead changes a level or
   * an alarm limit, so the gauges redraw without a reload; kept for new clients.
   */
  publishChannels(bands: ChannelBands): void {
    this.channels = { type: 'channels', ...bands };
    this.broadcast(this.channels);
  }

  private broadcast(message: ServerMessage): void {
    for (const viewer of this.viewers) {
      if (viewer.ws.readyState === WebSocket.OPEN) this.sendMessage(viewer.ws, message);
    }
  }

  counters(): FanoutCounters {
    return { clients: this.viewers.size, pendingSignIn: this.waiting.size, ...this.counts };
  }

  /** Disconnects every client and stops accepting new ones. Safe to call more than once. */
  close(): Promise<void> {
    this.closing ??= this.shutDown();
    return this.closing;
  }

  private async shutDown(): Promise<void> {
    if (this.tickTimer) clearTimeout(this.tickTimer);
    this.tickTimer = null;
    this.server.off('upgrade', this.onUpgrade);
    this.stopAccountEvents();
    clearInterval(this.recheckTimer);
    for (const [ws, timer] of this.waiting) {
      clearTimeout(timer);
      ws.terminate();
    }
    this.waiting.clear();
    for (const viewer of this.viewers) this.forget(viewer);
    for (const ws of this.wss.clients) ws.terminate();
    await new Promise<void>((resolve) => this.wss.close(() => resolve()));
  }

  private upgrade(req: IncomingMessage, socket: Duplex, head: Buffer): void {
    const path = new URL(req.url ?? '/', 'http://localhost').pathname;
    if (path !== WS_PATH) {
      socket.end('HTTP/1.1 404 Not Found\r\nConnection: close\r\n\r\n');
      return;
    }
    const address = ipKeyGenerator(req.socket.remoteAddress ?? 'unknown');
    this.wss.handleUpgrade(req, socket, head, (ws) => this.awaitSignIn(ws, address));
  }

  private awaitSignIn(ws: WebSocket, address: string): void {
    const count = this.perAddress.get(address) ?? { open: 0, pending: 0 };
    if (count.open >= this.opts.maxSocketsPerAddress || count.pending >= this.opts.maxPendingPerAddress) {
      ws.close(WS_CLOSE_TRY_AGAIN_LATER, 'too many connections from this address');
      return;
    }
    count.open++;
    count.pending++;
    this.perAddress.set(address, count);
    let pending = true;
    const signedIn = () => {
      if (pending) count.pending--;
      pending = false;
    };
    ws.once('close', () => {
      signedIn();
      count.open--;
      if (count.open === 0) this.perAddress.delete(address);
    });
    const timer = setTimeout(() => this.refuse(ws, WS_CLOSE_UNAUTHENTICATED, 'sign-in timed out: send {"type":"auth","token":…} first'), this.opts.authTimeoutMs);
    this.waiting.set(ws, timer);
    ws.on('error', (error) => this.log.debug({ err: error }, 'websocket error'));
    ws.once('close', () => {
      clearTimeout(timer);
      this.waiting.delete(ws);
    });
    ws.once('message', (data, isBinary) => {
      clearTimeout(timer);
      const parsed = isBinary ? null : AuthMessage.safeParse(safeJson(data.toString()));
      if (!parsed?.success) {
        this.refuse(ws, WS_CLOSE_UNAUTHENTICATED, 'the first message must be {"type":"auth","token":…}');
        return;
      }
      const token = parsed.data.token;
      this.access.sessionForToken(token).then(
        (session) => {
          signedIn();
          this.admit(ws, token, session);
        },
        (error: unknown) => {
          this.log.error({ err: error }, 'websocket sign-in failed');
          this.refuse(ws, WS_CLOSE_UNAUTHENTICATED, 'sign-in failed');
        },
      );
    });
  }

  private admit(ws: WebSocket, token: string, session: SocketSession | null): void {
    this.waiting.delete(ws);
    if (ws.readyState !== WebSocket.OPEN) return;
    if (!session) return this.refuse(ws, WS_CLOSE_UNAUTHENTICATED, 'invalid or expired token: sign in again');
    const { user } = session;
    if (!hasRole(user.role, WATCH_ROLE)) return this.refuse(ws, WS_CLOSE_FORBIDDEN, `watching needs the ${WATCH_ROLE} role`);
    const expiresInMs = Math.min(MAX_TIMER_MS, Math.max(0, session.expiresAt - Date.now()));
    const expiryTimer = setTimeout(() => this.end(viewer, WS_CLOSE_UNAUTHENTICATED, 'session expired: sign in again'), expiresInMs);
    const viewer: Viewer = { ws, user, token, expiryTimer, slowSince: null };
    this.viewers.add(viewer);
    ws.on('close', () => this.forget(viewer));
    this.hello(viewer);
    if (this.alarms) this.sendMessage(ws, this.alarms);
    if (this.channels) this.sendMessage(ws, this.channels);
    this.sendMessage(ws, { type: 'live', live: this.live.snapshot(), series: emptySeriesChunk(), slow: emptySlowChunk() });
  }

  private hello(viewer: Viewer): void {
    this.sendMessage(viewer.ws, {
      type: 'hello',
      user: { email: viewer.user.email, role: viewer.user.role },
      serverTime: new Date().toISOString(),
      decimatedRateHz: DECIMATED_RATE_HZ,
    });
  }

  /**
   * Re-checks the sessions `which` selects against the accounts as stored now: closes those
   * whose token was revoked or whose account is gone or disabled, and re-greets those whose
   * role changed in place.
   */
  private recheck(which: (viewer: Viewer) => boolean): void {
    for (const viewer of this.viewers) {
      if (!which(viewer)) continue;
      this.access.sessionForToken(viewer.token).then(
        (session) => {
          if (!this.viewers.has(viewer)) return;
          if (!session) return this.end(viewer, WS_CLOSE_UNAUTHENTICATED, 'your session ended (account disabled or password changed): sign in again');
          if (!hasRole(session.user.role, WATCH_ROLE)) return this.end(viewer, WS_CLOSE_FORBIDDEN, `watching needs the ${WATCH_ROLE} role`);
          if (session.user.role !== viewer.user.role) {
            viewer.user = session.user;
            this.hello(viewer);
          }
        },
        (error: unknown) => this.log.error({ err: error }, 'websocket session re-check failed'),
      );
    }
  }

  private end(viewer: Viewer, code: number, reason: string): void {
    this.forget(viewer);
    if (viewer.ws.readyState === WebSocket.OPEN) viewer.ws.close(code, reason);
  }

  private refuse(ws: WebSocket, code: number, reason: string): void {
    this.waiting.delete(ws);
    if (ws.readyState === WebSocket.OPEN) ws.close(code, reason);
  }

  private schedule(): void {
    if (this.tickTimer) return;
    const wait = this.lastTickAt + this.opts.minIntervalMs - performance.now();
    if (wait <= 0) {
      this.tick();
      return;
    }
    this.tickTimer = setTimeout(() => {
      this.tickTimer = null;
      this.tick();
    }, wait);
  }

  /** One `live` message with the points gathered since the last one, serialised once, to every client that keeps up. */
  private tick(): void {
    const now = performance.now();
    this.lastTickAt = now;
    const message: ServerMessage = { type: 'live', live: this.live.snapshot(), series: this.series, slow: this.slow };
    this.series = emptySeriesChunk();
    this.slow = emptySlowChunk();
    if (this.viewers.size === 0) return;
    const text = JSON.stringify(message);
    for (const viewer of this.viewers) this.deliver(viewer, text, now);
  }

  /** Sends `text` unless the client's send buffer is over the bound (skipped; dropped if that lasts). */
  private deliver(viewer: Viewer, text: string, now: number): void {
    const { ws } = viewer;
    if (ws.readyState !== WebSocket.OPEN) return;
    if (ws.bufferedAmount > this.opts.maxBufferedBytes) {
      this.counts.skippedUpdates++;
      viewer.slowSince ??= now;
      if (now - viewer.slowSince > this.opts.maxSlowMs) {
        this.counts.droppedClients++;
        this.log.warn({ user: viewer.user.email }, 'websocket client too slow; disconnected');
        ws.terminate();
      }
      return;
    }
    viewer.slowSince = null;
    ws.send(text);
    this.counts.messagesSent++;
  }

  private sendMessage(ws: WebSocket, message: ServerMessage): void {
    ws.send(JSON.stringify(message));
    this.counts.messagesSent++;
  }

  private forget(viewer: Viewer): void {
    clearTimeout(viewer.expiryTimer);
    this.viewers.delete(viewer);
  }
}

function safeJson(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    return null;
  }
}
