import type { LivePrediction } from '../../shared/live/live-state.js';
import type { PredictionHistory } from '../../shared/profiles/profile-record.js';

/**
 * Room for one hour at the engine's fastest pace: it starts a prediction at most every 100 ms
 * (10/s), and a later collapse-ratio update of the same prediction replaces its entry
 * instead of adding one. Older entries are overwritten; 36,000 × 4 float64 ≈ 1.2 MB.
 */
export const HISTORY_CAPACITY = 3600 * 10;

/** Longest window `since` answers, s (the ring's bound). */
export const HISTORY_MAX_SECONDS = 3600;

/**
 * The recent live predictions in memory, for `GET /api/prediction/history` (the charts of
 * predicted β and TOF aspect beside the field angles). Parallel ring buffers; null values are
 * kept as NaN.
 */
export class PredictionHistoryRing {
  private readonly t: Float64Array;
  private readonly beta: Float64Array;
  private readonly tof: Float64Array;
  private readonly ratio: Float64Array;
  /** Newest entry's `computedAt` and profile, to recognise a ratio update of it. */
  private newestKey: string | null = null;
  private next = 0;
  private size = 0;

  constructor(private readonly capacity = HISTORY_CAPACITY) {
    this.t = new Float64Array(capacity);
    this.beta = new Float64Array(capacity);
    this.tof = new Float64Array(capacity);
    this.ratio = new Float64Array(capacity);
  }

  /** Adds a prediction at its `computedAt` time, or updates the newest entry when it is the same prediction. */
  push(p: LivePrediction): void {
    const key = keyOf(p);
    if (key === this.newestKey && this.size > 0) {
      // The same prediction with its collapse ratio: its values change, its place in time stays.
      const newest = (this.next - 1 + this.capacity) % this.capacity;
      this.write(newest, this.t[newest], p);
      return;
    }
    this.write(this.add(key), Date.parse(p.computedAt), p);
  }

  /**
   * From `atMs` (Unix epoch ms) on, the prediction does not describe the gas (field too weak
   * to orient the dipoles, or stale telemetry): an entry without values, so charts show a gap
   * until the next entry.
   */
  pushGap(atMs: number): void {
    this.write(this.add(null), atMs, null);
  }

  /** The prediction `p` describes the gas again from `atMs` (Unix epoch ms), after a gap. */
  resume(p: LivePrediction, atMs: number): void {
    this.write(this.add(keyOf(p)), atMs, p);
  }

  /** Index of a new entry (the oldest is overwritten when full). */
  private add(key: string | null): number {
    const i = this.next;
    this.next = (this.next + 1) % this.capacity;
    this.size = Math.min(this.size + 1, this.capacity);
    this.newestKey = key;
    return i;
  }

  private write(i: number, atMs: number, p: LivePrediction | null): void {
    this.t[i] = atMs;
    this.beta[i] = p?.fermiSurfaceAspect ?? Number.NaN;
    this.tof[i] = p?.tofAspect ?? Number.NaN;
    this.ratio[i] = p?.collapseRatio ?? Number.NaN;
  }

  /** The entries computed at or after `fromMs` (Unix epoch ms), oldest first. */
  since(fromMs: number): PredictionHistory {
    const out: PredictionHistory = { t: [], fermiSurfaceAspect: [], tofAspect: [], collapseRatio: [] };
    const orNull = (v: number) => (Number.isNaN(v) ? null : v);
    for (let k = 0; k < this.size; k++) {
      const i = (this.next - this.size + k + this.capacity) % this.capacity;
      if (this.t[i] < fromMs) continue;
      out.t.push(this.t[i]);
      out.fermiSurfaceAspect.push(orNull(this.beta[i]));
      out.tofAspect.push(orNull(this.tof[i]));
      out.collapseRatio.push(orNull(this.ratio[i]));
    }
    return out;
  }
}

/** A prediction's identity: its profile and when it was computed. */
function keyOf(p: LivePrediction): string {
  return `${p.profileId}@${p.computedAt}`;
}
