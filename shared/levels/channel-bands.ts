/**
 * Composes the display bands the gauges draw from the level set in force and the alarm limits
 * in force, so that Live, the alarms and the interlock read one source.
 */
import type { BandId, ChannelBand, ChannelBands } from '../live/channels.js';
import { AXES } from '../telemetry/messages.js';
import { BAND_LABELS, tripLevelOf, type BandKind, type LevelSetVersion } from './level-set.js';

/** What the composition needs of an alarm limit. */
export interface AlarmLevelOf {
  channel: string;
  level: 'HH' | 'H' | 'L' | 'LL';
  limit: number;
}

const ABSOLUTE: ReadonlySet<BandKind> = new Set(['current', 'voltage']);

/**
 * One band per coil pair (and the water supply): scale, normal band and trip levels from the
 * level set; the alarm marks from `limits` (`alarmMarksOf`).
 */
export function composeChannelBands(set: LevelSetVersion, limits: readonly AlarmLevelOf[]): ChannelBands {
  const band = (id: BandId, kind: BandKind, labelSuffix: string): ChannelBand => {
    const { scale, normal } = set.levels.bands[kind];
    return {
      id,
      label: `${BAND_LABELS[kind].label}${labelSuffix}`,
      unit: BAND_LABELS[kind].unit,
      scale: [scale[0], scale[1]],
      normal: [normal[0], normal[1]],
      ...alarmMarksOf(id, limits),
      tripHigh: tripLevelOf(set.levels.trips, kind, 'high'),
      tripLow: tripLevelOf(set.levels.trips, kind, 'low'),
      absolute: ABSOLUTE.has(kind),
    };
  };
  const bands = { waterSupply: band('waterSupply', 'waterSupply', '') } as Record<BandId, ChannelBand>;
  for (const kind of ['current', 'voltage', 'temperature', 'flow'] as const) {
    for (const axis of AXES) bands[`${kind}.${axis}`] = band(`${kind}.${axis}`, kind, ` ${axis}`);
  }
  return { version: set.version, bands };
}

/**
 * `bands` with the alarm marks of `limits` in place of their own (Replay: the alarm limits in
 * force at its clock over the level set then in force).
 */
export function withAlarmMarks(bands: ChannelBands, limits: readonly AlarmLevelOf[]): ChannelBands {
  const marked = {} as Record<BandId, ChannelBand>;
  for (const [id, band] of Object.entries(bands.bands) as [BandId, ChannelBand][]) marked[id] = { ...band, ...alarmMarksOf(id, limits) };
  return { version: bands.version, bands: marked };
}

/**
 * The alarm marks of one channel: the nearest-to-normal high (H, else HH) and low (L, else LL)
 * alarm limits on it, null where the channel has no alarm.
 */
function alarmMarksOf(id: BandId, limits: readonly AlarmLevelOf[]): Pick<ChannelBand, 'high' | 'low'> {
  const own = limits.filter((l) => l.channel === id);
  const pick = (levels: AlarmLevelOf['level'][]) => {
    for (const level of levels) {
      const found = own.find((l) => l.level === level);
      if (found) return found.limit;
    }
    return null;
  };
  return { high: pick(['H', 'HH']), low: pick(['L', 'LL']) };
}
