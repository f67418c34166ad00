/** How far the browser can trust what it shows. */
export type LinkState = 'live' | 'delayed' | 'stale' | 'offline';

/** Why the data is not live; null when it is. */
export type LinkReason = 'no-link' | 'no-data' | 'controller-offline' | 'old-data' | null;

export interface ConnectionInputs {
  /** Browser clock, Unix epoch ms. */
  nowMs: number;
  /** True while the WebSocket to the server is open and signed in. */
  linkOpen: boolean;
  /** When the browser last received a message, browser clock ms; null before the first. */
  lastMessageAtMs: number | null;
  /** The controller's newest frame, already converted to the browser clock (ms); null before the first. */
  lastFrameAtMs: number | null;
  /** The server's view of the controller; null when not known yet. */
  controllerOnline: boolean | null;
}

export interface ConnectionReading {
  state: LinkState;
  reason: LinkReason;
  /** Age of the newest data, ms; null when there is none. */
  dataAgeMs: number | null;
  /** Browser-clock ms of the newest data (the moment after which nothing is known); null when none. */
  newestDataAtMs: number | null;
}

/** Data older than this is shown as delayed: a frame or a push went missing. */
export const DELAYED_AFTER_MS = 400;
/** Data older than this is stale: it no longer describes the apparatus and is marked so. */
export const STALE_AFTER_MS = 1000;

/**
 * Judges the connection from timestamps alone. The data is as old as the older of "last message
 * received" and "newest controller frame in it": a server that keeps pushing while the
 * controller is silent, and a controller that keeps sending while the server push stalled, both
 * leave the browser with old numbers.
 */
export function judgeConnection(inputs: ConnectionInputs): ConnectionReading {
  const { nowMs, linkOpen, lastMessageAtMs, lastFrameAtMs, controllerOnline } = inputs;
  const newestDataAtMs = lastMessageAtMs === null || lastFrameAtMs === null ? null : Math.min(lastMessageAtMs, lastFrameAtMs);
  const dataAgeMs = newestDataAtMs === null ? null : Math.max(0, nowMs - newestDataAtMs);
  if (!linkOpen) return { state: 'offline', reason: 'no-link', dataAgeMs, newestDataAtMs };
  if (controllerOnline === false) return { state: 'stale', reason: 'controller-offline', dataAgeMs, newestDataAtMs };
  if (dataAgeMs === null) return { state: 'stale', reason: 'no-data', dataAgeMs, newestDataAtMs };
  if (dataAgeMs >= STALE_AFTER_MS) return { state: 'stale', reason: 'old-data', dataAgeMs, newestDataAtMs };
  if (dataAgeMs >= DELAYED_AFTER_MS) return { state: 'delayed', reason: 'old-data', dataAgeMs, newestDataAtMs };
  return { state: 'live', reason: null, dataAgeMs, newestDataAtMs };
}

/** True when the numbers on screen must not be presented as current. */
export function isStale(state: LinkState): boolean {
  return state === 'stale' || state === 'offline';
}
