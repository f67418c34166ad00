/**
 * Alarm and interlock shapes shared by the server's API, the WebSocket and the web app
 * (issue 4). States follow ISA-18.2 / IEC 62682.
 */
export type AlarmPriority = 'high' | 'medium' | 'low';
/** The annunciated states of ISA-18.2 / IEC 62682. */
export type AlarmProcessState = 'normal' | 'unacknowledged' | 'acknowledged' | 'returned-unacknowledged' | 'latched';
/** The suppression states laid over the annunciated ones. */
export type AlarmSuppression = 'shelved' | 'suppressed' | 'out-of-service';
/** What the operator sees: the suppression when one applies, the annunciated state otherwise. */
export type AlarmStateName = AlarmProcessState | AlarmSuppression;
/** One kind of transition in the alarm history. */
export type AlarmEventKind =
  | 'raise'
  | 'clear'
  | 'acknowledge'
  | 'reset'
  | 'shelve'
  | 'unshelve'
  | 'shelve-expired'
  | 'suppress'
  | 'unsuppress'
  | 'out-of-service'
  | 'return-to-service';

/** One entry of `GET /api/alarms?state=active`. */
export interface ActiveAlarm {
  id: string;
  channel: string;
  priority: AlarmPriority;
  state: AlarmStateName | string;
  /** ISO 8601 UTC. */
  raisedAt: string;
  /** When the condition began (before the on-delay), ISO 8601 UTC; first-out groups are ordered by it. */
  conditionSince?: string;
  /** Present value (channel unit), live. */
  value: number | null;
  /** Value when the alarm was raised. */
  valueAtRaise?: number | null;
  limit: number;
  /** True when later alarms are grouped under this one (its condition began first). */
  firstOut?: boolean;
  /** Id of the first-out alarm this one is grouped under. */
  firstOutOf?: string;
  level?: AlarmLevel;
}

export type AlarmLevel = 'HH' | 'H' | 'L' | 'LL';

/** One entry of `GET /api/alarms?state=all` and of the answers to alarm actions. */
export interface AlarmListItem {
  id: string;
  channel: string;
  level: AlarmLevel;
  priority: AlarmPriority;
  state: AlarmStateName;
  /** ISO 8601 UTC; null while normal. */
  raisedAt: string | null;
  /** When the condition of the present raise began, ISO 8601 UTC; null while normal. */
  conditionSince: string | null;
  /** Present value (channel unit), null before the first one. */
  value: number | null;
  /** Value when the alarm was raised; null while normal. */
  valueAtRaise: number | null;
  limit: number;
  firstOut: boolean;
  firstOutOf?: string;
  /** Who shelved it, why and until when (ISO 8601 UTC); null when not shelved. */
  shelf: { by: string; reason: string; since: string; until: string } | null;
}

/** Answer of `POST /api/alarms/:id/{acknowledge,shelve,unshelve,out-of-service,reset}`. */
export interface AlarmActionResult {
  alarm: AlarmListItem;
  /** False when the request changed nothing (e.g. acknowledging an acknowledged alarm). */
  changed: boolean;
}

/** One entry of `GET /api/alarms/history?hours=N` (newest first). */
export interface AlarmHistoryEvent {
  alarmId: string;
  channel: string;
  priority: AlarmPriority;
  kind: AlarmEventKind;
  /** ISO 8601 UTC. */
  at: string;
  from: AlarmStateName;
  to: AlarmStateName;
  value: number | null;
  limit: number;
  actor?: string;
  reason?: string;
  /** Set on raises and clears that happened shelved or suppressed (not annunciated). */
  hidden?: 'shelved' | 'suppressed' | 'out-of-service';
  firstOutOf?: string;
}

/** Body of `GET /api/alarms/health?hours=N`: alarm-system figures over the window. */
export interface AlarmHealthReport {
  /** Window, ISO 8601 UTC. */
  from: string;
  to: string;
  /** Annunciated raises in the last 10 minutes, and whether that is a flood (> 10). */
  recentCount: number;
  flooding: boolean;
  averagePerInterval: number;
  intervals: { start: string; count: number; flood: boolean }[];
  chattering: { alarmId: string; raises: number; since: string }[];
  stale: { alarmId: string; raisedAt: string; activeForMs: number }[];
  rules: { intervalMinutes: number; floodAbove: number; chatterRaises: number; chatterWindowS: number; staleAfterHours: number };
}

/**
 * `InterlockFirstOut.condition` of a trip found at start: the controller was holding, but no
 * trip was on record (its record was lost); the cause is unknown.
 */
export const FIRST_OUT_FOUND_AT_START = 'found-at-start';

export interface InterlockFirstOut {
  condition: string;
  channel: string;
  value: number | null;
  limit: number;
  /** ISO 8601 UTC. */
  at: string;
}

export interface InterlockCondition {
  name: string;
  channel: string;
  active: boolean;
  value: number | null;
  limit: number;
  /** What is measured, for people ("Coolant flow x"). */
  label?: string;
  /** Unit of `value`, `limit` and `margin`; '' for yes/no conditions. */
  unit?: string;
  /** Distance to the trip level in `unit`, positive while safe; null without data or for yes/no conditions. */
  margin?: number | null;
  /** Value with its unit ("66.2 °C", "offline", "no data"). */
  valueText?: string;
  /** When the condition trips ("above 65.0 °C", "offline"). */
  tripsWhen?: string;
}

/** A trip as stored: first-out, every condition at that moment, and the reset once done. */
export interface InterlockTripRecord {
  /** ISO 8601 UTC. */
  trippedAt: string;
  firstOut: InterlockFirstOut;
  reason: string;
  valuesAtTrip: InterlockCondition[];
  reset: { at: string; actor: string; reason: string } | null;
}

/** Body of `GET /api/interlock` (and of the WebSocket `alarms` message, without `history`). */
export interface InterlockStatus {
  state: 'ok' | 'tripped';
  firstOut: InterlockFirstOut | null;
  conditions: InterlockCondition[];
  /** The controller's own hardware trip; reset only at the controller. */
  hardwareTripped: boolean;
  /** The controller's cause of its hardware trip, e.g. `low-flow`. */
  hardwareTripCause?: string | null;
  /** The trip in force (with every condition at the trip), null while ok. */
  trip?: InterlockTripRecord | null;
  /** The newest trips, newest first (`GET /api/interlock` only). */
  history?: InterlockTripRecord[];
  /** True when the history could not be read (the database is unreachable); `history` is then empty. */
  historyUnavailable?: boolean;
  /** The software interlock is supervisory: the caution to show beside it. */
  caution?: string;
}

/** 409 body of `POST /api/interlock/reset` when the reset is refused. */
export interface InterlockResetRefusal {
  error: string;
  /**
   * Why: `conditions-active` (see `conditions`), `hardware-tripped` (the controller's own trip
   * must be cleared at the apparatus first), `not-tripped`, `reset-in-progress`.
   */
  code?: 'conditions-active' | 'hardware-tripped' | 'not-tripped' | 'reset-in-progress';
  conditions: InterlockCondition[];
}

/** WebSocket message sent when the interlock or the active alarm list changes (and after hello). */
export interface AlarmsMessage {
  type: 'alarms';
  /**
   * Goes up whenever the interlock state or the active list changes; messages between such
   * changes only refresh present values (at most four times a second).
   */
  revision: number;
  interlock: InterlockStatus;
  active: ActiveAlarm[];
}
