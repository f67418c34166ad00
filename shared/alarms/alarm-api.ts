/**
 * Alarm and interlock shapes shared by the server's API, the WebSocket and the web app
 * (issue 4). States follow ISA-18.2 / IEC 62682.
 */
export type AlarmPriority = 'high' | 'medium' | 'low';
export type AlarmStateName =
  | 'normal'
  | 'unacknowledged'
  | 'acknowledged'
  | 'returned-unacknowledged'
  | 'latched'
  | 'shelved'
  | 'suppressed'
  | 'out-of-service';

/** One entry of `GET /api/alarms?state=active`. */
export interface ActiveAlarm {
  id: string;
  channel: string;
  priority: AlarmPriority;
  state: AlarmStateName | string;
  /** ISO 8601 UTC. */
  raisedAt: string;
  value: number | null;
  limit: number;
  /** Id of the first-out alarm this one is grouped under. */
  firstOutOf?: string;
}

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
}

/** Body of `GET /api/interlock`. */
export interface InterlockStatus {
  state: 'ok' | 'tripped';
  firstOut: InterlockFirstOut | null;
  conditions: InterlockCondition[];
  /** The controller's own hardware trip; reset only at the controller. */
  hardwareTripped: boolean;
}

/** WebSocket message sent when the interlock or the active alarm list changes (and after hello). */
export interface AlarmsMessage {
  type: 'alarms';
  interlock: InterlockStatus;
  active: ActiveAlarm[];
}
