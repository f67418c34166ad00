import { HttpClient } from '@angular/common/http';
import { Injectable, computed, inject, signal } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { AlarmsMessage } from '../../../shared/alarms/alarm-api';
import type { ChannelBands } from '../../../shared/live/channels';
import type { LiveState, ServerMessage, SeriesChunk, SlowChunk } from '../../../shared/live/live-state';
import { Session } from '../auth/session';
import { judgeConnection } from './connection-state';

/** Receives every decimated sample block as it arrives, outside change detection. */
export type SampleListener = (series: SeriesChunk, slow: SlowChunk) => void;

/** Close code the server uses when the token is missing, invalid or expired. */
export const CLOSE_NOT_SIGNED_IN = 4401;
/** How often the few-hertz summary (latest state, connection judgement) is published to signals. */
const SUMMARY_INTERVAL_MS = 250;
const RETRY_FIRST_MS = 500;
const RETRY_MAX_MS = 15_000;

/**
 * Delay before reconnect attempt `attempt` (0-based), ms: doubling from 0.5 s up to 15 s, with
 * ±20 % spread so that the browsers of a whole control room do not reconnect in step after a
 * server restart. `random` is a number in [0, 1).
 */
export function reconnectDelayMs(attempt: number, random: number): number {
  const base = Math.min(RETRY_MAX_MS, RETRY_FIRST_MS * 2 ** Math.max(0, attempt));
  return Math.round(base * (0.8 + 0.4 * random));
}

/**
 * The live WebSocket feed (`/ws`). Sample blocks go straight to listeners (ring buffers) as they
 * arrive; Angular sees only a summary published a few times per second: the latest state and
 * the connection judgement.
 */
@Injectable({ providedIn: 'root' })
export class LiveFeed {
  private readonly session = inject(Session);
  private readonly http = inject(HttpClient);
  private readonly listeners = new Set<SampleListener>();

  private socket: WebSocket | null = null;
  private running = false;
  private attempt = 0;
  private retryTimer: ReturnType<typeof setTimeout> | null = null;
  private summaryTimer: ReturnType<typeof setInterval> | null = null;
  private newest: LiveState | null = null;
  private newestMessageAt: number | null = null;
  /** Server clock minus browser clock, ms, measured at `hello`. */
  private clockOffsetMs = 0;

  private readonly now = signal(Date.now());
  private readonly linkOpen = signal(false);
  private readonly lastMessageAt = signal<number | null>(null);
  private readonly latest = signal<LiveState | null>(null);
  private readonly retryAt = signal<number | null>(null);
  private readonly latestAlarms = signal<AlarmsMessage | null>(null);
  private readonly latestChannels = signal<ChannelBands | null>(null);

  /** Latest state of the apparatus, updated a few times per second. */
  readonly live = this.latest.asReadonly();
  /**
   * Interlock state and active alarms as the server last pushed them (after hello and on every
   * change; rare, so published at once rather than with the summary). Null until the first.
   */
  readonly alarms = this.latestAlarms.asReadonly();
  /**
   * The `revision` of the newest `alarms` message: changes only when the interlock state or the
   * active list changed, not when a push merely refreshes present values. Null until the first.
   */
  readonly alarmsRevision = computed(() => this.latestAlarms()?.revision ?? null);
  /** Display bands in force as the server last pushed them (after hello and on every change). */
  readonly channels = this.latestChannels.asReadonly();
  /** Browser-clock time of the next reconnect attempt while offline. */
  readonly reconnectAt = this.retryAt.asReadonly();
  /** Current browser time, advanced with each summary; for "n s ago" texts. */
  readonly clock = this.now.asReadonly();
  readonly connection = computed(() => {
    const controller = this.latest()?.controller ?? null;
    const frameAt = controller?.lastFrameAt ? Date.parse(controller.lastFrameAt) - this.clockOffsetMs : null;
    return judgeConnection({
      nowMs: this.now(),
      linkOpen: this.linkOpen(),
      lastMessageAtMs: this.lastMessageAt(),
      lastFrameAtMs: frameAt !== null && Number.isFinite(frameAt) ? frameAt : null,
      controllerOnline: controller ? controller.online : null,
    });
  });

