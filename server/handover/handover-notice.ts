/**
 * The e-mail the on-call list receives when a handover is accepted: who handed over to whom
 * and when, the apparatus at the time, what happened in the shift (counts and the important
 * lines), the open items and the outgoing person's summary. Plain text.
 */
import type { Handover } from '../../shared/handover/handover-api.js';
import { SUPERVISORY_CAUTION, timeLines, type NoticeOptions } from '../notify/compose-notice.js';
import type { MailMessage } from '../notify/mailer.js';

const fixed = (n: number, digits: number) => n.toFixed(digits);

export function composeHandoverNotice(handover: Handover, options: NoticeOptions): MailMessage {
  const { record, accepted, submitted } = handover;
  const a = record.apparatus;
  const openItems = handover.openItems.filter((i) => i.closed === null);
  const lines = [
    `Shift handover ${handover.id} at the ${options.site} was accepted.`,
    '',
    `Handed over by: ${submitted?.by ?? handover.author}`,
    ...(submitted ? timeLines('Submitted at', Date.parse(submitted.at), options.timeZone) : []),
    `Accepted by:    ${accepted?.by ?? '—'}`,
    ...(accepted ? timeLines('Accepted at', Date.parse(accepted.at), options.timeZone) : []),
    ...(accepted?.comment ? [`Comment:        ${accepted.comment}`] : []),
    `Shift covered:  ${handover.periodFrom} to ${handover.periodTo} (UTC)`,
    '',
    'Apparatus when filled in',
    `  Field: ${a.field ? `${fixed(a.field.magnitudeG, 2)} G, θ ${a.field.thetaDeg === null ? '—' : `${fixed(a.field.thetaDeg, 1)}°`}, φ ${a.field.phiDeg === null ? '—' : `${fixed(a.field.phiDeg, 1)}°`}` : 'no telemetry'}`,
    `  Currents: ${a.currentsA ? `x ${fixed(a.currentsA.x, 2)} A, y ${fixed(a.currentsA.y, 2)} A, z ${fixed(a.currentsA.z, 2)} A` : 'no telemetry'}`,
    `  Software interlock: ${a.interlock === 'tripped' ? `TRIPPED (first-out: ${a.interlockFirstOut ?? 'unknown'})` : 'ok'}`,
    `  Hardware interlock: ${a.hardwareTripped ? `TRIPPED (${a.hardwareTripCause ?? 'cause not reported'})` : 'ok'}`,
    `  Controller: ${a.controllerOnline ? 'online' : 'OFFLINE'}${a.controllerMode ? `, mode ${a.controllerMode}` : ''}`,
    '',
    `Alarms away from normal: ${record.alarms.length}`,
    ...record.alarms.map((al) => `  ${al.id} (${al.priority}) ${al.state}`),
    `Interlock trips in the shift: ${record.trips.length}`,
    ...record.trips.map((t) => `  ${t.trippedAt} ${t.firstOut}; ${t.reset ? `reset by ${t.reset.by}: ${t.reset.reason}` : 'NOT RESET'}`),
    `Setting changes: ${record.changes.length}`,
    ...record.changes.map((c) => `  ${c.at} ${c.action} ${c.subject} by ${c.actor}${c.reason ? `: ${c.reason}` : ''}`),
    `Logbook entries: ${record.logbook.length}`,
    `Runs and shots: ${record.runs.recorded ? record.runs.items.length : 'not recorded'}`,
    '',
    `Open items carried forward: ${openItems.length}`,
    ...openItems.map((i) => `  - ${i.text}`),
    '',
    'Summary',
    handover.summary.trim() === '' ? '  (none written)' : handover.summary,
    '',
    SUPERVISORY_CAUTION,
  ];
  return {
    to: options.onCall,
    subject: `[${options.site}] Shift handover ${handover.id} accepted by ${accepted?.by ?? '—'}`,
    text: lines.join('\n'),
  };
}
