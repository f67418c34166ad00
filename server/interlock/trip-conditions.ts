/**
 * The trip conditions of the software interlock and how each is measured. The list order is
 * the tie-break for first-out when several conditions first hold in the same evaluation:
 * communication faults first (the other values may be old then), then coolant flow (the usual
 * root of an over-temperature), then temperature, then current.
 */
import type { LiveState } from '../../shared/live/live-state.js';
import { AXES } from '../../shared/telemetry/messages.js';
import { CHANNELS, formatChannelValue, type ChannelId, type ChannelValues } from '../alarms/channels.js';
import type { InterlockConfig } from './interlock-config.js';

/** What the interlock reads on each evaluation. */
export interface InterlockInputs {
  /** Channel values (`channelValues()`): absolute currents, coil temperatures and flows are used. */
  values: ChannelValues;
  /** Server time of the newest telemetry frame, Unix epoch ms; null before the first frame. */
  lastFrameAtMs: number | null;
  controllerOnline: boolean;
  /** The controller's own hardware trip, shown beside the software interlock, never reset from here. */
  hardwareTripped: boolean;
}

/** Interlock inputs from the live state, its channel values and when its newest frame was heard (Unix epoch ms). */
export function interlockInputs(live: LiveState, values: ChannelValues, lastFrameAtMs: number | null): InterlockInputs {
  return {
    values,
    lastFrameAtMs,
    controllerOnline: live.controller.online,
    hardwareTripped: live.controller.hardwareTripped,
  };
}

/** One condition as `GET /api/interlock` lists it. */
export interface ConditionStatus {
  /** Stable id, e.g. `over-temperature-x`. */
  name: string;
  label: string;
  channel: string;
  unit: string;
  active: boolean;
  /** Present value in `unit`, null when there is no data. */
  value: number | null;
  limit: number;
  /** Distance to the trip level in `unit`, positive while safe; null without data or for yes/no conditions. */
  margin: number | null;
  /** Value with its unit for messages ("66.2 °C", "offline", "no data"). */
  valueText: string;
  /** When the condition trips, for messages ("above 65.0 °C", "offline"). */
  tripsWhen: string;
}

/** Measures one condition; `lostFrames` comes from the frame-loss window at the same time. */
type Measure = (inputs: InterlockInputs, nowMs: number, lostFrames: number) => number | null;

export interface TripCondition {
  readonly name: string;
  readonly label: string;
  readonly channel: string;
  readonly unit: string;
  /** `above`: trips when value > limit; `below`: trips when value < limit. */
  readonly trips: 'above' | 'below';
  readonly limit: number;
  readonly measure: Measure;
  readonly format: (value: number) => string;
  readonly tripsWhen: string;
  /** A yes/no condition (1 or 0) has no margin worth showing. */
  readonly binary?: boolean;
}

/**
 * The controller-offline and stale conditions arm with the first telemetry frame, so a server
 * that starts before its controller does not latch a trip for a controller not yet connected
 * (the connection indicator covers that phase).
 */
export function tripConditions(config: InterlockConfig): TripCondition[] {
  const channelCondition = (
    name: string,
    channel: ChannelId,
    trips: 'above' | 'below',
    limit: number,
  ): TripCondition => ({
    name,
    label: CHANNELS[channel].label,
    channel,
    unit: CHANNELS[channel].unit,
    trips,
    limit,
    measure: (inputs) => inputs.values[channel] ?? null,
    format: (v) => formatChannelValue(channel, v),
    tripsWhen: `${trips} ${formatChannelValue(channel, limit)}`,
  });
  return [
    {
      name: 'controller-offline',
      label: 'Controller connection',
      channel: 'controller.online',
      unit: '',
      trips: 'below',
      limit: 1,
      measure: (inputs) => (inputs.lastFrameAtMs === null ? null : inputs.controllerOnline ? 1 : 0),
      format: (v) => (v >= 1 ? 'online' : 'offline'),
      tripsWhen: 'offline',
      binary: true,
    },
    {
      name: 'telemetry-stale',
      label: 'Time since the last telemetry frame',
      channel: 'stale',
      unit: 'ms',
      trips: 'above',
      limit: config.staleMs,
      measure: (inputs, nowMs) => (inputs.lastFrameAtMs === null ? null : Math.max(0, nowMs - inputs.lastFrameAtMs)),
      format: (v) => `${Math.round(v)} ms`,
      tripsWhen: `above ${config.staleMs} ms`,
    },
    {
      name: 'frame-loss',
      label: `Fast frames lost in the last ${config.lostFrameWindowMs} ms`,
      channel: 'frameLoss',
      unit: 'frames',
      trips: 'above',
      limit: config.maxLostFrames,
      measure: (_inputs, _nowMs, lostFrames) => lostFrames,
      format: (v) => `${v} frames`,
      tripsWhen: `above ${config.maxLostFrames} frames`,
    },
    ...AXES.map((a) => channelCondition(`low-flow-${a}`, `flow.${a}`, 'below', config.flowTripLpm)),
    ...AXES.map((a) => channelCondition(`over-temperature-${a}`, `temperature.${a}`, 'above', config.temperatureTripC)),
    ...AXES.map((a) => channelCondition(`over-current-${a}`, `current.${a}`, 'above', config.currentTripA)),
  ];
}

/** True when `value` violates the condition. */
export function violates(condition: TripCondition, value: number | null): boolean {
  if (value === null) return false;
  return condition.trips === 'above' ? value > condition.limit : value < condition.limit;
}

/** Distance to the trip level, positive while safe. */
export function marginOf(condition: TripCondition, value: number | null): number | null {
  if (value === null || condition.binary) return null;
  return condition.trips === 'above' ? condition.limit - value : value - condition.limit;
}

/** Status of `condition` for `value`, with the texts messages use. */
export function conditionStatus(condition: TripCondition, value: number | null): ConditionStatus {
  return {
    name: condition.name,
    label: condition.label,
    channel: condition.channel,
    unit: condition.unit,
    active: violates(condition, value),
    value,
    limit: condition.limit,
    margin: marginOf(condition, value),
    valueText: value === null ? 'no data' : condition.format(value),
    tripsWhen: condition.tripsWhen,
  };
}

/** "Coil temperature z: 66.2 °C (trips above 65.0 °C)". */
export function describeCondition(status: ConditionStatus): string {
  return `${status.label}: ${status.valueText} (trips ${status.tripsWhen})`;
}