  /** Opens the feed (idempotent). Seeds the state from `GET /api/live` while the socket connects. */
  start(): void {
    if (this.running) return;
    this.running = true;
    this.attempt = 0;
    this.summaryTimer = setInterval(() => this.publishSummary(), SUMMARY_INTERVAL_MS);
    this.connect();
    firstValueFrom(this.http.get<LiveState>('/api/live')).then(
      (state) => {
        if (this.running && this.newest === null) this.newest = state;
      },
      () => undefined, // the socket brings the state as well; a 401 already ended the session
    );
  }

  /** Closes the feed and forgets the state (sign-out). */
  stop(): void {
    this.running = false;
    if (this.retryTimer !== null) clearTimeout(this.retryTimer);
    if (this.summaryTimer !== null) clearInterval(this.summaryTimer);
    this.retryTimer = this.summaryTimer = null;
    const socket = this.socket;
    this.socket = null;
    socket?.close(1000, 'signed out');
    this.newest = null;
    this.newestMessageAt = null;
    this.linkOpen.set(false);
    this.latest.set(null);
    this.latestAlarms.set(null);
    this.lastMessageAt.set(null);
    this.retryAt.set(null);
  }

  /** Registers a listener for sample blocks; returns the function that removes it. */
  onSamples(listener: SampleListener): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  private connect(): void {
    const token = this.session.token();
    if (!this.running || !token) return;
    this.retryAt.set(null);
    const scheme = location.protocol === 'https:' ? 'wss:' : 'ws:';
    const socket = new WebSocket(`${scheme}//${location.host}/ws`);
    this.socket = socket;
    socket.onopen = () => socket.send(JSON.stringify({ type: 'auth', token }));
    socket.onmessage = (event) => {
      if (this.socket === socket) this.receive(event.data);
    };
    socket.onclose = (event) => {
      if (this.socket !== socket) return;
      this.socket = null;
      this.linkOpen.set(false);
      if (event.code === CLOSE_NOT_SIGNED_IN) {
        // A new token (after a password change) replaced the one this socket signed in with.
        const current = this.session.token();
        if (current !== null && current !== token) return this.connect();
        this.stop();
        this.session.expire('The live feed no longer accepts your sign-in. Sign in again to continue.');
        return;
      }
      this.scheduleReconnect();
    };
  }

  private scheduleReconnect(): void {
    if (!this.running) return;
    const delay = reconnectDelayMs(this.attempt++, Math.random());
    this.retryAt.set(Date.now() + delay);
    this.retryTimer = setTimeout(() => {
      this.retryTimer = null;
      this.connect();
    }, delay);
  }

  private receive(data: unknown): void {
    if (typeof data !== 'string') return;
    let message: ServerMessage;
    try {
      message = JSON.parse(data) as ServerMessage;
    } catch {
      return; // a broken message must not stop the feed; the next one replaces it
    }
    if (message.type === 'hello') {
      // Sent again when an admin changes this account's role: the screens follow at once.
      this.session.takeUser(message.user);
      const serverTime = Date.parse(message.serverTime);
      this.clockOffsetMs = Number.isFinite(serverTime) ? serverTime - Date.now() : 0;
      this.attempt = 0;
      this.linkOpen.set(true);
    } else if (message.type === 'live') {
      this.newest = message.live;
      this.newestMessageAt = Date.now();
      this.linkOpen.set(true);
      for (const listener of this.listeners) listener(message.series, message.slow);
    } else if (message.type === 'alarms') {
      this.latestAlarms.set(message);
    } else if (message.type === 'channels') {
      this.latestChannels.set({ version: message.version, bands: message.bands });
    } else if (message.type === 'error') {
      console.warn(`Live feed: ${message.message}`);
    }
  }

  private publishSummary(): void {
    this.now.set(Date.now());
    if (this.newest !== this.latest()) this.latest.set(this.newest);
    if (this.newestMessageAt !== this.lastMessageAt()) this.lastMessageAt.set(this.newestMessageAt);
  }
}
