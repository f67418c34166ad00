/**
 * Validation of a lead's level set at the edge. Every message names the number as the levels
 * form labels it ("Coil current scale from (A)"), and `field` carries its path so the form
 * shows the message next to it.
 */
import { z } from 'zod';
import { BAND_KINDS, BAND_LABELS, SETTING_LABELS, TRIP_LABELS, bandFieldLabel, type BandKind, type LevelSet } from '../../shared/levels/level-set.js';
import { DEMO_LEVEL_SET } from './demo-levels.js';

/** A refused level set: the form label's message and the path of the field. */
export class LevelSetError extends Error {
  constructor(
    message: string,
    readonly field: string,
  ) {
    super(message);
    this.name = 'LevelSetError';
  }
}

/** Largest magnitude accepted for any level; beyond it a number is a typo, not a level. */
const MAX_MAGNITUDE = 1e6;

const number = (label: string) =>
  z
    .number({ error: `${label} must be a number` })
    .refine((n) => Number.isFinite(n) && Math.abs(n) <= MAX_MAGNITUDE, { error: `${label} must be a number between −${MAX_MAGNITUDE} and ${MAX_MAGNITUDE}` });

const positive = (label: string) => number(label).refine((n) => n > 0, { error: `${label} must be more than 0` });

const pair = (kind: BandKind, part: 'scale' | 'normal') =>
  z.tuple([number(bandFieldLabel(kind, part, 0)), number(bandFieldLabel(kind, part, 1))], {
    error: `${BAND_LABELS[kind].label} ${part === 'scale' ? 'scale' : 'normal band'} must be two numbers, from and to`,
  });

const bandSchema = (kind: BandKind) => z.strictObject({ scale: pair(kind, 'scale'), normal: pair(kind, 'normal') });

const LevelSetSchema = z.strictObject({
  bands: z.strictObject(Object.fromEntries(BAND_KINDS.map((k) => [k, bandSchema(k)])) as Record<BandKind, ReturnType<typeof bandSchema>>),
  trips: z.strictObject({
    currentHighA: positive(TRIP_LABELS.currentHighA.label),
    temperatureHighC: number(TRIP_LABELS.temperatureHighC.label),
    flowLowLpm: positive(TRIP_LABELS.flowLowLpm.label),
  }),
  // New settings get a default so that stored versions without them still load.
  settings: z
    .strictObject({
      minOrientingFieldG: positive(SETTING_LABELS.minOrientingFieldG.label).default(DEMO_LEVEL_SET.settings.minOrientingFieldG),
      maxTargetFieldG: positive(SETTING_LABELS.maxTargetFieldG.label).default(DEMO_LEVEL_SET.settings.maxTargetFieldG),
      maxTargetCollapseRatio: positive(SETTING_LABELS.maxTargetCollapseRatio.label)
        .refine((n) => n < 1, { error: `${SETTING_LABELS.maxTargetCollapseRatio.label} must be below 1 (1 is the collapse threshold)` })
        .default(DEMO_LEVEL_SET.settings.maxTargetCollapseRatio),
    })
    .default({ ...DEMO_LEVEL_SET.settings }),
});

/**
 * Validates a whole level set: every number, then each band's own order (scale from < to,
 * normal band inside the scale) and each trip level inside its scale. Throws LevelSetError
 * naming the first problem as the form labels it.
 */
export function parseLevelSet(input: unknown): LevelSet {
  const parsed = LevelSetSchema.safeParse(input);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw new LevelSetError(issue.message, issue.path.join('.'));
  }
  const levels = parsed.data as LevelSet;
  for (const kind of BAND_KINDS) {
    const { scale, normal } = levels.bands[kind];
    if (scale[0] >= scale[1]) throw new LevelSetError(`${bandFieldLabel(kind, 'scale', 1)} must be above ${bandFieldLabel(kind, 'scale', 0)}`, `bands.${kind}.scale.1`);
    if (normal[0] >= normal[1]) throw new LevelSetError(`${bandFieldLabel(kind, 'normal', 1)} must be above ${bandFieldLabel(kind, 'normal', 0)}`, `bands.${kind}.normal.1`);
    if (normal[0] < scale[0] || normal[1] > scale[1]) {
      throw new LevelSetError(`${BAND_LABELS[kind].label} normal band must lie inside its scale (${scale[0]} … ${scale[1]} ${BAND_LABELS[kind].unit})`, `bands.${kind}.normal.${normal[0] < scale[0] ? 0 : 1}`);
    }
  }
  for (const [key, info] of Object.entries(TRIP_LABELS) as [keyof LevelSet['trips'], (typeof TRIP_LABELS)[keyof LevelSet['trips']]][]) {
    const { scale } = levels.bands[info.kind];
    const value = levels.trips[key];
    // Current levels apply to |I|, so the current scale's larger end bounds its trip level.
    const [from, to] = info.kind === 'current' ? [0, Math.max(Math.abs(scale[0]), Math.abs(scale[1]))] : scale;
    if (value <= from || value >= to) {
      throw new LevelSetError(`${info.label} must lie inside the scale (${scale[0]} … ${scale[1]} ${info.unit}) so that Live can draw it`, `trips.${key}`);
    }
  }
  return levels;
}
