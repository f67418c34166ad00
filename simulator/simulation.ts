import { adcReading } from '../shared/telemetry/adc.js';
import type { ControllerStatus, FastFrame, SlowFrame } from '../shared/telemetry/messages.js';
import type { ControllerParameters } from '../shared/apparatus/coil-data.js';
import { Plant } from './plant.js';
import { SetpointSource } from './setpoint-source.js';

export interface SimulationOptions {
  params: ControllerParameters;
  /** Simulation start, UTC epoch ms. */
  startMs: number;
  sampleRateHz: number;
  /** Duration of one fast frame, ms; must hold a whole number of samples (1…1000). */
  frameMs: number;
  seed: number;
  thermalSpeedup: number;
  demo: boolean;
  demoIdleMs: number;
}

/** Period of the slow channels (10 Hz), ms. */
export const SLOW_PERIOD_MS = 100;

/** What one fast frame period produced: the fast frame and the slow frames that fell in it. */
export interface FramePeriod {
  fast: FastFrame;
  slow: SlowFrame[];
}

/**
 * The whole controller without I/O: the plant, the setpoint source and the frame sequencing.
 * `nextFrame()` advances the model by one frame period and returns the telemetry it produced.
 */
export class Simulation {
  readonly plant: Plant;
  readonly setpoints: SetpointSource;
  readonly samplesPerFrame: number;
  private fastSeq = 0;
  private slowSeq = 0;
  private nextSlowMs: number;

  constructor(private readonly opts: SimulationOptions) {
    const samples = (opts.frameMs * opts.sampleRateHz) / 1000;
    if (!Number.isInteger(samples) || samples < 1 || samples > 1000) {
      throw new Error(
        `frameMs × sampleRateHz / 1000 must be a whole number of samples between 1 and 1000 (got ${samples}); ` +
          'choose frameMs and sampleRateHz to match, e.g. 20 ms at 1000 Hz',
      );
    }
    if (!(opts.thermalSpeedup > 0)) throw new Error(`thermalSpeedup must be a positive number (got ${opts.thermalSpeedup})`);
    this.samplesPerFrame = samples;
    this.plant = new Plant(opts);
    this.setpoints = new SetpointSource(opts);
    this.nextSlowMs = opts.startMs;
  }

  /** Simulation time, UTC epoch ms. */
  get nowMs(): number {
    return this.plant.nowMs;
  }

  /** Advances one frame period and returns its telemetry. */
  nextFrame(): FramePeriod {
    const n = this.samplesPerFrame;
    const t0Ms = this.plant.nowMs;
    const setpointA = this.setpoints.setpointAt(t0Ms);
    const fast: FastFrame = {
      seq: this.fastSeq++,
      t0Ms,
      rateHz: this.opts.sampleRateHz,
      currentA: { x: new Array<number>(n), y: new Array<number>(n), z: new Array<number>(n) },
      voltageV: { x: new Array<number>(n), y: new Array<number>(n), z: new Array<number>(n) },
      setpointA,
    };
    const slow: SlowFrame[] = [];
    for (let i = 0; i < n; i++) {
      if (this.plant.nowMs >= this.nextSlowMs) {
        slow.push({ seq: this.slowSeq++, tMs: this.plant.nowMs, ...this.plant.measureSlow() });
        this.nextSlowMs += SLOW_PERIOD_MS;
      }
      const reading = this.plant.measureFast();
      const { currentA, voltageV } = this.opts.params.adc;
      fast.currentA.x[i] = adcReading(currentA, reading.currentA.x);
      fast.currentA.y[i] = adcReading(currentA, reading.currentA.y);
      fast.currentA.z[i] = adcReading(currentA, reading.currentA.z);
      fast.voltageV.x[i] = adcReading(voltageV, reading.voltageV.x);
      fast.voltageV.y[i] = adcReading(voltageV, reading.voltageV.y);
      fast.voltageV.z[i] = adcReading(voltageV, reading.voltageV.z);
      this.plant.advance(setpointA);
    }
    return { fast, slow };
  }

  /**
   * Jumps over `frames` whole frame periods without simulating them (the state is frozen over
   * the gap). The sequence numbers advance as if the frames had been sent and lost, so a
   * receiver sees the gap.
   */
  skipFrames(frames: number): void {
    const ms = (frames * this.samplesPerFrame * 1000) / this.opts.sampleRateHz;
    this.plant.skip(ms);
    this.fastSeq += frames;
    this.slowSeq += Math.floor(ms / SLOW_PERIOD_MS);
    this.nextSlowMs += Math.floor(ms / SLOW_PERIOD_MS) * SLOW_PERIOD_MS;
  }

  /** The controller status at the present simulation time. */
  status(online: boolean, tMs: number): ControllerStatus {
    const trip = this.plant.hardwareTrip;
    return {
      online,
      tMs,
      hardwareTripped: trip !== null,
      hardwareTripCause: trip?.cause ?? null,
      hardwareTripAxis: trip?.axis ?? null,
      softwareHold: this.setpoints.softwareHold,
      mode: this.setpoints.mode(this.plant.nowMs),
    };
  }
}
