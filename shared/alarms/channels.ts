/**
 * The channels alarms and the software interlock watch. A channel id names one number the
 * server derives from the live state; limits and trip conditions refer to channels by id.
 * Shared so that the web app labels alarm values with the same names and units as the server.
 */
import { AXES, type Axis } from '../telemetry/messages.js';

export type AxisChannel = 'current' | 'currentDeviation' | 'temperature' | 'flow' | 'waterReturn';

export type ChannelId =
  | `${AxisChannel}.${Axis}`
  | 'waterSupply'
  | 'fieldMagnitude'
  | 'fieldAngleDeviation'
  | 'stale'
  | 'databaseOutage'
  | 'collapseRatio';

/** What a channel measures, for labels in lists, e-mails and error messages. */
export interface ChannelInfo {
  label: string;
  unit: string;
}

const AXIS_CHANNELS: Record<AxisChannel, ChannelInfo> = {
  current: { label: 'Coil current', unit: 'A' },
  currentDeviation: { label: 'Current deviation from setpoint', unit: 'A' },
  temperature: { label: 'Coil temperature', unit: '°C' },
  flow: { label: 'Coolant flow', unit: 'L/min' },
  waterReturn: { label: 'Return water temperature', unit: '°C' },
};

function perAxisInfo(): Record<`${AxisChannel}.${Axis}`, ChannelInfo> {
  const out = {} as Record<`${AxisChannel}.${Axis}`, ChannelInfo>;
  for (const [name, info] of Object.entries(AXIS_CHANNELS) as [AxisChannel, ChannelInfo][]) {
    for (const axis of AXES) out[`${name}.${axis}`] = { label: `${info.label} ${axis}`, unit: info.unit };
  }
  return out;
}

/**
 * Every channel with its label and unit. Currents are absolute values (the supplies are
 * bipolar); `stale` is the time since the newest telemetry frame; `collapseRatio` is the
 * prediction's ε_dd / ε_dd,crit (dimensionless, 1 = mean-field collapse threshold).
 */
export const CHANNELS: Readonly<Record<ChannelId, ChannelInfo>> = {
  ...perAxisInfo(),
  waterSupply: { label: 'Supply water temperature', unit: '°C' },
  fieldMagnitude: { label: 'Field magnitude', unit: 'G' },
  fieldAngleDeviation: { label: 'Field direction off target', unit: '°' },
  stale: { label: 'Time since the last telemetry frame', unit: 'ms' },
  databaseOutage: { label: 'Time the database has been unreachable', unit: 's' },
  collapseRatio: { label: 'Collapse ratio ε_dd/ε_dd,crit', unit: '' },
};

export const CHANNEL_IDS = Object.keys(CHANNELS) as ChannelId[];

/** Channel → present value. A missing channel means "no data" (the `stale` alarm covers that). */
export type ChannelValues = Partial<Record<ChannelId, number>>;

/** True when `id` names a known channel. */
export function isChannelId(id: string): id is ChannelId {
  return Object.hasOwn(CHANNELS, id);
}

/** "21.3 A", "1.2 L/min", "0.42" — a value with its channel's unit, for messages. */
export function formatChannelValue(channel: ChannelId, value: number | null): string {
  if (value === null || !Number.isFinite(value)) return 'no data';
  const unit = CHANNELS[channel].unit;
  const digits = Math.abs(value) >= 100 ? 0 : Math.abs(value) >= 10 ? 1 : 2;
  const text = value.toFixed(digits);
  return unit === '' ? text : unit === '°' ? `${text}°` : `${text} ${unit}`;
}
