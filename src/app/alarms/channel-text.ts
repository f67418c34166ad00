import { CHANNELS, isChannelId } from '../../../shared/alarms/channels';
import { NO_VALUE, formatNumber, formatQuantity } from '../readout/format-quantity';

/** What a channel measures ("Coolant flow x"); the id itself for a channel the web app does not know. */
export function channelLabel(channel: string): string {
  return isChannelId(channel) ? CHANNELS[channel].label : channel;
}

/** Unit of a channel's values ('' for dimensionless channels and unknown ones). */
export function channelUnit(channel: string): string {
  return isChannelId(channel) ? CHANNELS[channel].unit : '';
}

/** Decimals that give about three significant figures for the usual ranges of these channels. */
export function defaultDigits(value: number): number {
  return Math.abs(value) >= 100 ? 0 : Math.abs(value) >= 10 ? 1 : 2;
}

/**
 * A value with its unit for alarm and interlock lists: two decimals below 10, one below 100,
 * none above, unless `digits` asks for more.
 */
export function quantityText(value: number | null | undefined, unit: string, digits?: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return NO_VALUE;
  digits ??= defaultDigits(value);
  return unit === '' ? formatNumber(value, digits) : formatQuantity(value, unit, digits);
}

/** A channel's value with the channel's unit ("0.42 L/min"). */
export function channelQuantity(channel: string, value: number | null | undefined): string {
  return quantityText(value, channelUnit(channel));
}
