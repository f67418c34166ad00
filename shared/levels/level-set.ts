/**
 * The lead-set levels of the apparatus: display bands of the live channels, the software
 * interlock's trip levels and operating settings other screens read. Stored in versions (a
 * lead's edit adds one, with a reason, audited); the version in force is the one source that
 * the Live gauges (`GET /api/channels`), the alarm-limit checks and the interlock read.
 */

/** Channel kinds that have a display band; a band applies to all three coil pairs alike. */
export const BAND_KINDS = ['current', 'voltage', 'temperature', 'flow', 'waterSupply'] as const;
export type BandKind = (typeof BAND_KINDS)[number];

export interface DisplayBand {
  /** Full range of the bar, [from, to]. */
  scale: [number, number];
  /** Normal operating band, [from, to], inside the scale. */
  normal: [number, number];
}

/** Software-interlock trip levels; they apply to every coil pair. */
export interface TripLevels {
  /** Trip when |I| of any pair is above this, A. */
  currentHighA: number;
  /** Trip when any coil temperature is above this, °C. */
  temperatureHighC: number;
  /** Trip when any coolant flow is below this, L/min. */
  flowLowLpm: number;
}

/**
 * Lead-set operating settings of other features. A new setting gets a default in the server's
 * schema (server/levels/level-set-schema.ts) so that stored versions without it still load.
 */
export interface OperatingSettings {
  /** Below this |B| the field is too weak to orient the dipoles; predictions are greyed, G. */
  minOrientingFieldG: number;
  /** Largest |B| a steer target may ask for, G. */
  maxTargetFieldG: number;
  /** Largest predicted collapse ratio ε_dd/ε_dd,crit a steer target may reach (1 = collapse). */
  maxTargetCollapseRatio: number;
}

/** Winding resistance of each coil pair at 20 °C, Ω (for the resistance-derived winding temperature). */
export interface WindingResistances {
  x: number;
  y: number;
  z: number;
}

export interface LevelSet {
  bands: Record<BandKind, DisplayBand>;
  trips: TripLevels;
  settings: OperatingSettings;
  windingsR20Ohm: WindingResistances;
}

/** One stored version (body of `GET /api/levels`). */
export interface LevelSetVersion {
  version: number;
  levels: LevelSet;
  createdBy: string;
  /** ISO 8601 UTC. */
  createdAt: string;
  reason: string;
}

/** Units and screen labels of every editable number, keyed by its path in a LevelSet. */
export const BAND_LABELS: Readonly<Record<BandKind, { label: string; unit: string }>> = {
  current: { label: 'Coil current', unit: 'A' },
  voltage: { label: 'Coil voltage', unit: 'V' },
  temperature: { label: 'Coil temperature', unit: '°C' },
  flow: { label: 'Coolant flow', unit: 'L/min' },
  waterSupply: { label: 'Supply water temperature', unit: '°C' },
};

export const TRIP_LABELS: Readonly<Record<keyof TripLevels, { label: string; unit: string; kind: BandKind; side: 'high' | 'low' }>> = {
  currentHighA: { label: 'Current trip level (A)', unit: 'A', kind: 'current', side: 'high' },
  temperatureHighC: { label: 'Coil temperature trip level (°C)', unit: '°C', kind: 'temperature', side: 'high' },
  flowLowLpm: { label: 'Coolant flow trip level (L/min)', unit: 'L/min', kind: 'flow', side: 'low' },
};

export const SETTING_LABELS: Readonly<Record<keyof OperatingSettings, { label: string; unit: string }>> = {
  minOrientingFieldG: { label: 'Least field that orients the dipoles (G)', unit: 'G' },
  maxTargetFieldG: { label: 'Largest steer target field (G)', unit: 'G' },
  maxTargetCollapseRatio: { label: 'Largest steer target collapse ratio', unit: '' },
};

/** Label of a coil pair's winding resistance, as the levels form shows it. */
export function windingFieldLabel(axis: keyof WindingResistances): string {
  return `Coil pair ${axis} winding resistance at 20 °C (Ω)`;
}

/** Label of a band's bound, as the levels form shows it: "Coil current scale from (A)". */
export function bandFieldLabel(kind: BandKind, part: 'scale' | 'normal', end: 0 | 1): string {
  const { label, unit } = BAND_LABELS[kind];
  return `${label} ${part === 'scale' ? 'scale' : 'normal band'} ${end === 0 ? 'from' : 'to'} (${unit})`;
}

/** The levels form's label of the input at `path` in a level set (`trips.currentHighA`), or null. */
export function levelFieldLabel(path: readonly PropertyKey[]): string | null {
  const [group, key, part, end] = path.map(String);
  if (group === 'trips') return TRIP_LABELS[key as keyof TripLevels]?.label ?? null;
  if (group === 'settings') return SETTING_LABELS[key as keyof OperatingSettings]?.label ?? null;
  if (group === 'windingsR20Ohm' && (key === 'x' || key === 'y' || key === 'z')) return windingFieldLabel(key);
  if (group === 'bands' && key in BAND_LABELS && (part === 'scale' || part === 'normal') && (end === '0' || end === '1')) {
    return bandFieldLabel(key as BandKind, part, end === '0' ? 0 : 1);
  }
  return null;
}

/** The trip level of a band kind on one side, or null when that side does not trip. */
export function tripLevelOf(trips: TripLevels, kind: BandKind, side: 'high' | 'low'): number | null {
  for (const [key, info] of Object.entries(TRIP_LABELS) as [keyof TripLevels, (typeof TRIP_LABELS)[keyof TripLevels]][]) {
    if (info.kind === kind && info.side === side) return trips[key];
  }
  return null;
}
