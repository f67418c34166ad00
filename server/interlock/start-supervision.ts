/**
 * Assembles alarms, the software interlock and on-call mail for the server: limits from the
 * database (seeded with the demo set), the alarm states and a latched trip restored from
 * before a restart, the record writer, the mail path (a real SMTP server, or the local
 * catcher), the supervisor and the routes. The owner calls `close()`.
 */
import type { Logger } from 'pino';
import { AlarmBook } from '../alarms/alarm-book.js';
import { alarmLimitHandlers } from '../alarms/alarm-limit-routes.js';
import { loadAlarmLimits } from '../alarms/alarm-limit-repository.js';
import { alarmHandlers, type AlarmRoutes } from '../alarms/alarm-routes.js';
import { loadAlarmStates } from '../alarms/alarm-state-repository.js';
import { SupervisionLog } from '../alarms/supervision-log.js';
import type { ServerConfig } from '../config.js';
import type { Db } from '../db/database.js';
import type { RouteHandlers } from '../http/route-table.js';
import type { LiveStore } from '../live/live-store.js';
import { parseNoticeOptions } from '../notify/compose-notice.js';
import { MailCatcher } from '../notify/mail-catcher.js';
import { Mailer } from '../notify/mailer.js';
import { OnCallNotifier } from '../notify/on-call-notifier.js';
import { outboxHandlers } from '../notify/outbox-routes.js';
import { Interlock } from './interlock.js';
import { parseInterlockConfig } from './interlock-config.js';
import { interlockHandlers } from './interlock-routes.js';
import { Supervisor, type AlarmsSink } from './supervisor.js';
import { openTrip } from './trip-repository.js';

/** The lab named in notice subjects (the demo scenario). */
const SITE = 'Lindqvist Hall dipolar lab';

type SupervisionRoutes =
  | AlarmRoutes
  | 'alarm-limits.list'
  | 'alarm-limits.update'
  | 'interlock.status'
  | 'interlock.reset'
  | 'admin.outbox';

export interface Supervision {
  supervisor: Supervisor;
  handlers: Pick<RouteHandlers, SupervisionRoutes>;
  /** Stops evaluating, writes what is queued, closes the mailer and the local catcher. */
  close(): Promise<void>;
}

export async function startSupervision(deps: { db: Db; live: LiveStore; sink: AlarmsSink; config: ServerConfig; log: Logger }): Promise<Supervision> {
  const { db, live, sink, config, log } = deps;
  const book = new AlarmBook(await loadAlarmLimits(db));
  book.restore(await loadAlarmStates(db));
  const interlock = new Interlock(parseInterlockConfig({ staleMs: config.staleTripMs }));
  const latched = await openTrip(db);
  if (latched) {
    interlock.restore(latched);
    log.warn({ firstOut: latched.firstOut }, 'software interlock still tripped from before the restart; reset it once the cause is cleared');
  }

  const closers: (() => unknown)[] = [];
  const close = async () => {
    for (const closer of closers.reverse()) {
      try {
        await closer();
      } catch (error) {
        log.error({ err: error }, 'error while stopping alarms and interlock');
      }
    }
  };
  try {
    const records = new SupervisionLog(db, {
      statesOf: (ids) => book.memories(ids),
      onError: (error) => log.error({ err: error }, 'storing alarm events or trips failed'),
    });
    closers.push(() => records.close());
    const catcher = config.mail.smtpUrl === null ? await MailCatcher.start({ port: config.mail.catcherPort, log }) : null;
    if (catcher) {
      closers.push(() => catcher.close());
      log.info({ url: catcher.url }, 'local mail catcher running (no SMTP_URL): notices appear on the admin Outbox page');
    }
    const mailer = new Mailer({ transport: config.mail.smtpUrl ?? catcher!.url, from: config.mail.from, log });
    closers.push(() => mailer.close());
    const notice = parseNoticeOptions({ onCall: config.mail.onCall, site: SITE });
    const notifier = new OnCallNotifier(mailer, notice, (id) => book.limits().find((l) => l.id === id));
    const supervisor = new Supervisor({ live, interlock, book, records, notifier, sink, log });
    closers.push(() => supervisor.close());

    return {
      supervisor,
      handlers: {
        ...alarmHandlers({ db, book, records, announce: () => supervisor.announce() }),
        ...alarmLimitHandlers(db, book),
        ...interlockHandlers({ db, interlock, live, supervisor, records }),
        ...outboxHandlers(catcher),
      },
      close,
    };
  } catch (error) {
    await close();
    throw error;
  }
}
