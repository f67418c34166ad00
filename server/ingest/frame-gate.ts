import type * as z from 'zod/mini';
import {
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
  'out-of-order',
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
}

/** Frames stamped further than this from the server clock are refused (ms). */
export const MAX_CLOCK_SKEW_MS = 3600_000;

/**
 * The edge of the pipeline: every MQTT message passes here before anything uses it. Checks,
 * in order: size (before parsing), JSON, finite numbers, schema, equal sample-array lengths,
 * strictly increasing `seq` per stream, and timestamps within ±1 h of the server clock.
 * A refused message is counted by reason and dropped; nothing here throws.
 *
 * A controller that restarts begins again at `seq` 0; its new session is recognised by a
 * status message turning `online` true after it was false, which resets sequence tracking.
 */
export class FrameGate {
  private lastFastSeq: number | null = null;
  private lastSlowSeq: number | null = null;
  private controllerOnline: boolean | null = null;
  private readonly counts: IngestCounters = {
    accepted: 0,
    acceptedByKind: { fast: 0, slow: 0, status: 0 },
    rejected: 0,
    rejectedByReason: Object.fromEntries(REJECT_REASONS.map((r) => [r, 0])) as Record<RejectReason, number>,
    lost: 0,
    lostSlow: 0,
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
    return structuredClone(this.counts);
  }

  private admitFast(payload: Uint8Array): AdmittedMessage | null {
    const frame = this.parse(payload, FastFrame);
    if (typeof frame === 'string') return this.reject(frame);
    const n = frame.currentA.x.length;
    const arrays = [frame.currentA.y, frame.currentA.z, frame.voltageV.x, frame.voltageV.y, frame.voltageV.z];
    if (arrays.some((a) => a.length !== n)) return this.reject('length-mismatch');
    if (this.lastFastSeq !== null && frame.seq <= this.lastFastSeq) return this.reject('out-of-order');
    if (this.skewed(frame.t0Ms)) return this.reject('clock-skew');
    if (this.lastFastSeq !== null) this.counts.lost += frame.seq - this.lastFastSeq - 1;
    this.lastFastSeq = frame.seq;
    return this.accept({ kind: 'fast', frame });
  }

  private admitSlow(payload: Uint8Array): AdmittedMessage | null {
    const frame = this.parse(payload, SlowFrame);
    if (typeof frame === 'string') return this.reject(frame);
    if (this.lastSlowSeq !== null && frame.seq <= this.lastSlowSeq) return this.reject('out-of-order');
    if (this.skewed(frame.tMs)) return this.reject('clock-skew');
    if (this.lastSlowSeq !== null) this.counts.lostSlow += frame.seq - this.lastSlowSeq - 1;
    this.lastSlowSeq = frame.seq;
    return this.accept({ kind: 'slow', frame });
  }

  private admitStatus(payload: Uint8Array): AdmittedMessage | null {
    // No clock check: a retained status (or last will) may rightly be old.
    const status = this.parse(payload, ControllerStatus);
    if (typeof status === 'string') return this.reject(status);
    if (status.online && this.controllerOnline === false) {
      this.lastFastSeq = null;
      this.lastSlowSeq = null;
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

  private skewed(tMs: number): boolean {
    return Math.abs(tMs - this.now()) > MAX_CLOCK_SKEW_MS;
  }

  private accept(message: AdmittedMessage): AdmittedMessage {
    this.counts.accepted++;
    this.counts.acceptedByKind[message.kind]++;
    return message;
  }

  private reject(reason: RejectReason): null {
    this.counts.rejected++;
    this.counts.rejectedByReason[reason]++;
    return null;
  }
}

function hasNonFinite(value: unknown, depth = 0): boolean {
  if (typeof value === 'number') return !Number.isFinite(value);
  if (depth > 8 || typeof value !== 'object' || value === null) return false;
  for (const v of Array.isArray(value) ? value : Object.values(value)) {
    if (hasNonFinite(v, depth + 1)) return true;
  }
  return false;
}
