import type * as z from 'zod/mini';
import { adcRangeCheck, CURRENT_ADC, VOLTAGE_ADC } from '../../shared/telemetry/adc.js';
import {
  AXES,
  ControllerStatus,
  FastFrame,
  MAX_PAYLOAD_BYTES,
  SlowFrame,
} from '../../shared/telemetry/messages.js';
import { TOPICS } from '../../shared/telemetry/topics.js';

/** Why a message was refused; each has its own counter in `/api/health`. */
export const REJECT_REASONS = [
  'oversized',
  'malformed-json',
  'non-finite',
  'schema',
  'length-mismatch',
  'out-of-range',
  'out-of-order',
  'sequence-jump',
  'clock-skew',
  'unknown-topic',
] as const;
export type RejectReason = (typeof REJECT_REASONS)[number];

export type AdmittedMessage =
  | { kind: 'fast'; frame: FastFrame }
  | { kind: 'slow'; frame: SlowFrame }
  | { kind: 'status'; status: ControllerStatus };

export interface IngestCounters {
  /** Messages admitted, all topics. */
  accepted: number;
  acceptedByKind: { fast: number; slow: number; status: number };
  rejected: number;
  rejectedByReason: Record<RejectReason, number>;
  /**
   * Fast frames missing from the sequence (gaps in `seq` between admitted frames); a refused
   * frame that carried a sequence number is therefore also counted here.
   */
  lost: number;
  /** Slow frames missing from the sequence. */
  lostSlow: number;
  /** Times sequence tracking started again after `RESYNC_AFTER` refusals in a row (fast and slow). */
  resyncs: number;
  /** Server time of the newest refusal, ISO 8601 UTC; null before the first. */
  lastRejectedAt: string | null;
  lastRejectReason: RejectReason | null;
}

/** Frames stamped earlier than this before the server clock are refused (ms): buffered data may come late. */
export const MAX_CLOCK_SKEW_MS = 3600_000;
/** Samples stamped later than this after the server clock are refused (ms): clocks are synchronised. */
export const MAX_FUTURE_MS = 10_000;
/** Fast-channel sample rates the gate admits, Hz (the demo controller samples at 1 kHz). */
export const RATE_BOUNDS_HZ = { min: 10, max: 100_000 } as const;
/** Largest forward step of `seq` taken as lost frames; a larger step is refused as a jump. */
export const MAX_SEQ_STEP = 10_000;
/** After this many refusals in a row for `seq` alone, the next valid frame restarts sequence tracking. */
export const RESYNC_AFTER = 25;

/**
 * Physical bounds of the slow channels (what their sensors can report; beyond them a reading
 * is refused, never stored). Common practice for coil-cooling instrumentation.
 */
export const SLOW_BOUNDS = {
  /** Coil temperature, °C. */
  coilTempC: { min: -50, max: 300 },
  /** Coolant flow, L/min (a little below zero for sensor noise around no flow). */
  flowLpm: { min: -1, max: 200 },
  /** Cooling-water temperature, °C. */
  waterC: { min: -20, max: 120 },
} as const;

/** Per stream (fast or slow): the last admitted `seq` and the refusals in a row for `seq` alone. */
class SequenceTrack {
  last: number | null = null;
  refusedInARow = 0;

  /** Why `seq` cannot follow the last admitted one, or null when it can. */
  check(seq: number): RejectReason | null {
    if (this.last === null || this.refusedInARow >= RESYNC_AFTER) return null;
    if (seq <= this.last) return 'out-of-order';
    if (seq - this.last > MAX_SEQ_STEP) return 'sequence-jump';
    return null;
  }

  /** Takes an admitted `seq`; returns the frames lost before it, or null when tracking restarted. */
  admit(seq: number): number | null {
    const resync = this.last !== null && this.refusedInARow >= RESYNC_AFTER;
    const lost = this.last === null || resync ? 0 : seq - this.last - 1;
    this.last = seq;
    this.refusedInARow = 0;
    return resync ? null : lost;
  }

