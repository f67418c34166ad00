/**
 * Display bands of the live channels as the Live page and Coil detail draw them: every bar
 * against `scale`, `normal` shaded, the alarm and trip levels marked. Composed on the server
 * (`shared/levels/channel-bands.ts`) from the stored level set (scale, normal band, trip
 * levels) and the alarm limits in force, so a gauge shows the levels the alarms and the
 * interlock act on. Current and voltage levels apply to |value|.
 */
import type { Axis } from '../telemetry/messages.js';

export interface ChannelBand {
  id: string;
  label: string;
  unit: string;
  /** Full range of the bar. */
  scale: [number, number];
  /** Normal operating band. */
  normal: [number, number];
  /** Alarm level above which the value is abnormal (high) / below (low); null when none. */
  high: number | null;
  low: number | null;
  /** Software-interlock trip level; null when the channel does not trip. */
  tripHigh: number | null;
  tripLow: number | null;
  /** True when the levels apply to the absolute value (bipolar currents and voltages). */
  absolute: boolean;
}

/** Band ids: one per coil pair for the per-pair channels, and the shared water supply. */
export type BandId = `${'current' | 'voltage' | 'temperature' | 'flow'}.${Axis}` | 'waterSupply';

/** Body of `GET /api/channels` and of the WebSocket `channels` message. */
export interface ChannelBands {
  /** Version of the stored level set the bands come from. */
  version: number;
  bands: Record<BandId, ChannelBand>;
}
