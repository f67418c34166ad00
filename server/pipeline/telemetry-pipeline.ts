import type { Calibration } from '../../shared/field/calibration.js';
import { fieldUncertainty } from '../../shared/field/field-uncertainty.js';
import { fieldFromCurrents, type Vec3 } from '../../shared/field/field-vector.js';
import type { LiveState } from '../../shared/live/live-state.js';
import type { ControllerStatus, FastFrame, SlowFrame } from '../../shared/telemetry/messages.js';
import type { CalibrationCache } from '../field/calibration-cache.js';
import type { AdmittedMessage } from '../ingest/frame-gate.js';
import { BlockDecimator } from '../live/block-decimator.js';
import type { LiveSink } from '../live/live-sink.js';
import type { LiveStore } from '../live/live-store.js';
import { mean } from '../live/live-store.js';
import { appendSeriesPoint, appendSlowPoint, DECIMATION_BLOCK_MS, emptySeriesChunk, emptySlowChunk } from '../live/series-chunk.js';
import type { RollupAccumulator } from '../storage/rollup-accumulator.js';
import type { TelemetryWriter } from '../storage/telemetry-writer.js';

/** A message the pipeline applied, with what it produced: passed on to supervision as values. */
export interface AppliedMessage {
  message: AdmittedMessage;
  /** The live state after the message. */
  live: LiveState;
  /** Server time the newest fast frame arrived, Unix epoch ms; null before the first. */
  lastFrameAtMs: number | null;
}

/** What the pipeline hands each fast frame's mean currents to (the live prediction feed). */
export interface FrameDirectionSink {
  addFrame(calibration: Calibration, meanCurrentA: Vec3, sampleTimeMs: number): void;
}

/**
 * The one-way flow after the edge: validated frame → field (active calibration) → live state
 * and the prediction feed → roll-ups and storage → fan-out, and the result returned for
 * supervision. Runs synchronously in the MQTT message handler and never awaits, so nothing
 * downstream (database, browsers) can hold ingest up.
 */
export class TelemetryPipeline {
  private readonly decimator = new BlockDecimator(DECIMATION_BLOCK_MS);

  constructor(
    private readonly deps: {
      calibrations: CalibrationCache;
      live: LiveStore;
      rollups: RollupAccumulator;
      writer: TelemetryWriter;
      fanout: LiveSink;
      /** Takes each frame's mean currents for the live prediction (it only hands over to a worker). */
      prediction: FrameDirectionSink;
      now?: () => number;
    },
  ) {}

  handle(message: AdmittedMessage): AppliedMessage {
    switch (message.kind) {
      case 'fast':
        this.handleFast(message.frame);
        break;
      case 'slow':
        this.handleSlow(message.frame);
        break;
      case 'status':
        this.handleStatus(message.status);
        break;
    }
    const { live } = this.deps;
    return { message, live: live.snapshot(), lastFrameAtMs: live.lastFrameAtMs() };
  }

  private handleFast(frame: FastFrame): void {
    const { calibrations, live, rollups, writer, fanout, prediction } = this.deps;
    const calibration = calibrations.active();
    const series = emptySeriesChunk();
    this.decimator.push(frame.t0Ms, frame.rateHz, frame.currentA.x, frame.currentA.y, frame.currentA.z, (tMs, x, y, z) => {
      const current = { x, y, z };
      const field = fieldFromCurrents(calibration, current);
      appendSeriesPoint(series, tMs, current, field);
      rollups.addFieldPoint(tMs, field);
    });
    const meanCurrent = { x: mean(frame.currentA.x), y: mean(frame.currentA.y), z: mean(frame.currentA.z) };
    // σ|B|, σθ, σφ from the calibration's parameter covariance, at the frame's mean currents.
    const uncertainty = calibration.covariance ? fieldUncertainty(calibration, calibration.covariance, meanCurrent) : null;
    live.applyFast(frame, meanCurrent, fieldFromCurrents(calibration, meanCurrent), calibration, (this.deps.now ?? Date.now)(), uncertainty);
    prediction.addFrame(calibration, meanCurrent, frame.t0Ms);
    rollups.addFast(frame);
    if (uncertainty) rollups.addUncertainty(frame.t0Ms + ((frame.currentA.x.length - 1) * 500) / frame.rateHz, uncertainty);
    writer.addFast(frame, calibration.id);
    if (series.t.length > 0) fanout.publishSeries(series);
  }

  private handleSlow(frame: SlowFrame): void {
    const { live, rollups, writer, fanout } = this.deps;
    live.applySlow(frame);
    rollups.addSlow(frame);
    writer.addSlow(frame);
    const slow = emptySlowChunk();
    appendSlowPoint(slow, frame.tMs, frame.coilTempC, frame.flowLpm);
    fanout.publishSlow(slow);
  }

  private handleStatus(status: ControllerStatus): void {
    this.deps.live.applyStatus(status);
    this.deps.fanout.publishStateChange();
  }
}
