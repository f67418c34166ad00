/**
 * One alarm limit: a level on a channel with its deadband, delays, priority and the rationale
 * a lead writes for the operator (cause, consequence of doing nothing, action, time to
 * respond), following the alarm-rationalization step of ISA-18.2 / IEC 62682.
 */
import { z } from 'zod';
import { CHANNEL_IDS, isChannelId, type ChannelId } from './channels.js';

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

const delay = (field: string) =>
  z
    .number({ error: `${field} must be a number of milliseconds` })
    .int({ error: `${field} must be a whole number of milliseconds` })
    .min(0, { error: `${field} must be 0 ms or more` })
    .max(MAX_ALARM_DELAY_MS, { error: `${field} must be at most ${MAX_ALARM_DELAY_MS} ms` });

export const AlarmRationaleSchema = z.strictObject({
  cause: text('rationale.cause', 1000),
  consequence: text('rationale.consequence', 1000),
  action: text('rationale.action', 1000),
  respondWithinMin: z
    .number({ error: 'rationale.respondWithinMin must be a number of minutes' })
    .positive({ error: 'rationale.respondWithinMin must be more than 0 minutes' })
    .max(24 * 60, { error: 'rationale.respondWithinMin must be at most 1440 minutes (one day)' }),
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
  limit: z.number({ error: 'limit must be a finite number in the channel unit' }),
  deadband: z
    .number({ error: 'deadband must be a number in the channel unit' })
    .min(0, { error: 'deadband must be 0 or more (in the channel unit)' }),
  onDelayMs: delay('onDelayMs'),
  offDelayMs: delay('offDelayMs'),
  priority: z.enum(ALARM_PRIORITIES, { error: `priority must be one of ${ALARM_PRIORITIES.join(', ')}` }),
  latching: z.boolean({ error: 'latching must be true or false' }),
  /** Suppressed by design while a ramp is programmed (e.g. current deviation during ramps). */
  suppressDuringRamp: z.boolean({ error: 'suppressDuringRamp must be true or false' }).default(false),
  rationale: AlarmRationaleSchema,
});

/** A validated limit; `channel` is narrowed to a known channel id. */
export type AlarmLimit = Omit<z.infer<typeof AlarmLimitSchema>, 'channel'> & { channel: ChannelId };

/** True for levels that raise above the limit. */
export function isHighLevel(level: AlarmLevel): boolean {
  return level === 'H' || level === 'HH';
}

/**
 * Validates one limit (e.g. a lead's edit). Throws an Error whose message lists every problem
 * with its field path, so the editor can say what to fix.
 */
export function parseAlarmLimit(input: unknown): AlarmLimit {
  const parsed = AlarmLimitSchema.safeParse(input);
  if (!parsed.success) throw new Error(`invalid alarm limit: ${describeIssues(parsed.error)}`);
  return parsed.data as AlarmLimit;
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
  for (const a of limits) {
    for (const b of limits) {
      if (a.channel === b.channel && outOfOrder(a, b)) {
        throw new Error(
          `invalid alarm limits: on ${a.channel}, ${a.level} (${a.id}, ${a.limit}) must lie ${isHighLevel(a.level) ? 'above' : 'below'} ${b.level} (${b.id}, ${b.limit})`,
        );
      }
    }
  }
  return limits;
}

/** True when `a` should be more extreme than `b` on the same channel but is not. */
function outOfOrder(a: AlarmLimit, b: AlarmLimit): boolean {
  if (a.level === 'HH' && b.level === 'H') return a.limit <= b.limit;
  if (a.level === 'LL' && b.level === 'L') return a.limit >= b.limit;
  if (isHighLevel(a.level) && !isHighLevel(b.level)) return a.limit <= b.limit;
  return false;
}

function describeIssues(error: z.ZodError): string {
  return error.issues.map((i) => (i.path.length ? `${i.path.join('.')}: ${i.message}` : i.message)).join('; ');
}
