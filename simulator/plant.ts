import { DEMO_CALIBRATION } from '../shared/field/demo-calibration.js';
import { fieldFromCurrents, type FieldState } from '../shared/field/field-vector.js';
import { AXES, type Axis } from '../shared/telemetry/messages.js';
import { coilCurrentAfter, resistanceAt } from '../shared/apparatus/coil-model.js';
import { FaultBook, type SensorChannel } from './faults.js';
import type { ControllerParameters } from '../shared/apparatus/coil-data.js';
import { SeededRandom } from './seeded-random.js';
import { Supply } from './supply-model.js';
import { conductanceAtFlow, cooling, coilTemperatureAfter } from '../shared/apparatus/thermal-model.js';
import { TripChain, type LatchedTrip, type ResetOutcome, type TripInputs } from './trip-chain.js';

export type PerAxis = Record<Axis, number>;

export interface PlantOptions {
  params: ControllerParameters;
  /** Simulation start, UTC epoch ms. */
  startMs: number;
  sampleRateHz: number;
  seed: number;
  /** Factor by which the thermal dynamics run faster than real time (1 = real time). */
  thermalSpeedup: number;
}

/** One 1 kHz measurement as the telemetry reports it (noise and sensor faults included). */
export interface FastReading {
  currentA: PerAxis;
  voltageV: PerAxis;
}

/** One 10 Hz measurement as the telemetry reports it. */
export interface SlowReading {
  coilTempC: PerAxis;
  flowLpm: PerAxis;
  waterSupplyC: number;
  waterReturnC: PerAxis;
}

/** The model's internal truth, for tests and demos (GET /state). */
export interface PlantTruth {
  timeMs: number;
  currentA: PerAxis;
  referenceA: PerAxis;
  voltageV: PerAxis;
  resistanceOhm: PerAxis;
  powerW: PerAxis;
  coilTempC: PerAxis;
  flowLpm: PerAxis;
  waterSupplyC: number;
  waterReturnC: PerAxis;
  heatToWaterW: PerAxis;
  hardwareTrip: LatchedTrip | null;
  /** The field the atoms feel (trap frame, demo calibration plus any background-field step). */
  trueField: FieldState;
}

const perAxis = (f: (a: Axis) => number): PerAxis => ({ x: f('x'), y: f('y'), z: f('z') });

/**
 * The three coil pairs with their supplies, cooling water, hardware trip chain, sensors and
 * injected faults, advanced in fixed steps of 1/sampleRateHz. Pure: no timers, no I/O; the
 * same seed and inputs give the same outputs.
 */
export class Plant {
  readonly faults = new FaultBook();
  private readonly trips: TripChain;
  private readonly noise: SeededRandom;
  private readonly supplies: Record<Axis, Supply>;
  private readonly dtS: number;
  private stepCount = 0;
  private skippedMs = 0;
  private readonly current: PerAxis = { x: 0, y: 0, z: 0 };
  private readonly coilTemp: PerAxis;
  private readonly flow: PerAxis;
  private waterSupply: number;
  /** Last value each sensor reported, held while the sensor is frozen. */
  private readonly lastReported = new Map<string, number>();

  constructor(private readonly opts: PlantOptions) {
    const { params } = opts;
    this.dtS = 1 / opts.sampleRateHz;
    this.trips = new TripChain(params.trips);
    this.noise = new SeededRandom(opts.seed);
    this.supplies = { x: new Supply(params.supply), y: new Supply(params.supply), z: new Supply(params.supply) };
    this.waterSupply = params.waterSupplyC;
    this.coilTemp = perAxis(() => params.waterSupplyC);
    this.flow = perAxis((a) => params.coils[a].nominalFlowLpm);
  }

  /** Simulation time of the present state, UTC epoch ms. */
  get nowMs(): number {
    return this.opts.startMs + this.skippedMs + (this.stepCount * 1000) / this.opts.sampleRateHz;
  }

  /** Jumps the clock over `ms` milliseconds with the state frozen (after a stalled process). */
  skip(ms: number): void {
    this.skippedMs += ms;
  }

  get hardwareTrip(): LatchedTrip | null {
    return this.trips.latched;
  }

