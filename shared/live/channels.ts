/**
 * Display bands of the live channels for the demo apparatus (invented values for the
 * fictional Lindqvist Hall machine; a real lab sets its own). The Live page draws every bar
 * against `scale`, shades `normal`, and marks the alarm and trip levels. Current levels apply
 * to |I|. The simulator's own hardware trip levels sit beyond the software trip levels, as a
 * hardware interlock should (see shared/apparatus/coil-data.ts).
 */
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

export const DEMO_CHANNEL_BANDS: Record<'current' | 'voltage' | 'temperature' | 'flow' | 'waterSupply', ChannelBand> = {
  current: { id: 'current', label: 'Current', unit: 'A', scale: [-25, 25], normal: [-15, 15], high: 18, low: null, tripHigh: 20, tripLow: null, absolute: true },
  voltage: { id: 'voltage', label: 'Voltage', unit: 'V', scale: [-15, 15], normal: [-12, 12], high: 13, low: null, tripHigh: null, tripLow: null, absolute: true },
  temperature: { id: 'temperature', label: 'Coil temperature', unit: '°C', scale: [10, 90], normal: [15, 45], high: 55, low: null, tripHigh: 65, tripLow: null, absolute: false },
  flow: { id: 'flow', label: 'Coolant flow', unit: 'L/min', scale: [0, 6], normal: [2, 5], high: null, low: 1.5, tripHigh: null, tripLow: 1, absolute: false },
  waterSupply: { id: 'waterSupply', label: 'Water supply', unit: '°C', scale: [5, 35], normal: [14, 22], high: 25, low: 10, tripHigh: null, tripLow: null, absolute: false },
};
