/**
 * Assembles alarms, the software interlock and on-call mail for the server: limits from the
 * database (seeded with the demo set), the alarm states and a latched trip restored from
 * before a restart, the record writer, the mail path (a real SMTP server, or the local
 * mailbox), the supervisor and the routes. The owner calls `close()`.
 */
import type { Logger } from 'pino';
import { AlarmBook } from '../alarms/alarm-book.js';
import { alarmLimitHandlers } from '../alarms/alarm-limit-routes.js';
import { loadAlarmLimits } from '../alarms/alarm-limit-repository.js';
import { alarmHandlers, type AlarmRoutes } from '../alarms/alarm-routes.js';
import { loadAlarmStates } from '../alarms/alarm-state-repository.js';
import { SupervisionJournal } from '../alarms/supervision-journal.js';
import { SupervisionLog, type SupervisionCounters } from '../alarms/supervision-log.js';
import type { ServerConfig } from '../config.js';
import type { Db } from '../db/database.js';
import type { RouteHandlers } from '../http/route-table.js';
import type { LiveStore } from '../live/live-store.js';
import { composeChannelBands } from '../../shared/levels/channel-bands.js';
import type { ChannelBands } from '../../shared/live/channels.js';
import { levelHandlers, type LevelRoutes } from '../levels/level-routes.js';
import type { LevelStore } from '../levels/level-store.js';
import { parseNoticeOptions, type NoticeOptions } from '../notify/compose-notice.js';
import { LocalMailbox } from '../notify/local-mailbox.js';
import { Mailer } from '../notify/mailer.js';
import { OnCallNotifier } from '../notify/on-call-notifier.js';
import { outboxHandlers } from '../notify/outbox-routes.js';
import { Interlock } from './interlock.js';
import { interlockTrips, parseInterlockConfig } from './interlock-config.js';
import { interlockHandlers } from './interlock-routes.js';
import { Supervisor, type AlarmsSink, type SteeringContext } from './supervisor.js';
import { openTrip } from './trip-repository.js';

/** The lab named in notice subjects (the demo scenario). */
const SITE = 'Lindqvist Hall dipolar lab';

type SupervisionRoutes =
  | AlarmRoutes
  | 'alarm-limits.list'
  | 'alarm-limits.update'
  | 'interlock.status'
  | 'interlock.reset'
  | 'admin.outbox'
  | LevelRoutes;

export interface Supervision {
  supervisor: Supervisor;
  /** The alarms (read by the logbook's links and the handover draft). */
  book: AlarmBook;
  /** The software interlock (its state goes into the handover draft). */
  interlock: Interlock;
  /** On-call mail and its recipients (the handover summary goes out through it). */
  mailer: Mailer;
  notice: NoticeOptions;
  /** Writes journaled alarm events and trips (before reading them back). */
  flushRecords(): Promise<void>;
  /** The supervision journal and its writes (`/api/health`). */
  records(): SupervisionCounters;
  /** The level set in force (steering's pre-flight reads its trip levels and operating settings). */
  levels: LevelStore;
  handlers: Pick<RouteHandlers, SupervisionRoutes>;
  /** Stops evaluating, writes what is queued, closes the mailer and the local mailbox. */
  close(): Promise<void>;
}

/** Where the alarm state and the display bands in force go (the WebSocket fan-out). */
export interface SupervisionSink extends AlarmsSink {
  publishChannels(bands: ChannelBands): void;
}

export async function startSupervision(deps: {
  db: Db;
  live: LiveStore;
  sink: SupervisionSink;
  config: ServerConfig;
  log: Logger;
  /** The lead-set levels (trip levels, bands, settings), loaded once for the whole server. */
  levels: LevelStore;
  /** Seconds the PostgreSQL server has been unreachable (the `databaseOutage` alarm); absent with PGlite. */
  databaseOutageS?: () => number;
  /** The target in force and whether a ramp is programmed (steering). */
  steering?: SteeringContext;
}): Promise<Supervision> {
  const { db, live, sink, config, log, levels, steering } = deps;
  const book = new AlarmBook(await loadAlarmLimits(db));
  // Trips and transitions an earlier run journaled but could not store go in first, so the
  // alarm states and the latch read back below include them.
  const journal = new SupervisionJournal(config.dataDir);
  const records = new SupervisionLog(db, {
    journal,
    statesOf: (ids) => book.memories(ids),
    onError: (error) => log.error({ err: error }, 'a database write of supervision records failed (records not stored wait in the supervision journal)'),
  });
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
  closers.push(() => records.close());
  try {
    const left = journal.counters().journalPending;
    if (left > 0) {
      await records.flush();
      const still = journal.counters().journalPending;
      if (still === 0) log.warn({ records: left }, 'supervision records journaled by an earlier run were stored');
      else log.error({ records: still }, 'supervision records from an earlier run could not be stored yet; retrying');
    }
    // Between the writes: forgets the ids of stored records the journal no longer holds.
    void records.pruneApplied();
    book.restore(await loadAlarmStates(db));
    const interlock = new Interlock(parseInterlockConfig({ staleMs: config.staleTripMs, ...interlockTrips(levels.inForce().levels.trips) }));
    // One source: the level set in force feeds the interlock's trip levels and the gauges' bands.
    const publishBands = () => sink.publishChannels(composeChannelBands(levels.inForce(), book.limits()));
    levels.onChange((set) => {
      interlock.retune(interlockTrips(set.levels.trips));
      publishBands();
    });
    publishBands();
    const latched = await openTrip(db);
    if (latched) {
      interlock.restore(latched);
      log.warn({ firstOut: latched.firstOut }, 'software interlock still tripped from before the restart; reset it once the cause is cleared');
    }
    const mailbox = config.mail.smtpUrl === null ? await LocalMailbox.start({ port: config.mail.mailboxPort, log }) : null;
    if (mailbox) {
      closers.push(() => mailbox.close());
      log.info({ url: mailbox.url }, 'local mailbox running (no SMTP_URL): notices appear on the admin Outbox page');
    }
    const mailer = new Mailer({ transport: config.mail.smtpUrl ?? mailbox!.url, from: config.mail.from, log });
    closers.push(() => mailer.close());
    const notice = parseNoticeOptions({ onCall: config.mail.onCall, site: SITE });
    const notifier = new OnCallNotifier(mailer, notice, (id) => book.limits().find((l) => l.id === id));
    const outage = deps.databaseOutageS;
    const supervisor = new Supervisor({ live, interlock, book, records, notifier, sink, log, extras: outage ? () => ({ databaseOutageS: outage() }) : undefined, steering });
    closers.push(() => supervisor.close());

    return {
      supervisor,
      book,
      interlock,
      mailer,
      notice,
      flushRecords: () => records.flush(),
      records: () => records.counters(),
      levels,
      handlers: {
        ...alarmHandlers({ db, book, records, announce: () => supervisor.announce() }),
        ...alarmLimitHandlers(db, book, levels, publishBands),
        ...levelHandlers(levels, book),
        ...interlockHandlers({ db, interlock, live, supervisor, records }),
        ...outboxHandlers(mailbox),
      },
      close,
    };
  } catch (error) {
    await close();
    throw error;
  }
}
