/**
 * Wire formats of every MQTT message, as zod/mini schemas (the runtime validator and the
 * TypeScript type in one). zod 4 numbers reject NaN and ±Infinity, so a payload such as
 * `1e999` fails validation instead of reaching the field math.
 */
import * as z from 'zod/mini';

export const AXES = ['x', 'y', 'z'] as const;
export type Axis = (typeof AXES)[number];

/** Largest accepted MQTT payload in bytes; anything larger is rejected before parsing. */
export const MAX_PAYLOAD_BYTES = 64 * 1024;
/** Most samples one fast frame may carry (1 s at 1 kHz). */
export const MAX_SAMPLES_PER_FRAME = 1000;

const finite = () => z.number();
const samples = () => z.array(finite()).check(z.minLength(1), z.maxLength(MAX_SAMPLES_PER_FRAME));
const perAxis = <T extends z.core.SomeType>(t: T) => z.strictObject({ x: t, y: t, z: t });
const epochMs = () => z.number().check(z.gt(1e12), z.lt(1e14));

/**
 * A batch of 1 kHz samples: the three coil currents (A) and supply voltages (V).
 * `t0Ms` is the UTC time (Unix epoch, ms) of the first sample; sample i is at
 * t0Ms + i·1000/rateHz. `seq` increases by one per frame; a gap means frames were lost.
 */
export const FastFrame = z.strictObject({
  seq: z.int().check(z.nonnegative()),
  t0Ms: epochMs(),
  rateHz: z.number().check(z.gt(0), z.lte(100_000)),
  currentA: perAxis(samples()),
  voltageV: perAxis(samples()),
  /** Setpoints in force while the batch was sampled (A). */
  setpointA: perAxis(finite()),
});
export type FastFrame = z.infer<typeof FastFrame>;

/** 10 Hz slow channels: coil temperatures (°C), coolant flows (L/min), water temperatures (°C). */
export const SlowFrame = z.strictObject({
  seq: z.int().check(z.nonnegative()),
  tMs: epochMs(),
  coilTempC: perAxis(finite()),
  flowLpm: perAxis(finite()),
  waterSupplyC: finite(),
  waterReturnC: perAxis(finite()),
});
export type SlowFrame = z.infer<typeof SlowFrame>;

export const HARDWARE_TRIP_CAUSES = ['over-temperature', 'low-flow', 'over-current'] as const;
export type HardwareTripCause = (typeof HARDWARE_TRIP_CAUSES)[number];

/** Retained controller status. The last will publishes `online: false`. */
export const ControllerStatus = z.strictObject({
  online: z.boolean(),
  tMs: epochMs(),
  /** Hardware trip chain latched (reset only at the controller). */
  hardwareTripped: z.boolean(),
  hardwareTripCause: z.nullable(z.enum(HARDWARE_TRIP_CAUSES)),
  hardwareTripAxis: z.nullable(z.enum(AXES)),
  /** Holding at zero after a software trip command, until released. */
  softwareHold: z.boolean(),
  /** Who drives the setpoints: the built-in demo program or the server. */
  mode: z.enum(['demo', 'remote']),
});
export type ControllerStatus = z.infer<typeof ControllerStatus>;

export const SetpointCommand = z.strictObject({
  tMs: epochMs(),
  setpointA: perAxis(finite()),
});
export type SetpointCommand = z.infer<typeof SetpointCommand>;

export const TripCommand = z.strictObject({
  tMs: epochMs(),
  reason: z.string().check(z.minLength(1), z.maxLength(500)),
});
export type TripCommand = z.infer<typeof TripCommand>;

export const ReleaseCommand = z.strictObject({
  tMs: epochMs(),
  reason: z.string().check(z.minLength(1), z.maxLength(500)),
});
export type ReleaseCommand = z.infer<typeof ReleaseCommand>;
