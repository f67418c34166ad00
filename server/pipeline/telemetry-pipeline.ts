import { fieldUncertainty } from '../../shared/field/field-uncertainty.js';
import { fieldFromCurrents } from '../../shared/field/field-vector.js';
import type { SeriesChunk, SlowChunk } from '../../shared/live/live-state.js';
import type { ControllerStatus, FastFrame, SlowFrame } from '../../shared/telemetry/messages.js';
import type { CalibrationCache } from '../field/calibration-cache.js';
import type { AdmittedMessage } from '../ingest/frame-gate.js';
import { BlockDecimator } from '../live/block-decimator.js';
import type { LiveStore } from '../live/live-store.js';
import { mean } from '../live/live-store.js';
import { appendSeriesPoint, appendSlowPoint, DECIMATION_BLOCK_MS, emptySeriesChunk, emptySlowChunk } from '../live/series-chunk.js';
import type { LivePredictionFeed } from '../prediction/live-prediction-feed.js';
import type { RollupAccumulator } from '../storage/rollup-accumulator.js';
import type { TelemetryWriter } from '../storage/telemetry-writer.js';

/** Where the pipeline's chart points go (the WebSocket fan-out). */
export interface ChunkSink {
  publish(series: SeriesChunk | null, slow: SlowChunk | null): void;
}

/**
 * The one-way flow after the edge: validated frame → field (active calibration) → live state
 * and the prediction feed → roll-ups and storage → fan-out. Runs synchronously in the MQTT message handler and never
 * awaits, so nothing downstream (database, browsers) can hold ingest up.
 */
export class TelemetryPipeline {
  private readonly decimator = new BlockDecimator(DECIMATION_BLOCK_MS);

  constructor(
    private readonly deps: {
      calibrations: CalibrationCache;
      live: LiveStore;
      rollups: RollupAccumulator;
      writer: TelemetryWriter;
      fanout: ChunkSink;
      /** Takes each frame's mean currents for the live prediction (it only hands over to a worker). */
      prediction: Pick<LivePredictionFeed, 'addFrame'>;
      now?: () => number;
    },
  ) {}

  handle(message: AdmittedMessage): void {
    switch (message.kind) {
      case 'fast':
        return this.handleFast(message.frame);
      case 'slow':
        return this.handleSlow(message.frame);
      case 'status':
        return this.handleStatus(message.status);
    }
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
    writer.addFast(frame, calibration.id);
    if (series.t.length > 0) fanout.publish(series, null);
  }

  private handleSlow(frame: SlowFrame): void {
    const { live, rollups, writer, fanout } = this.deps;
    live.applySlow(frame);
    rollups.addSlow(frame);
    writer.addSlow(frame);
    const slow = emptySlowChunk();
    appendSlowPoint(slow, frame.tMs, frame.coilTempC, frame.flowLpm);
    fanout.publish(null, slow);
  }

  private handleStatus(status: ControllerStatus): void {
    this.deps.live.applyStatus(status);
    this.deps.fanout.publish(null, null);
  }
}