  /** Advances one sample step with the setpoints `setpointA` (A) in force. */
  advance(setpointA: PerAxis): void {
    const { params, thermalSpeedup } = this.opts;
    const dt = this.dtS;
    const disabled = this.trips.latched !== null;
    for (const a of AXES) {
      const coil = params.coils[a];
      const r = resistanceAt(coil.r20Ohm, this.coilTemp[a]);
      const setpoint = this.faults.signSwapped(a) ? -setpointA[a] : setpointA[a];
      const volts = this.supplies[a].step(setpoint, r, dt, this.faults.runaway(a), disabled);
      this.current[a] = coilCurrentAfter(this.current[a], volts, r, coil.inductanceH, dt);
      const conductance = conductanceAtFlow(coil.conductanceWPerK, coil.nominalFlowLpm, this.flow[a]);
      const power = this.current[a] ** 2 * r;
      this.coilTemp[a] = coilTemperatureAfter(
        this.coilTemp[a], power, this.waterSupply, this.flow[a], conductance, coil.heatCapacityJPerK, dt * thermalSpeedup,
      );
      const flowTarget = this.faults.coolingLossResidual(a) ?? coil.nominalFlowLpm;
      this.flow[a] += (flowTarget - this.flow[a]) * (1 - Math.exp(-dt / params.flowTimeConstantS));
    }
    const supplyTarget = this.faults.warmCoolantC() ?? params.waterSupplyC;
    this.waterSupply +=
      (supplyTarget - this.waterSupply) * (1 - Math.exp((-dt * thermalSpeedup) / params.chillerTimeConstantS));
    this.stepCount++;
    this.trips.evaluate(this.tripInputs(), dt, this.nowMs);
  }

  /** Local reset of the hardware trip chain; refused while a trip condition holds. */
  resetHardwareTrip(): ResetOutcome {
    return this.trips.reset(this.tripInputs());
  }

  /** The 1 kHz channels as measured now. */
  measureFast(): FastReading {
    const { noise } = this.opts.params;
    return {
      currentA: perAxis((a) => this.sensor(a, 'current', this.current[a], noise.currentA)),
      voltageV: perAxis((a) => this.sensor(a, 'voltage', this.supplies[a].outputV, noise.voltageV)),
    };
  }

  /** The 10 Hz channels as measured now. */
  measureSlow(): SlowReading {
    const { noise } = this.opts.params;
    const returns = this.returnTemperatures();
    return {
      coilTempC: perAxis((a) => this.sensor(a, 'temperature', this.coilTemp[a], noise.temperatureC)),
      flowLpm: perAxis((a) => Math.max(0, this.sensor(a, 'flow', this.flow[a], noise.flowLpm))),
      waterSupplyC: this.waterSupply + this.noise.gaussian(noise.temperatureC),
      waterReturnC: perAxis((a) => this.sensor(a, 'waterReturn', returns[a].returnC, noise.temperatureC)),
    };
  }

  truth(): PlantTruth {
    const { params } = this.opts;
    const resistance = perAxis((a) => resistanceAt(params.coils[a].r20Ohm, this.coilTemp[a]));
    const returns = this.returnTemperatures();
    const offset = this.faults.fieldOffsetGauss();
    const b0 = DEMO_CALIBRATION.offsetGauss;
    return {
      timeMs: this.nowMs,
      currentA: { ...this.current },
      referenceA: perAxis((a) => this.supplies[a].referenceA),
      voltageV: perAxis((a) => this.supplies[a].outputV),
      resistanceOhm: resistance,
      powerW: perAxis((a) => this.current[a] ** 2 * resistance[a]),
      coilTempC: { ...this.coilTemp },
      flowLpm: { ...this.flow },
      waterSupplyC: this.waterSupply,
      waterReturnC: perAxis((a) => returns[a].returnC),
      heatToWaterW: perAxis((a) => returns[a].heatToWaterW),
      hardwareTrip: this.trips.latched,
      trueField: fieldFromCurrents(
        { ...DEMO_CALIBRATION, offsetGauss: [b0[0] + offset.x, b0[1] + offset.y, b0[2] + offset.z] },
        this.current,
      ),
    };
  }

  private returnTemperatures(): Record<Axis, ReturnType<typeof cooling>> {
    const { coils } = this.opts.params;
    const at = (a: Axis) =>
      cooling(this.coilTemp[a], this.waterSupply, this.flow[a], conductanceAtFlow(coils[a].conductanceWPerK, coils[a].nominalFlowLpm, this.flow[a]));
    return { x: at('x'), y: at('y'), z: at('z') };
  }

  private tripInputs(): TripInputs {
    return { currentA: { ...this.current }, coilTempC: { ...this.coilTemp }, flowLpm: { ...this.flow } };
  }

  /** A noisy reading of `value`, or the last reading while the sensor is frozen. */
  private sensor(a: Axis, channel: SensorChannel, value: number, sigma: number): number {
    const key = `${a}:${channel}`;
    const held = this.lastReported.get(key);
    if (held !== undefined && this.faults.frozen(a, channel)) return held;
    const reading = value + this.noise.gaussian(sigma);
    this.lastReported.set(key, reading);
    return reading;
  }
}
