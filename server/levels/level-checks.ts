/**
 * The limit-order rule across the two stores: alarm limits (server/alarms) and the trip levels
 * of the level set in force. An alarm beyond its trip level, or a trip level moved inside an
 * alarm, is refused with the field named as its form labels it.
 */
import { BAND_KINDS, TRIP_LABELS, tripLevelOf, type BandKind, type TripLevels } from '../../shared/levels/level-set.js';
import { ALARM_LIMIT_LABELS, channelOrderProblems, type AlarmLimit } from '../alarms/alarm-limit.js';
import type { ChannelId } from '../alarms/channels.js';

/** A refusal: the message for the person editing and the path of the field it concerns. */
export interface LevelProblem {
  field: string;
  message: string;
}

function kindOf(channel: ChannelId): BandKind | null {
  const kind = channel.split('.')[0];
  return (BAND_KINDS as readonly string[]).includes(kind) ? (kind as BandKind) : null;
}

/** The trip levels that bound an alarm channel (none for channels without a trip). */
export function tripsOfChannel(channel: ChannelId, trips: TripLevels): { tripLow: number | null; tripHigh: number | null } {
  const kind = kindOf(channel);
  if (kind === null) return { tripLow: null, tripHigh: null };
  return { tripLow: tripLevelOf(trips, kind, 'low'), tripHigh: tripLevelOf(trips, kind, 'high') };
}

/** The first problem of an edited alarm limit `next` within the set `limits` (which holds it). */
export function alarmLimitProblem(limits: readonly AlarmLimit[], next: AlarmLimit, trips: TripLevels): LevelProblem | null {
  const [problem] = channelOrderProblems(limits, next.channel, tripsOfChannel(next.channel, trips), next.level);
  return problem ? { field: 'limit', message: `${ALARM_LIMIT_LABELS.limit}: ${problem}` } : null;
}

/** The first trip level of `trips` that lies inside an alarm limit in force. */
export function tripLevelProblem(limits: readonly AlarmLimit[], trips: TripLevels): LevelProblem | null {
  for (const [key, info] of Object.entries(TRIP_LABELS) as [keyof TripLevels, (typeof TRIP_LABELS)[keyof TripLevels]][]) {
    const channels = new Set(limits.map((l) => l.channel).filter((c) => kindOf(c) === info.kind));
    for (const channel of channels) {
      const [problem] = channelOrderProblems(limits, channel, tripsOfChannel(channel, trips), info.side === 'high' ? 'tripHigh' : 'tripLow');
      if (problem) return { field: `trips.${key}`, message: `${info.label}: ${problem}; move that alarm limit first` };
    }
  }
  return null;
}
