import type { LiveState } from '../../shared/live/live-state.js';
import type { Vec3 } from '../../shared/field/field-vector.js';
import { AXES } from '../../shared/telemetry/messages.js';
import type { ChannelValues } from './channels.js';

/** Inputs that do not live in `LiveState`. */
export interface ChannelExtras {
  /** Target field direction in the trap frame (any length) while one is set; null otherwise. */
  targetDirection?: Vec3 | null;
  /** Server time the newest telemetry frame was heard, Unix epoch ms; null or absent before the first. */
  lastFrameAtMs?: number | null;
  /** Seconds the PostgreSQL server has been unreachable (0 while reachable); absent with PGlite. */
  databaseOutageS?: number;
}

const DEG = 180 / Math.PI;

/**
 * The channel values of the live state at server time `nowMs` (Unix epoch ms). Null-safe:
 * whatever the live state does not have yet is left out, so no alarm fires on missing data;
 * the `stale` channel (ms since `extras.lastFrameAtMs`) reports the loss of data instead.
 * `stale` itself is absent until the first frame arrives, so a server that starts before its
 * controller does not alarm on a controller that has not connected yet.
 */
export function channelValues(live: LiveState, nowMs: number, extras: ChannelExtras = {}): ChannelValues {
  const out: ChannelValues = {};
  for (const axis of AXES) {
    const current = live.currents?.[axis];
    if (finite(current)) {
      out[`current.${axis}`] = Math.abs(current);
      const setpoint = live.setpoints?.[axis];
      if (finite(setpoint)) out[`currentDeviation.${axis}`] = Math.abs(current - setpoint);
    }
    setIfFinite(out, `temperature.${axis}`, live.temperatureC?.[axis]);
    setIfFinite(out, `flow.${axis}`, live.flowLpm?.[axis]);
    setIfFinite(out, `waterReturn.${axis}`, live.waterReturnC?.[axis]);
  }
  setIfFinite(out, 'waterSupply', live.waterSupplyC);
  if (live.field) {
    setIfFinite(out, 'fieldMagnitude', live.field.magnitude);
    const target = extras.targetDirection;
    if (target) setIfFinite(out, 'fieldAngleDeviation', angleBetweenDeg(live.field.vector, target));
  }
  setIfFinite(out, 'collapseRatio', live.prediction?.collapseRatio);
  const lastFrameMs = extras.lastFrameAtMs;
  if (finite(lastFrameMs)) out.stale = Math.max(0, nowMs - lastFrameMs);
  setIfFinite(out, 'databaseOutage', extras.databaseOutageS);
  return out;
}

/**
 * Angle between two vectors in degrees (0…180), or NaN when either is zero. atan2 of the
 * cross and dot products stays accurate near 0° where acos of the dot product loses digits.
 */
export function angleBetweenDeg(a: Vec3, b: Vec3): number {
  const cx = a.y * b.z - a.z * b.y;
  const cy = a.z * b.x - a.x * b.z;
  const cz = a.x * b.y - a.y * b.x;
  const cross = Math.hypot(cx, cy, cz);
  const dot = a.x * b.x + a.y * b.y + a.z * b.z;
  if (cross === 0 && dot === 0) return NaN;
  return Math.atan2(cross, dot) * DEG;
}

function finite(v: number | null | undefined): v is number {
  return typeof v === 'number' && Number.isFinite(v);
}

function setIfFinite(out: ChannelValues, id: keyof ChannelValues, v: number | null | undefined): void {
  if (finite(v)) out[id] = v;
}
