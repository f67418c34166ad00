import type { ChannelBand } from '../../../shared/live/channels';

/**
 * How a reading stands against its channel's levels: inside the normal band, outside it but
 * short of an alarm level, beyond an alarm level, beyond a trip level, or missing.
 */
export type ReadingLevel = 'normal' | 'off-band' | 'alarm' | 'trip' | 'no-data';

export interface ReadingStatus {
  level: ReadingLevel;
  /** Which side of the band the reading left; null when inside it or missing. */
  side: 'high' | 'low' | null;
}

/** A level mark on the bar: its kind and position along the scale, 0…100 %. */
export interface LevelMark {
  kind: 'alarm' | 'trip';
  side: 'high' | 'low';
  percent: number;
  value: number;
}

/**
 * Classifies a reading (in the channel's unit) against its band. For bipolar channels
 * (`absolute`) the levels apply to |value|, so −19 A and +19 A are both "high".
 */
export function classifyReading(value: number | null, band: ChannelBand): ReadingStatus {
  if (value === null || !Number.isFinite(value)) return { level: 'no-data', side: null };
  const v = band.absolute ? Math.abs(value) : value;
  if (band.tripHigh !== null && v >= band.tripHigh) return { level: 'trip', side: 'high' };
  if (band.tripLow !== null && v <= band.tripLow) return { level: 'trip', side: 'low' };
  if (band.high !== null && v >= band.high) return { level: 'alarm', side: 'high' };
  if (band.low !== null && v <= band.low) return { level: 'alarm', side: 'low' };
  const [from, to] = band.absolute ? [0, Math.max(Math.abs(band.normal[0]), Math.abs(band.normal[1]))] : band.normal;
  if (v > to) return { level: 'off-band', side: 'high' };
  if (v < from) return { level: 'off-band', side: 'low' };
  return { level: 'normal', side: null };
}

/** Position of `value` along the channel's scale, 0…100 % (clamped). */
export function scalePercent(value: number, band: ChannelBand): number {
  const [min, max] = band.scale;
  if (!(max > min)) return 0;
  return Math.min(100, Math.max(0, ((value - min) / (max - min)) * 100));
}

/** True when `value` lies outside the drawn scale, so the bar is pinned at its end. */
export function offScale(value: number, band: ChannelBand): boolean {
  return value < band.scale[0] || value > band.scale[1];
}

/** The alarm and trip levels to mark on the bar; bipolar channels get them on both sides of zero. */
export function levelMarks(band: ChannelBand): LevelMark[] {
  const marks: LevelMark[] = [];
  const add = (kind: LevelMark['kind'], side: LevelMark['side'], level: number | null) => {
    if (level === null) return;
    const values = band.absolute ? [level, -level] : [level];
    for (const value of values) {
      if (value >= band.scale[0] && value <= band.scale[1]) marks.push({ kind, side, value, percent: scalePercent(value, band) });
    }
  };
  add('alarm', 'high', band.high);
  add('alarm', 'low', band.low);
  add('trip', 'high', band.tripHigh);
  add('trip', 'low', band.tripLow);
  return marks;
}

/** A stretch of the scale beyond an alarm or trip level, in percent of the bar. */
export interface LevelZone {
  kind: 'alarm' | 'trip';
  from: number;
  to: number;
}

/**
 * The stretches of the scale where a reading is in alarm or beyond trip, so the bar shows at a
 * glance how much room is left. Bipolar channels get them on both ends.
 */
export function levelZones(band: ChannelBand): LevelZone[] {
  const [min, max] = band.scale;
  const zones: LevelZone[] = [];
  const add = (kind: LevelZone['kind'], from: number, to: number) => {
    const a = scalePercent(Math.min(from, to), band);
    const b = scalePercent(Math.max(from, to), band);
    if (b > a) zones.push({ kind, from: a, to: b });
  };
  const highEdge = band.tripHigh ?? max;
  if (band.high !== null) add('alarm', band.high, highEdge);
  if (band.tripHigh !== null) add('trip', band.tripHigh, max);
  if (band.absolute) {
    if (band.high !== null) add('alarm', -band.high, -highEdge);
    if (band.tripHigh !== null) add('trip', -band.tripHigh, min);
  }
  if (band.low !== null) add('alarm', band.tripLow ?? min, band.low);
  if (band.tripLow !== null) add('trip', min, band.tripLow);
  return zones;
}

/** Where a filled bar starts: at zero when the scale spans it, otherwise at the scale's low end. */
export function fillOrigin(band: ChannelBand): number {
  return band.scale[0] < 0 && band.scale[1] > 0 ? 0 : band.scale[0];
}
