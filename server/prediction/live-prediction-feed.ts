import type { CalibrationBody } from '../../shared/field/calibration.js';
import type { Vec3 } from '../../shared/field/field-vector.js';
import type { ProfileRecord } from '../../shared/profiles/profile-record.js';
import { profileTrapField } from '../../shared/profiles/trap-orientation.js';
import type { LiveStore } from '../live/live-store.js';
import type { ChunkSink } from '../pipeline/telemetry-pipeline.js';
import type { PredictionEngine } from './prediction-engine.js';
import type { PredictionHistoryRing } from './prediction-history.js';

type FieldCalibration = Pick<CalibrationBody, 'gaussPerAmp' | 'offsetGauss'>;

/**
 * Connects the live telemetry to the prediction engine and its results to the live state:
 * each fast frame's mean currents become the field direction in the active profile's trap
 * frame (the profile's orientation, not the calibration's, see trap-orientation.ts); each new
 * prediction goes into the live state, the history ring and the WebSocket fan-out. Called in
 * the ingest path, so it only does a matrix product and hands over: the engine thresholds,
 * coalesces and solves in its worker thread.
 */
export class LivePredictionFeed {
  private profile: ProfileRecord | null = null;
  private lastFrame: { calibration: FieldCalibration; meanCurrentA: Vec3 } | null = null;

  constructor(
    private readonly deps: { engine: PredictionEngine; live: LiveStore; history: PredictionHistoryRing; fanout: ChunkSink },
  ) {
    deps.engine.onPrediction((p) => {
      deps.live.applyPrediction(p);
      deps.history.push(p);
      deps.fanout.publish(null, null);
    });
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
    this.deps.fanout.publish(null, null);
    const measured = this.lastFrame ? this.trapAngles(this.lastFrame.calibration, this.lastFrame.meanCurrentA) : null;
    this.deps.engine.setProfile(record.id, record.profile, measured ?? undefined);
  }

  /**
   * Takes one fast frame: `calibration` in force for it, the frame's mean currents (A) and its
   * sample time (Unix epoch ms, the engine's pacing clock). A field of |B| ≈ 0 has no direction
   * and is skipped.
   */
  addFrame(calibration: FieldCalibration, meanCurrentA: Vec3, sampleTimeMs: number): void {
    this.lastFrame = { calibration, meanCurrentA };
    const angles = this.trapAngles(calibration, meanCurrentA);
    if (angles) this.deps.engine.updateDirection(angles, sampleTimeMs);
  }

  /** Field direction in the active profile's trap frame, degrees; null without a profile or a field. */
  private trapAngles(calibration: FieldCalibration, currentA: Vec3): { thetaDeg: number; phiDeg: number } | null {
    if (!this.profile) return null;
    const { thetaDeg, phiDeg } = profileTrapField(calibration, this.profile.profile, currentA);
    return thetaDeg === null || phiDeg === null ? null : { thetaDeg, phiDeg };
  }
}