  reset(): void {
    this.last = null;
    this.refusedInARow = 0;
  }
}

/**
 * The edge of the pipeline: every MQTT message passes here before anything uses it. Checks,
 * in order: size (before parsing), JSON, finite numbers, schema, equal sample-array lengths,
 * physical bounds (sample rate, every sample within its converter's range, slow readings
 * within their sensors' range, setpoints within the current converter's range), timestamps
 * (every sample no more than 1 h before and 10 s after the server clock), and `seq` per stream
 * (strictly increasing, by at most `MAX_SEQ_STEP`). A refused message is counted by reason and
 * dropped; nothing here throws, and a refused message changes no state, so one crafted frame
 * cannot blind intake.
 *
 * Sequence tracking recovers by itself: a controller that restarts begins again at `seq` 0
 * (recognised by a status turning `online` true after it was false), and after `RESYNC_AFTER`
 * valid frames in a row refused for their `seq` alone, the next valid frame starts tracking
 * again (counted in `resyncs`).
 */
export class FrameGate {
  private readonly fastSeq = new SequenceTrack();
  private readonly slowSeq = new SequenceTrack();
  private controllerOnline: boolean | null = null;
  private lastRejectedMs: number | null = null;
  private readonly counts: Omit<IngestCounters, 'lastRejectedAt'> = {
    accepted: 0,
    acceptedByKind: { fast: 0, slow: 0, status: 0 },
    rejected: 0,
    rejectedByReason: Object.fromEntries(REJECT_REASONS.map((r) => [r, 0])) as Record<RejectReason, number>,
    lost: 0,
    lostSlow: 0,
    resyncs: 0,
    lastRejectReason: null,
  };

  /** @param now server clock, epoch ms (replaceable so tests can place frames in time) */
  constructor(private readonly now: () => number = Date.now) {}

  /** The validated message, or null when it was refused (and counted). */
  admit(topic: string, payload: Uint8Array): AdmittedMessage | null {
    if (payload.byteLength > MAX_PAYLOAD_BYTES) return this.reject('oversized');
    switch (topic) {
      case TOPICS.fast:
        return this.admitFast(payload);
      case TOPICS.slow:
        return this.admitSlow(payload);
      case TOPICS.status:
        return this.admitStatus(payload);
      default:
        return this.reject('unknown-topic');
    }
  }

  counters(): IngestCounters {
    return {
      ...structuredClone(this.counts),
      lastRejectedAt: this.lastRejectedMs === null ? null : new Date(this.lastRejectedMs).toISOString(),
    };
  }

  /** Server time of the newest refusal, epoch ms; null before the first. */
  lastRejectedAtMs(): number | null {
    return this.lastRejectedMs;
  }

  private admitFast(payload: Uint8Array): AdmittedMessage | null {
    const frame = this.parse(payload, FastFrame);
    if (typeof frame === 'string') return this.reject(frame);
    const n = frame.currentA.x.length;
    const arrays = [frame.currentA.y, frame.currentA.z, frame.voltageV.x, frame.voltageV.y, frame.voltageV.z];
    if (arrays.some((a) => a.length !== n)) return this.reject('length-mismatch');
    if (!fastInBounds(frame)) return this.reject('out-of-range');
    if (this.skewed(frame.t0Ms) || this.skewed(frame.t0Ms + ((n - 1) * 1000) / frame.rateHz)) return this.reject('clock-skew');
    const order = this.fastSeq.check(frame.seq);
    if (order) return this.rejectSeq(this.fastSeq, order);
    this.countLost('lost', this.fastSeq.admit(frame.seq));
    return this.accept({ kind: 'fast', frame });
  }

  private admitSlow(payload: Uint8Array): AdmittedMessage | null {
    const frame = this.parse(payload, SlowFrame);
    if (typeof frame === 'string') return this.reject(frame);
    if (!slowInBounds(frame)) return this.reject('out-of-range');
    if (this.skewed(frame.tMs)) return this.reject('clock-skew');
    const order = this.slowSeq.check(frame.seq);
    if (order) return this.rejectSeq(this.slowSeq, order);
    this.countLost('lostSlow', this.slowSeq.admit(frame.seq));
    return this.accept({ kind: 'slow', frame });
  }

