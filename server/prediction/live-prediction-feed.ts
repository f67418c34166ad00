import type { CalibrationBody } from '../../shared/field/calibration.js';
import type { LivePrediction } from '../../shared/live/live-state.js';
import type { Vec3 } from '../../shared/field/field-vector.js';
import type { ProfileRecord } from '../../shared/profiles/profile-record.js';
import { profileTrapField } from '../../shared/profiles/trap-orientation.js';
import type { LiveStore } from '../live/live-store.js';
import type { LiveSink } from '../live/live-sink.js';
import type { PredictionEngine } from './prediction-engine.js';
import type { PredictionHistoryRing } from './prediction-history.js';
import type { PredictionStatusLog } from './prediction-status-log.js';
import { predictionStatus, sameStatus } from './prediction-status.js';

/** How often the feed checks, without frames, whether telemetry went stale, ms. */
const STATUS_CHECK_MS = 100;

type FieldCalibration = Pick<CalibrationBody, 'gaussPerAmp' | 'offsetGauss'>;

/**
 * Connects the live telemetry to the prediction engine and its results to the live state:
 * each fast frame's mean currents become the field direction in the active profile's trap
 * frame (the profile's orientation, not the calibration's, see trap-orientation.ts); each new
 * prediction goes into the live state, the history ring, telemetry storage and the WebSocket fan-out. Called in
 * the ingest path, so it only does a matrix product and hands over: the engine thresholds,
 * coalesces and solves in its worker thread. It also keeps the live state's `predictionStatus`:
 * whether the prediction describes the gas now (|B| strong enough to orient the dipoles, as
 * the lead sets it in the level set, and telemetry not stale), checked on every frame and on a timer,
 * and hands each change to the status log for Replay.
 * The owner calls `close()`.
 */
export class LivePredictionFeed {
  private profile: ProfileRecord | null = null;
  private lastFrame: { calibration: FieldCalibration; meanCurrentA: Vec3; fieldG: number; atMs: number } | null = null;
  private readonly timer: NodeJS.Timeout;
  private readonly now: () => number;
  private minOrientingFieldG: number;

  constructor(
    private readonly deps: {
      engine: PredictionEngine;
      live: LiveStore;
      history: PredictionHistoryRing;
      /** Keeps each prediction for history past the ring's hour (the telemetry writer). */
      store: { addPrediction(p: LivePrediction): void };
      /** Keeps each change of the status for Replay (only appends on this path). */
      statusLog: Pick<PredictionStatusLog, 'record'>;
      fanout: Pick<LiveSink, 'publishStateChange'>;
      /** Telemetry older than this is stale, ms (the interlock's stale limit). */
      staleMs: number;
      /** The least field that orients the dipoles, G, until `setMinOrientingField`. */
      minOrientingFieldG: number;
      /** Server clock, Unix epoch ms (default `Date.now`). */
      now?: () => number;
    },
  ) {
    this.now = deps.now ?? Date.now;
    this.minOrientingFieldG = deps.minOrientingFieldG;
    deps.engine.onPrediction((p) => {
      deps.live.applyPrediction(p);
      // While the prediction does not apply, the chart history keeps its gap (see updateStatus).
      if (deps.live.snapshot().predictionStatus.state === 'applies') deps.history.push(p);
      deps.store.addPrediction(p);
      deps.fanout.publishStateChange();
    });
    this.timer = setInterval(() => this.updateStatus(), STATUS_CHECK_MS);
    this.timer.unref();
  }

  /** Takes a new least field that orients the dipoles, G (a lead changed the level set). */
  setMinOrientingField(fieldG: number): void {
    this.minOrientingFieldG = fieldG;
    this.updateStatus();
  }

  /** Stops the staleness check. */
  close(): void {
    clearInterval(this.timer);
  }

  /** The active profile, or null before the first `setProfile`. */
  activeProfile(): ProfileRecord | null {
    return this.profile;
  }

  /** The active profile's id, or null before the first `setProfile`. */
  activeProfileId(): number | null {
    return this.profile?.id ?? null;
  }

  /**
   * Makes `record` the profile predictions are made for. The live prediction is cleared until
   * the new profile's first result, and the last measured currents are turned into the new
   * trap frame at once so the engine does not start from a direction in the old one.
   */
  setProfile(record: ProfileRecord): void {
    this.profile = record;
    this.deps.live.applyPrediction(null);
    this.deps.fanout.publishStateChange();
    this.updateStatus();
    const measured = this.lastFrame ? this.trapAngles(this.lastFrame.calibration, this.lastFrame.meanCurrentA) : null;
    this.deps.engine.setProfile(record.id, record.profile, measured ?? undefined);
  }

  /**
   * Takes one fast frame: `calibration` in force for it, the frame's mean currents (A) and its
   * sample time (Unix epoch ms, the engine's pacing clock). A field of |B| ≈ 0 has no direction
   * and is skipped.
   */
  addFrame(calibration: FieldCalibration, meanCurrentA: Vec3, sampleTimeMs: number): void {
    // |B| does not depend on the frame; without a profile the coil frame gives it.
    const field = profileTrapField(calibration, this.profile?.profile ?? {}, meanCurrentA);
    this.lastFrame = { calibration, meanCurrentA, fieldG: field.magnitude, atMs: this.now() };
    if (this.profile && field.thetaDeg !== null && field.phiDeg !== null) {
      this.deps.engine.updateDirection({ thetaDeg: field.thetaDeg, phiDeg: field.phiDeg }, sampleTimeMs);
    }
    this.updateStatus();
  }

  /** Publishes whether the prediction applies now, when that changed. */
  private updateStatus(): void {
    const last = this.lastFrame;
    const nowMs = this.now();
    const next = predictionStatus({
      fieldG: last?.fieldG ?? null,
      lastFrameAtMs: last?.atMs ?? null,
      nowMs,
      staleMs: this.deps.staleMs,
      minFieldG: this.minOrientingFieldG,
    });
    const { predictionStatus: previous, prediction } = this.deps.live.snapshot();
    if (sameStatus(next, previous)) return;
    // The chart history shows a gap while the prediction does not describe the gas.
    if (previous.state === 'applies' && next.state !== 'applies') this.deps.history.pushGap(nowMs);
    if (previous.state !== 'applies' && next.state === 'applies' && prediction) this.deps.history.resume(prediction, nowMs);
    this.deps.live.applyPredictionStatus(next);
    this.deps.statusLog.record(next, nowMs, last?.atMs ?? null);
    this.deps.fanout.publishStateChange();
  }

  /** Field direction in the active profile's trap frame, degrees; null without a profile or a field. */
  private trapAngles(calibration: FieldCalibration, currentA: Vec3): { thetaDeg: number; phiDeg: number } | null {
    if (!this.profile) return null;
    const { thetaDeg, phiDeg } = profileTrapField(calibration, this.profile.profile, currentA);
    return thetaDeg === null || phiDeg === null ? null : { thetaDeg, phiDeg };
  }
}
