/** Alarms as the API and the WebSocket show them: times as ISO 8601 UTC. */
import type { ActiveAlarm, AlarmListItem } from '../../shared/alarms/alarm-api.js';
import type { AlarmBook, AlarmStatus } from './alarm-book.js';

const iso = (ms: number) => new Date(ms).toISOString();

export function alarmListItem(s: AlarmStatus): AlarmListItem {
  const item: AlarmListItem = {
    id: s.id,
    channel: s.channel,
    level: s.level,
    priority: s.priority,
    state: s.state,
    raisedAt: s.raisedAt === null ? null : iso(s.raisedAt),
    conditionSince: s.conditionSince === null ? null : iso(s.conditionSince),
    value: s.value,
    valueAtRaise: s.valueAtRaise,
    limit: s.limit,
    firstOut: s.firstOut,
    shelf: s.shelf ? { by: s.shelf.by, reason: s.shelf.reason, since: iso(s.shelf.since), until: iso(s.shelf.until) } : null,
  };
  if (s.firstOutOf) item.firstOutOf = s.firstOutOf;
  return item;
}

/** Every alarm (`GET /api/alarms?state=all`), in definition order. */
export function allAlarms(book: AlarmBook): AlarmListItem[] {
  return book.list().map(alarmListItem);
}

/** One alarm by id; undefined when there is none. */
export function alarmItem(book: AlarmBook, id: string): AlarmListItem | undefined {
  const status = book.list().find((s) => s.id === id);
  return status && alarmListItem(status);
}

/** Annunciated alarms (`GET /api/alarms?state=active`, WebSocket `alarms`), high priority and oldest first. */
export function activeAlarms(book: AlarmBook): ActiveAlarm[] {
  const levels = new Map(book.limits().map((l) => [l.id, l.level]));
  return book.active().map((a) => {
    const item: ActiveAlarm = {
      id: a.id,
      channel: a.channel,
      priority: a.priority,
      state: a.state,
      raisedAt: iso(a.raisedAt),
      conditionSince: iso(a.conditionSince),
      value: a.value,
      valueAtRaise: a.valueAtRaise,
      limit: a.limit,
      firstOut: a.firstOut,
      level: levels.get(a.id),
    };
    if (a.firstOutOf) item.firstOutOf = a.firstOutOf;
    return item;
  });
}
