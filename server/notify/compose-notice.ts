/**
 * The e-mails the on-call list receives: one when the software interlock trips, one when a
 * high-priority alarm is raised. Plain text, values with units, times in local time and UTC.
 */
import { CHANNELS, formatChannelValue } from '../alarms/channels.js';
import { isHighLevel, type AlarmLimit } from '../alarms/alarm-limit.js';
import type { AlarmEvent } from '../alarms/alarm-state.js';
import type { TripRecord } from '../interlock/interlock.js';
import { describeCondition } from '../interlock/trip-conditions.js';
import type { MailMessage } from './mailer.js';

export interface NoticeOptions {
  /** Recipients, e.g. `oncall@lindqvist-hall.example`. */
  onCall: readonly string[];
  /** Name of the lab or machine for subjects, e.g. "Lindqvist Hall dipolar lab". */
  site: string;
  /** IANA time zone of the local times (default: the server's own). */
  timeZone?: string;
}

/** Closing line of every notice: the software interlock never replaces the hardware ones. */
export const SUPERVISORY_CAUTION =
  "Tiltwatch's software interlock is supervisory and can fail. The apparatus's own hardware " +
  'interlocks (coil temperature, coolant flow, over-current) remain authoritative, and Tiltwatch never resets them.';

/**
 * Validates notice options (e.g. from configuration) so that composing later cannot fail.
 * Throws an Error that says what to fix.
 */
export function parseNoticeOptions(input: { onCall: unknown; site: unknown; timeZone?: unknown }): NoticeOptions {
  const { onCall, site, timeZone } = input;
  if (!Array.isArray(onCall) || onCall.some((a) => typeof a !== 'string' || !/^[^\s@]+@[^\s@]+$/.test(a))) {
    throw new Error('onCall must be a list of e-mail addresses such as oncall@lindqvist-hall.example');
  }
  if (typeof site !== 'string' || site.trim() === '') throw new Error('site must name the lab or machine, e.g. "Lindqvist Hall dipolar lab"');
  if (timeZone !== undefined) {
    if (typeof timeZone !== 'string') throw new Error('timeZone must be an IANA time zone name such as Europe/Stockholm');
    try {
      new Intl.DateTimeFormat('en-GB', { timeZone });
    } catch {
      throw new Error(`timeZone "${timeZone}" is not a known IANA time zone; use a name such as Europe/Stockholm`);
    }
  }
  return { onCall: [...onCall] as string[], site: site.trim(), ...(timeZone === undefined ? {} : { timeZone }) };
}

/** True for events that page the on-call list: annunciated raises of high-priority alarms. */
export function needsOnCallNotice(event: AlarmEvent): boolean {
  return event.kind === 'raise' && !event.hidden && event.priority === 'high';
}

/** Notice of a software-interlock trip. */
export function composeTripNotice(trip: TripRecord, options: NoticeOptions): MailMessage {
  const cause = trip.valuesAtTrip.find((c) => c.name === trip.firstOut.condition);
  const causeText = cause ? describeCondition(cause) : trip.firstOut.condition;
  const lines = [
    `The software interlock of ${options.site} tripped and commanded the controller to ramp every coil to zero.`,
    '',
    `First out:  ${causeText}`,
    ...timeLines('Tripped at', trip.at, options.timeZone),
    '',
    'Every trip condition at that moment:',
    ...trip.valuesAtTrip.map((c) => `  ${c.active ? 'TRIPPED' : c.value === null ? '-      ' : 'ok     '}  ${describeCondition(c)}`),
    '',
    'What to do: find and clear the cause, then reset the interlock on the Interlocks page with a reason.',
    'The reset is refused while any condition still holds. Check the controller: its own hardware trip is reset only there.',
    '',
    SUPERVISORY_CAUTION,
  ];
  return {
    to: options.onCall,
    subject: `[Tiltwatch] Interlock tripped at ${options.site}: ${cause ? `${cause.label} ${cause.valueText}` : trip.firstOut.condition}`,
    text: lines.join('\n'),
  };
}

/** Notice of a raised alarm, with the rationale the lead wrote for it. */
export function composeAlarmNotice(event: AlarmEvent, limit: AlarmLimit, options: NoticeOptions): MailMessage {
  const channel = CHANNELS[limit.channel];
  const value = formatChannelValue(limit.channel, event.value);
  const level = formatChannelValue(limit.channel, event.limit);
  const direction = isHighLevel(limit.level) ? 'above' : 'below';
  const lines = [
    `Alarm ${limit.id} (${limit.priority} priority) was raised at ${options.site}.`,
    '',
    `${channel.label}: ${value}, ${direction} the ${limit.level} limit of ${level}.`,
    ...timeLines('Raised at', event.at, options.timeZone),
    ...(event.firstOutOf ? [`Grouped under the first-out alarm ${event.firstOutOf}: look there for the root cause.`] : []),
    '',
    `Likely cause:        ${limit.rationale.cause}`,
    `If nothing is done:  ${limit.rationale.consequence}`,
    `What to do:          ${limit.rationale.action}`,
    `Respond within:      ${limit.rationale.respondWithinMin} min`,
    '',
    'Acknowledge the alarm on the Alarms page once someone is on it.',
    '',
    SUPERVISORY_CAUTION,
  ];
  return {
    to: options.onCall,
    subject: `[Tiltwatch] ${capitalize(limit.priority)}-priority alarm at ${options.site}: ${channel.label} ${value} (${limit.level} ${level})`,
    text: lines.join('\n'),
  };
}

export function timeLines(label: string, atMs: number, timeZone: string | undefined): string[] {
  const local = new Intl.DateTimeFormat('en-GB', {
    timeZone,
    year: 'numeric',
    month: 'short',
    day: '2-digit',
    hour: '2-digit',
    minute: '2-digit',
    second: '2-digit',
    hourCycle: 'h23',
    timeZoneName: 'short',
  }).format(new Date(atMs));
  return [`${label}:  ${local} (local)`, `${' '.repeat(label.length)}   ${new Date(atMs).toISOString()} (UTC)`];
}

function capitalize(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}