  private countLost(counter: 'lost' | 'lostSlow', lost: number | null): void {
    if (lost === null) this.counts.resyncs++;
    else this.counts[counter] += lost;
  }

  private rejectSeq(track: SequenceTrack, reason: RejectReason): null {
    track.refusedInARow++;
    return this.reject(reason);
  }

  private admitStatus(payload: Uint8Array): AdmittedMessage | null {
    // No clock check: a retained status (or last will) may rightly be old.
    const status = this.parse(payload, ControllerStatus);
    if (typeof status === 'string') return this.reject(status);
    if (status.online && this.controllerOnline === false) {
      this.fastSeq.reset();
      this.slowSeq.reset();
    }
    this.controllerOnline = status.online;
    return this.accept({ kind: 'status', status });
  }

  /** The validated value, or the reason it failed. */
  private parse<T extends z.ZodMiniType>(payload: Uint8Array, schema: T): z.infer<T> | RejectReason {
    let value: unknown;
    try {
      value = JSON.parse(Buffer.from(payload.buffer, payload.byteOffset, payload.byteLength).toString('utf8'));
    } catch {
      return 'malformed-json';
    }
    const parsed = schema.safeParse(value);
    if (parsed.success) return parsed.data as z.infer<T>;
    // JSON.parse turns an overflowing literal such as 1e999 into ±Infinity.
    return hasNonFinite(value) ? 'non-finite' : 'schema';
  }

  /** True when a sample time lies too far before or after the server clock. */
  private skewed(tMs: number): boolean {
    const now = this.now();
    return !(tMs >= now - MAX_CLOCK_SKEW_MS && tMs <= now + MAX_FUTURE_MS);
  }

  private accept(message: AdmittedMessage): AdmittedMessage {
    this.counts.accepted++;
    this.counts.acceptedByKind[message.kind]++;
    return message;
  }

  private reject(reason: RejectReason): null {
    this.counts.rejected++;
    this.counts.rejectedByReason[reason]++;
    this.counts.lastRejectReason = reason;
    this.lastRejectedMs = this.now();
    return null;
  }
}

const within = (v: number, b: { min: number; max: number }) => v >= b.min && v <= b.max;

/** Rate, every sample and the setpoints within what the controller's converters can report. */
const currentInRange = adcRangeCheck(CURRENT_ADC);
const voltageInRange = adcRangeCheck(VOLTAGE_ADC);

function fastInBounds(frame: FastFrame): boolean {
  if (!within(frame.rateHz, RATE_BOUNDS_HZ)) return false;
  for (const axis of AXES) {
    if (!currentInRange(frame.setpointA[axis])) return false;
    for (const v of frame.currentA[axis]) if (!currentInRange(v)) return false;
    for (const v of frame.voltageV[axis]) if (!voltageInRange(v)) return false;
  }
  return true;
}

/** Every slow reading within its sensor's range. */
function slowInBounds(frame: SlowFrame): boolean {
  if (!within(frame.waterSupplyC, SLOW_BOUNDS.waterC)) return false;
  return AXES.every(
    (axis) =>
      within(frame.coilTempC[axis], SLOW_BOUNDS.coilTempC) &&
      within(frame.flowLpm[axis], SLOW_BOUNDS.flowLpm) &&
      within(frame.waterReturnC[axis], SLOW_BOUNDS.waterC),
  );
}

function hasNonFinite(value: unknown, depth = 0): boolean {
  if (typeof value === 'number') return !Number.isFinite(value);
  if (depth > 8 || typeof value !== 'object' || value === null) return false;
  for (const v of Array.isArray(value) ? value : Object.values(value)) {
    if (hasNonFinite(v, depth + 1)) return true;
  }
  return false;
}
