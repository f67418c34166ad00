import type { Calibration } from '../../shared/field/calibration.js';
import type { FieldUncertainty } from '../../shared/field/field-uncertainty.js';
import type { FieldState } from '../../shared/field/field-vector.js';
import type { LivePrediction, LiveState, PerAxis, PredictionStatus } from '../../shared/live/live-state.js';
import type { ControllerStatus, FastFrame, SlowFrame } from '../../shared/telemetry/messages.js';

/**
 * The latest known state of the apparatus (`GET /api/live`, WebSocket `live`). Fed by the
 * telemetry pipeline with validated frames only; readers get immutable snapshots.
 */
export class LiveStore {
  private state: LiveState = {
    time: null,
    currents: null,
    setpoints: null,
    voltageV: null,
    temperatureC: null,
    flowLpm: null,
    waterSupplyC: null,
    waterReturnC: null,
    field: null,
    fieldUncertainty: null,
    calibration: null,
    controller: {
      online: false,
      tripped: false,
      hardwareTripped: false,
      hardwareTripCause: null,
      softwareHold: false,
      mode: null,
      lastFrameAt: null,
    },
    prediction: null,
    predictionStatus: { state: 'no-telemetry', fieldG: null, minFieldG: null, reason: 'No telemetry yet.' },
  };
  private newestSampleMs = -Infinity;
  private lastFrameMs: number | null = null;

  /**
   * Takes a fast frame: mean currents (A) and voltages (V) of the frame, the field of the mean
   * currents through `calibration` with its uncertainty (null when the calibration has no
   * covariance), and `receivedAtMs` (server clock) as `lastFrameAt`, which
   * clients compare with their own clock to judge staleness.
   */
  applyFast(
    frame: FastFrame,
    meanCurrentA: PerAxis<number>,
    field: FieldState,
    calibration: Calibration,
    receivedAtMs: number,
    fieldUncertainty: FieldUncertainty | null = null,
  ): void {
    const n = frame.currentA.x.length;
    const lastSampleMs = frame.t0Ms + ((n - 1) * 1000) / frame.rateHz;
    this.newestSampleMs = Math.max(this.newestSampleMs, lastSampleMs);
    this.update({
      time: new Date(this.newestSampleMs).toISOString(),
      currents: meanCurrentA,
      setpoints: { ...frame.setpointA },
      voltageV: { x: mean(frame.voltageV.x), y: mean(frame.voltageV.y), z: mean(frame.voltageV.z) },
      field,
      fieldUncertainty,
      calibration: { id: calibration.id, version: calibration.version, label: calibration.label },
      controller: { ...this.state.controller, lastFrameAt: new Date(receivedAtMs).toISOString() },
    });
    this.lastFrameMs = receivedAtMs;
  }

  /** Server time the newest fast frame arrived, Unix epoch ms; null before the first. */
  lastFrameAtMs(): number | null {
    return this.lastFrameMs;
  }

  applySlow(frame: SlowFrame): void {
    this.update({
      temperatureC: { ...frame.coilTempC },
      flowLpm: { ...frame.flowLpm },
      waterSupplyC: frame.waterSupplyC,
      waterReturnC: { ...frame.waterReturnC },
    });
  }

  applyStatus(status: ControllerStatus): void {
    this.update({
      controller: {
        ...this.state.controller,
        online: status.online,
        tripped: status.hardwareTripped || status.softwareHold,
        hardwareTripped: status.hardwareTripped,
        hardwareTripCause: status.hardwareTripCause,
        softwareHold: status.softwareHold,
        mode: status.mode,
      },
    });
  }

  /** Takes the newest prediction for the measured field direction (null: none available). */
  applyPrediction(prediction: LivePrediction | null): void {
    this.update({ prediction });
  }

  /** Takes whether the prediction describes the gas now. */
  applyPredictionStatus(predictionStatus: PredictionStatus): void {
    this.update({ predictionStatus });
  }

  /**
   * The current state, never copied: every update replaces the top-level object and the parts
   * it changes with new objects, so a snapshot taken earlier stays as it was. Callers must not
   * change it.
   */
  snapshot(): LiveState {
    return this.state;
  }

  private update(patch: Partial<LiveState>): void {
    this.state = { ...this.state, ...patch };
  }
}

/** Arithmetic mean of a non-empty array. */
export function mean(values: readonly number[]): number {
  let sum = 0;
  for (const v of values) sum += v;
  return sum / values.length;
}
