/**
 * One alarm limit as `GET /api/alarm-limits` lists it (`{ limits }`), with the rationale a
 * lead wrote for the operator. `PUT /api/alarm-limits/:id` takes the editable fields of it
 * (not `id` or `channel`, which identify the alarm) and a reason.
 */
import type { AlarmLevel, AlarmPriority } from '../../../shared/alarms/alarm-api';

export interface AlarmRationale {
  cause: string;
  consequence: string;
  action: string;
  respondWithinMin: number;
}

export interface AlarmLimitRecord {
  id: string;
  channel: string;
  level: AlarmLevel;
  limit: number;
  deadband: number;
  onDelayMs: number;
  offDelayMs: number;
  priority: AlarmPriority;
  latching: boolean;
  suppressDuringRamp?: boolean;
  rationale: AlarmRationale;
}

/** The fields a lead may change; `id` and `channel` stay as they are. */
export type AlarmLimitChanges = Omit<AlarmLimitRecord, 'id' | 'channel'>;
