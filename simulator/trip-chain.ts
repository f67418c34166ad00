import { AXES, type Axis, type HardwareTripCause } from '../shared/telemetry/messages.js';
import type { HardwareTripLevels } from '../shared/apparatus/coil-data.js';

/** What the trip chain's own sensors read for each axis (true values, not the telemetry). */
export interface TripInputs {
  currentA: Record<Axis, number>;
  coilTempC: Record<Axis, number>;
  flowLpm: Record<Axis, number>;
}

export interface LatchedTrip {
  cause: HardwareTripCause;
  axis: Axis;
  /** Simulation time of the trip, UTC epoch ms. */
  atMs: number;
}

export type ResetOutcome = { reset: true } | { reset: false; reason: string };

/**
 * The controller's hardware-like trip chain: over-current and over-temperature trip at once,
 * low flow after the flow switch's delay. The first condition seen is latched (first-out) and
 * stays latched until a local reset, which is refused while any condition still holds. The
 * chain reads its own sensors (the model's true values), so a frozen or missing telemetry
 * channel does not blind it — as with a real apparatus, whose interlock sensors are separate.
 */
export class TripChain {
  private latchedTrip: LatchedTrip | null = null;
  private readonly lowFlowForS: Record<Axis, number> = { x: 0, y: 0, z: 0 };

  constructor(private readonly levels: HardwareTripLevels) {}

  get latched(): LatchedTrip | null {
    return this.latchedTrip;
  }

  /** Evaluates one step of `dtS` seconds at simulation time `nowMs`; returns the latch. */
  evaluate(inputs: TripInputs, dtS: number, nowMs: number): LatchedTrip | null {
    for (const axis of AXES) {
      this.lowFlowForS[axis] = inputs.flowLpm[axis] < this.levels.lowFlowLpm ? this.lowFlowForS[axis] + dtS : 0;
    }
    if (this.latchedTrip) return this.latchedTrip;
    const first = this.firstCondition(inputs, (axis) => this.lowFlowForS[axis] >= this.levels.lowFlowDelayS);
    if (first) this.latchedTrip = { ...first, atMs: nowMs };
    return this.latchedTrip;
  }

  /**
   * Local reset. Refused, with the reason, while any trip condition still holds (the low-flow
   * condition counts as holding as soon as the flow is below its level, without the delay).
   */
  reset(inputs: TripInputs): ResetOutcome {
    const holding = this.firstCondition(inputs, () => true);
    if (holding) {
      return { reset: false, reason: `${holding.cause} on axis ${holding.axis} still holds: ${this.describe(holding, inputs)}` };
    }
    this.latchedTrip = null;
    return { reset: true };
  }

  private firstCondition(
    inputs: TripInputs,
    lowFlowConfirmed: (axis: Axis) => boolean,
  ): { cause: HardwareTripCause; axis: Axis } | null {
    for (const axis of AXES) {
      if (Math.abs(inputs.currentA[axis]) > this.levels.overCurrentA) return { cause: 'over-current', axis };
    }
    for (const axis of AXES) {
      if (inputs.coilTempC[axis] > this.levels.overTemperatureC) return { cause: 'over-temperature', axis };
    }
    for (const axis of AXES) {
      if (inputs.flowLpm[axis] < this.levels.lowFlowLpm && lowFlowConfirmed(axis)) return { cause: 'low-flow', axis };
    }
    return null;
  }

  private describe(c: { cause: HardwareTripCause; axis: Axis }, inputs: TripInputs): string {
    switch (c.cause) {
      case 'over-current':
        return `|I| = ${Math.abs(inputs.currentA[c.axis]).toFixed(2)} A > ${this.levels.overCurrentA} A`;
      case 'over-temperature':
        return `coil at ${inputs.coilTempC[c.axis].toFixed(1)} °C > ${this.levels.overTemperatureC} °C; let it cool`;
      case 'low-flow':
        return `flow ${inputs.flowLpm[c.axis].toFixed(2)} L/min < ${this.levels.lowFlowLpm} L/min; restore the coolant flow`;
    }
  }
}
