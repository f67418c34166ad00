/**
 * Pages the on-call list: a notice for every software-interlock trip and for every annunciated
 * raise of a high-priority alarm. Only queues mail (`Mailer.send` never waits or throws), so it
 * is safe on the evaluation path.
 */
import type { AlarmLimit } from '../alarms/alarm-limit.js';
import type { AlarmEvent } from '../alarms/alarm-state.js';
import type { TripRecord } from '../interlock/interlock.js';
import { composeAlarmNotice, composeTripNotice, needsOnCallNotice, type NoticeOptions } from './compose-notice.js';
import type { MailMessage } from './mailer.js';

export interface MailQueue {
  send(message: MailMessage): void;
}

export class OnCallNotifier {
  constructor(
    private readonly mailer: MailQueue,
    private readonly notice: NoticeOptions,
    /** The limit in force for an alarm id (its rationale goes into the notice). */
    private readonly limitOf: (alarmId: string) => AlarmLimit | undefined,
  ) {}

  trip(trip: TripRecord): void {
    this.mailer.send(composeTripNotice(trip, this.notice));
  }

  alarmEvents(events: readonly AlarmEvent[]): void {
    for (const event of events) {
      if (!needsOnCallNotice(event)) continue;
      const limit = this.limitOf(event.alarmId);
      if (limit) this.mailer.send(composeAlarmNotice(event, limit, this.notice));
    }
  }
}
