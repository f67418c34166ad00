import { z } from 'zod';
import type { Vec3 } from '../shared/field/field-vector.js';
import { AXES, type Axis } from '../shared/telemetry/messages.js';

/**
 * Faults that can be injected through the local control endpoint (documented in README.md).
 * Several can be active at once; injecting a fault again with the same kind, axis and channel
 * replaces it.
 */
const axis = z.enum(AXES, { error: 'axis must be "x", "y" or "z"' });

export const SENSOR_CHANNELS = ['current', 'voltage', 'temperature', 'flow', 'waterReturn'] as const;
export type SensorChannel = (typeof SENSOR_CHANNELS)[number];
export const TELEMETRY_STREAMS = ['fast', 'slow', 'all'] as const;

export const FaultSpec = z.discriminatedUnion(
  'kind',
  [
    z.strictObject({
      kind: z.literal('cooling-loss'),
      axis,
      /** Flow the closing valve leaves, L/min. */
      residualLpm: z.number().min(0).max(10).default(0),
    }),
    z.strictObject({
      kind: z.literal('supply-runaway'),
      axis,
      /** Rate at which the failed regulator drives its output voltage up, V/s. */
      voltsPerSecond: z.number().gt(0).max(100).default(2),
    }),
    z.strictObject({
      kind: z.literal('sensor-dropout'),
      /** Which telemetry stops: the 1 kHz frames, the 10 Hz frames or both. */
      stream: z.enum(TELEMETRY_STREAMS).default('all'),
    }),
    z.strictObject({
      kind: z.literal('frozen-sensor'),
      axis,
      channel: z.enum(SENSOR_CHANNELS).default('temperature'),
    }),
    z.strictObject({ kind: z.literal('sign-swap'), axis }),
    z.strictObject({
      kind: z.literal('field-offset-step'),
      /** Step of the background field, coil frame, G. */
      offsetGauss: z.strictObject({ x: z.number(), y: z.number(), z: z.number() }).default({ x: 0, y: 0, z: 0.5 }),
    }),
    z.strictObject({
      kind: z.literal('coolant-warm'),
      /** Temperature the failing chiller lets the supply water drift to, °C. */
      supplyC: z.number().min(0).max(95).default(60),
    }),
  ],
  { error: 'kind must be one of cooling-loss, supply-runaway, sensor-dropout, frozen-sensor, sign-swap, field-offset-step, coolant-warm' },
);
export type FaultSpec = z.infer<typeof FaultSpec>;
export type FaultKind = FaultSpec['kind'];

/** The set of active faults, with the questions the model asks of it. */
export class FaultBook {
  private readonly active = new Map<string, FaultSpec>();

  /** Activates `fault`, replacing an active fault of the same kind, axis and channel. */
  add(fault: FaultSpec): void {
    const key = [fault.kind, 'axis' in fault ? fault.axis : '', 'channel' in fault ? fault.channel : ''].join(':');
    this.active.set(key, fault);
  }

  clear(): void {
    this.active.clear();
  }

  list(): FaultSpec[] {
    return [...this.active.values()];
  }

  /** Residual flow (L/min) of a cooling loss on `a`, or null when its cooling is intact. */
  coolingLossResidual(a: Axis): number | null {
    return this.find('cooling-loss', a)?.residualLpm ?? null;
  }

  /** Runaway drive of the supply of `a`, or null when its regulator works. */
  runaway(a: Axis): { voltsPerSecond: number } | null {
    return this.find('supply-runaway', a) ?? null;
  }

  signSwapped(a: Axis): boolean {
    return this.find('sign-swap', a) !== undefined;
  }

  frozen(a: Axis, channel: SensorChannel): boolean {
    return this.list().some((f) => f.kind === 'frozen-sensor' && f.axis === a && f.channel === channel);
  }

  /** True when telemetry of `stream` ('fast' or 'slow') is not being published. */
  droppedOut(stream: 'fast' | 'slow'): boolean {
    return this.list().some((f) => f.kind === 'sensor-dropout' && (f.stream === stream || f.stream === 'all'));
  }

  /** Step of the background field, coil frame, G (zero when none is active). */
  fieldOffsetGauss(): Vec3 {
    const step = this.list().find((f) => f.kind === 'field-offset-step');
    return step ? step.offsetGauss : { x: 0, y: 0, z: 0 };
  }

  /** Supply water temperature a failing chiller drifts to, °C, or null when the chiller works. */
  warmCoolantC(): number | null {
    const fault = this.list().find((f) => f.kind === 'coolant-warm');
    return fault ? fault.supplyC : null;
  }

  private find<K extends 'cooling-loss' | 'supply-runaway' | 'sign-swap'>(
    kind: K,
    a: Axis,
  ): Extract<FaultSpec, { kind: K }> | undefined {
    return this.list().find((f): f is Extract<FaultSpec, { kind: K }> => f.kind === kind && f.axis === a);
  }
}
