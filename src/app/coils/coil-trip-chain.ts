import type { InterlockCondition } from '../../../shared/alarms/alarm-api';
import type { ChannelBand } from '../../../shared/live/channels';
import type { AlarmLimitRecord } from '../alarms/alarm-records';
import { channelQuantity } from '../alarms/channel-text';

/** One step of a channel's trip chain, in the order a rising fault meets them. */
export interface ChainStep {
  name: string;
  level: string;
  /** What happens there. */
  effect: string;
  /** True once the present value is past this step. */
  reached: boolean;
}

export interface ChainRow {
  label: string;
  value: string;
  /** Distance to the software trip level, with unit; null without data. */
  margin: string | null;
  steps: ChainStep[];
}

/**
 * The trip chain of one channel of a coil pair: its alarm levels (from the alarm limits in
 * force), the software interlock's trip level and state (from the live interlock status),
 * and the controller's own hardware interlock beyond them.
 */
export function chainRow(
  label: string,
  channel: string,
  value: number | null,
  band: ChannelBand,
  limits: readonly AlarmLimitRecord[],
  condition: InterlockCondition | undefined,
): ChainRow {
  const low = band.tripLow !== null;
  const order = low ? ['L', 'LL'] : ['H', 'HH'];
  const past = (level: number) => value !== null && (low ? value < level : Math.abs(value) > level);
  const steps: ChainStep[] = [];
  for (const level of order) {
    const limit = limits.find((l) => l.channel === channel && l.level === level);
    if (!limit) continue;
    steps.push({
      name: `Alarm ${level}`,
      level: channelQuantity(channel, limit.limit),
      effect: `${limit.priority} priority alarm${limit.latching ? ', latching' : ''}`,
      reached: past(limit.limit),
    });
  }
  const trip = low ? band.tripLow : band.tripHigh;
  if (trip !== null) {
    steps.push({
      name: 'Software trip',
      level: channelQuantity(channel, trip),
      effect: 'Tiltwatch ramps every coil to zero and latches',
      reached: condition?.active ?? past(trip),
    });
  }
  steps.push({ name: 'Hardware trip', level: 'controller’s own level', effect: 'the controller cuts the supply; reset at the apparatus only', reached: false });
  const margin = condition?.margin;
  return {
    label,
    value: channelQuantity(channel, value),
    margin: margin === null || margin === undefined ? null : channelQuantity(channel, margin),
    steps,
  };
}
