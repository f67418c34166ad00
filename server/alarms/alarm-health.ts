/**
 * Alarm-system health figures for the Alarms page: how many alarms reach the operator per
 * 10 minutes, alarm floods, chattering alarms and stale alarms. Pure functions over the event
 * history (any order) and the active list.
 *
 * The 10-minute rate and the flood threshold (more than 10 alarms in 10 minutes for one
 * operator) are the scale ISA-18.2 / IEC 62682 use for alarm-system performance (from memory).
 * The chattering rule (3 or more raises of the same alarm within 60 s) and the stale rule
 * (active longer than 24 h) are common practice in alarm-management reviews.
 */
import type { AlarmEvent } from './alarm-state.js';

export type HealthEvent = Pick<AlarmEvent, 'alarmId' | 'at' | 'kind' | 'hidden'>;

export interface HealthRules {
  /** Length of one rate interval, ms. */
  intervalMs: number;
  /** A flood is more than this many annunciated alarms in one interval. */
  floodAbove: number;
  /** Raises of one alarm within `chatterWindowMs` that make it chattering. */
  chatterRaises: number;
  chatterWindowMs: number;
  /** Active longer than this, ms, makes an alarm stale. */
  staleAfterMs: number;
}

export const DEFAULT_HEALTH_RULES: Readonly<HealthRules> = {
  intervalMs: 10 * 60_000,
  floodAbove: 10,
  chatterRaises: 3,
  chatterWindowMs: 60_000,
  staleAfterMs: 24 * 3_600_000,
};

export interface RateInterval {
  /** Start of the interval, Unix epoch ms. */
  start: number;
  count: number;
  flood: boolean;
}

export interface ChatteringAlarm {
  alarmId: string;
  /** Most raises found inside one chatter window. */
  raises: number;
  /** Time of the first raise of that busiest window, Unix epoch ms. */
  since: number;
}

export interface StaleAlarm {
  alarmId: string;
  raisedAt: number;
  activeForMs: number;
}

export interface AlarmHealth {
  /** Annunciated raises in the interval that ends now. */
  recentCount: number;
  /** True when `recentCount` is above the flood threshold. */
  flooding: boolean;
  intervals: RateInterval[];
  /** Mean annunciated raises per interval over `intervals`. */
  averagePerInterval: number;
  chattering: ChatteringAlarm[];
  stale: StaleAlarm[];
}

/** Raises the operator saw (shelved or suppressed raises are logged but not annunciated). */
function annunciatedRaiseTimes(events: readonly HealthEvent[]): number[] {
  return events.filter((e) => e.kind === 'raise' && !e.hidden).map((e) => e.at);
}

/**
 * Annunciated raises per fixed interval from `fromMs` up to `toMs` (Unix epoch ms), each
 * flagged when it is a flood. The last interval may be shorter than `intervalMs`.
 */
export function ratePerInterval(
  events: readonly HealthEvent[],
  fromMs: number,
  toMs: number,
  rules: Pick<HealthRules, 'intervalMs' | 'floodAbove'> = DEFAULT_HEALTH_RULES,
): RateInterval[] {
  if (!(toMs > fromMs)) return [];
  const n = Math.ceil((toMs - fromMs) / rules.intervalMs);
  const counts = new Array<number>(n).fill(0);
  for (const at of annunciatedRaiseTimes(events)) {
    if (at >= fromMs && at < toMs) counts[Math.floor((at - fromMs) / rules.intervalMs)]++;
  }
  return counts.map((count, i) => ({ start: fromMs + i * rules.intervalMs, count, flood: count > rules.floodAbove }));
}

/** Annunciated raises in the interval (`nowMs` − `intervalMs`, `nowMs`]. */
export function recentRaiseCount(events: readonly HealthEvent[], nowMs: number, intervalMs = DEFAULT_HEALTH_RULES.intervalMs): number {
  return annunciatedRaiseTimes(events).filter((at) => at > nowMs - intervalMs && at <= nowMs).length;
}

/**
 * Alarms raised at least `chatterRaises` times within any `chatterWindowMs`. Hidden raises
 * count here: a shelved alarm that keeps chattering still needs its deadband or delay fixed.
 */
export function chatteringAlarms(
  events: readonly HealthEvent[],
  rules: Pick<HealthRules, 'chatterRaises' | 'chatterWindowMs'> = DEFAULT_HEALTH_RULES,
): ChatteringAlarm[] {
  const raises = new Map<string, number[]>();
  for (const e of events) {
    if (e.kind !== 'raise') continue;
    const times = raises.get(e.alarmId) ?? [];
    times.push(e.at);
    raises.set(e.alarmId, times);
  }
  const out: ChatteringAlarm[] = [];
  for (const [alarmId, times] of raises) {
    times.sort((a, b) => a - b);
    let best = 0;
    let since = 0;
    let start = 0;
    for (let end = 0; end < times.length; end++) {
      while (times[end] - times[start] > rules.chatterWindowMs) start++;
      if (end - start + 1 > best) {
        best = end - start + 1;
        since = times[start];
      }
    }
    if (best >= rules.chatterRaises) out.push({ alarmId, raises: best, since });
  }
  return out.sort((a, b) => b.raises - a.raises || a.alarmId.localeCompare(b.alarmId));
}

/**
 * Active alarms raised more than `staleAfterMs` before `nowMs`. Takes the active list (not
 * the history) because a stale alarm's raise may be older than any history window fetched.
 */
export function staleAlarms(
  active: readonly { id: string; raisedAt: number }[],
  nowMs: number,
  staleAfterMs = DEFAULT_HEALTH_RULES.staleAfterMs,
): StaleAlarm[] {
  return active
    .filter((a) => nowMs - a.raisedAt > staleAfterMs)
    .map((a) => ({ alarmId: a.id, raisedAt: a.raisedAt, activeForMs: nowMs - a.raisedAt }))
    .sort((a, b) => a.raisedAt - b.raisedAt);
}

/** All health figures for the history window [`fromMs`, `nowMs`) and the active list. */
export function alarmHealth(
  events: readonly HealthEvent[],
  active: readonly { id: string; raisedAt: number }[],
  fromMs: number,
  nowMs: number,
  rules: HealthRules = DEFAULT_HEALTH_RULES,
): AlarmHealth {
  const intervals = ratePerInterval(events, fromMs, nowMs, rules);
  const recentCount = recentRaiseCount(events, nowMs, rules.intervalMs);
  const total = intervals.reduce((sum, i) => sum + i.count, 0);
  return {
    recentCount,
    flooding: recentCount > rules.floodAbove,
    intervals,
    averagePerInterval: intervals.length ? total / intervals.length : 0,
    chattering: chatteringAlarms(events, rules),
    stale: staleAlarms(active, nowMs, rules.staleAfterMs),
  };
}
