/**
 * One alarm limit: a level on a channel with its deadband, delays, priority and the rationale
 * a lead writes for the operator (cause, consequence of doing nothing, action, time to
 * respond), following the alarm-rationalization step of ISA-18.2 / IEC 62682.
 */
import { z } from 'zod';
import { limitOrderProblems, type ChannelLevels } from '../../shared/levels/limit-order.js';
import { CHANNELS, CHANNEL_IDS, isChannelId, type ChannelId } from './channels.js';

/** HH and H raise above the limit, L and LL below it. */
export const ALARM_LEVELS = ['HH', 'H', 'L', 'LL'] as const;
export type AlarmLevel = (typeof ALARM_LEVELS)[number];

export const ALARM_PRIORITIES = ['high', 'medium', 'low'] as const;
export type AlarmPriority = (typeof ALARM_PRIORITIES)[number];

/** Longest accepted on- or off-delay, ms; longer delays hide real faults. */
export const MAX_ALARM_DELAY_MS = 60_000;

const text = (field: string, max: number) =>
  z
    .string({ error: `${field} must be text` })
    .trim()
    .min(1, { error: `${field} must not be empty: write it for the operator on shift` })
    .max(max, { error: `${field} must be at most ${max} characters` });

const delay = (label: string) =>
  z
    .number({ error: `${label} must be a number of milliseconds` })
    .int({ error: `${label} must be a whole number of milliseconds` })
    .min(0, { error: `${label} must be 0 ms or more` })
    .max(MAX_ALARM_DELAY_MS, { error: `${label} must be at most ${MAX_ALARM_DELAY_MS} ms` });

/** How the limit editor labels each field; messages name fields by these labels. */
export const ALARM_LIMIT_LABELS = {
  limit: 'Limit',
  deadband: 'Deadband',
  onDelayMs: 'On-delay (ms)',
  offDelayMs: 'Off-delay (ms)',
  priority: 'Priority',
  latching: 'Latching',
  suppressDuringRamp: 'Suppressed during ramps',
  'rationale.cause': 'Cause',
  'rationale.consequence': 'Consequence of doing nothing',
  'rationale.action': 'What the operator does',
  'rationale.respondWithinMin': 'Respond within (min)',
} as const;
const L = ALARM_LIMIT_LABELS;

export const AlarmRationaleSchema = z.strictObject({
  cause: text(L['rationale.cause'], 1000),
  consequence: text(L['rationale.consequence'], 1000),
  action: text(L['rationale.action'], 1000),
  respondWithinMin: z
    .number({ error: `${L['rationale.respondWithinMin']} must be a number of minutes` })
    .positive({ error: `${L['rationale.respondWithinMin']} must be more than 0 minutes` })
    .max(24 * 60, { error: `${L['rationale.respondWithinMin']} must be at most 1440 minutes (one day)` }),
});
export type AlarmRationale = z.infer<typeof AlarmRationaleSchema>;

export const AlarmLimitSchema = z.strictObject({
  id: z
    .string({ error: 'id must be text' })
    .regex(/^[a-z][A-Za-z0-9.-]{0,79}$/, {
      error: 'id must start with a lower-case letter and use only letters, digits, "." and "-" (at most 80 characters)',
    }),
  channel: z.string({ error: 'channel must be text' }).refine(isChannelId, {
    error: `channel must be one of: ${CHANNEL_IDS.join(', ')}`,
  }),
  level: z.enum(ALARM_LEVELS, { error: `level must be one of ${ALARM_LEVELS.join(', ')}` }),
  limit: z.number({ error: `${L.limit} must be a finite number in the channel unit` }),
  deadband: z
    .number({ error: `${L.deadband} must be a number in the channel unit` })
    .min(0, { error: `${L.deadband} must be 0 or more (in the channel unit)` }),
  onDelayMs: delay(L.onDelayMs),
  offDelayMs: delay(L.offDelayMs),
  priority: z.enum(ALARM_PRIORITIES, { error: `${L.priority} must be one of ${ALARM_PRIORITIES.join(', ')}` }),
  latching: z.boolean({ error: `${L.latching} must be true or false` }),
  /** Suppressed by design while a ramp is programmed (e.g. current deviation during ramps). */
  suppressDuringRamp: z.boolean({ error: `${L.suppressDuringRamp} must be true or false` }).default(false),
  rationale: AlarmRationaleSchema,
});

/** A validated limit; `channel` is narrowed to a known channel id. */
export type AlarmLimit = Omit<z.infer<typeof AlarmLimitSchema>, 'channel'> & { channel: ChannelId };

/** True for levels that raise above the limit. */
export function isHighLevel(level: AlarmLevel): boolean {
  return level === 'H' || level === 'HH';
}

/** A refused limit: the message names the field as the editor labels it; `field` is its path. */
export class AlarmLimitError extends Error {
  constructor(
    message: string,
    readonly field: string | null,
  ) {
    super(message);
    this.name = 'AlarmLimitError';
  }
}

/**
 * Validates one limit (e.g. a lead's edit). Throws an AlarmLimitError whose message lists
 * every problem by its label, and whose `field` is the first problem's path.
 */
export function parseAlarmLimit(input: unknown): AlarmLimit {
  const parsed = AlarmLimitSchema.safeParse(input);
  if (!parsed.success) {
    const first = parsed.error.issues[0];
    throw new AlarmLimitError(`invalid alarm limit: ${describeIssues(parsed.error)}`, first.path.length ? first.path.join('.') : null);
  }
  return parsed.data as AlarmLimit;
}

/**
 * Problems with the order of the alarm levels on one channel, with the trip levels when the
 * channel has them (the shared limit-order rule); `subject` names the level being edited.
 */
export function channelOrderProblems(limits: readonly AlarmLimit[], channel: ChannelId, trips: Pick<ChannelLevels, 'tripLow' | 'tripHigh'> = {}, subject?: AlarmLimit['level'] | 'tripLow' | 'tripHigh'): string[] {
  const levels: ChannelLevels = { ...trips };
  for (const l of limits) if (l.channel === channel) levels[l.level] = l.limit;
  return limitOrderProblems(levels, CHANNELS[channel].unit, subject).map((p) => `on ${CHANNELS[channel].label}, ${p.message}`);
}

/**
 * Validates a whole set: each limit, unique ids, and the order of levels on one channel
 * (HH above H, LL below L, every high level above every low level), since an inverted pair
 * would raise the more severe alarm first.
 */
export function parseAlarmLimits(input: unknown): AlarmLimit[] {
  if (!Array.isArray(input)) throw new Error('invalid alarm limits: expected a list of limits');
  const limits = input.map((item, i) => {
    try {
      return parseAlarmLimit(item);
    } catch (err) {
      throw new Error(`limit #${i + 1}: ${(err as Error).message}`);
    }
  });
  const seen = new Set<string>();
  for (const l of limits) {
    if (seen.has(l.id)) throw new Error(`invalid alarm limits: id "${l.id}" appears twice; ids must be unique`);
    seen.add(l.id);
  }
  for (const channel of new Set(limits.map((l) => l.channel))) {
    const [problem] = channelOrderProblems(limits, channel);
    if (problem) throw new Error(`invalid alarm limits: ${problem}`);
  }
  return limits;
}

/** The messages name their field by its label already. */
function describeIssues(error: z.ZodError): string {
  return error.issues.map((i) => i.message).join('; ');
}
