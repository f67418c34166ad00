/**
 * Trip levels of the software interlock. The current, temperature and flow levels come from
 * the stored level set in force (server/levels/), the one source the Live gauges draw too; the
 * demo defaults are the seeded demo level set.
 */
import { z } from 'zod';
import type { TripLevels } from '../../shared/levels/level-set.js';
import { DEMO_LEVEL_SET } from '../levels/demo-levels.js';

const positive = (field: string, unit: string) =>
  z
    .number({ error: `${field} must be a number in ${unit}` })
    .positive({ error: `${field} must be more than 0 ${unit}` });

export const InterlockConfigSchema = z.strictObject({
  /** Trip when |I| of any pair is above this, A. */
  currentTripA: positive('currentTripA', 'A'),
  /** Trip when any coil temperature is above this, °C. */
  temperatureTripC: z.number({ error: 'temperatureTripC must be a number in °C' }),
  /** Trip when any coolant flow is below this, L/min. */
  flowTripLpm: positive('flowTripLpm', 'L/min'),
  /** Trip when no telemetry frame arrived for longer than this, ms. */
  staleMs: positive('staleMs', 'ms').max(60_000, { error: 'staleMs must be at most 60000 ms' }),
  /** Trip when more than this many fast frames were lost within `lostFrameWindowMs`. */
  maxLostFrames: z
    .number({ error: 'maxLostFrames must be a whole number of frames' })
    .int({ error: 'maxLostFrames must be a whole number of frames' })
    .min(0, { error: 'maxLostFrames must be 0 or more' }),
  lostFrameWindowMs: positive('lostFrameWindowMs', 'ms').max(60_000, { error: 'lostFrameWindowMs must be at most 60000 ms' }),
});
export type InterlockConfig = z.infer<typeof InterlockConfigSchema>;

/** The interlock's trip levels from a stored level set's trip levels. */
export function interlockTrips(trips: TripLevels): Pick<InterlockConfig, 'currentTripA' | 'temperatureTripC' | 'flowTripLpm'> {
  return { currentTripA: trips.currentHighA, temperatureTripC: trips.temperatureHighC, flowTripLpm: trips.flowLowLpm };
}

/** Demo trip levels of the fictional Lindqvist Hall apparatus. */
export const DEMO_INTERLOCK_CONFIG: Readonly<InterlockConfig> = {
  ...interlockTrips(DEMO_LEVEL_SET.trips),
  staleMs: 250,
  maxLostFrames: 5,
  lostFrameWindowMs: 1000,
};

/**
 * Demo defaults overridden by `overrides` (e.g. from configuration). Throws an Error that
 * names each bad field and what it must be.
 */
export function parseInterlockConfig(overrides: unknown = {}): InterlockConfig {
  if (typeof overrides !== 'object' || overrides === null) throw new Error('interlock configuration must be an object');
  const parsed = InterlockConfigSchema.safeParse({ ...DEMO_INTERLOCK_CONFIG, ...overrides });
  if (!parsed.success) {
    const issues = parsed.error.issues.map((i) => (i.path.length ? `${i.path.join('.')}: ${i.message}` : i.message));
    throw new Error(`invalid interlock configuration: ${issues.join('; ')}`);
  }
  return parsed.data;
}
