/**
 * The interlock as the API and the WebSocket show it: times as ISO 8601 UTC, the caution that
 * the software interlock is supervisory, and the controller's own hardware trip apart.
 */
import type { InterlockCondition, InterlockFirstOut, InterlockStatus, InterlockTripRecord } from '../../shared/alarms/alarm-api.js';
import type { LiveState } from '../../shared/live/live-state.js';
import { SUPERVISORY_CAUTION } from '../notify/compose-notice.js';
import type { FirstOut, InterlockState, TripRecord } from './interlock.js';
import type { ConditionStatus } from './trip-conditions.js';

export function firstOutBody(firstOut: FirstOut): InterlockFirstOut {
  return { ...firstOut, at: new Date(firstOut.at).toISOString() };
}

export function conditionBody(c: ConditionStatus): InterlockCondition {
  return {
    name: c.name,
    channel: c.channel,
    active: c.active,
    value: c.value,
    limit: c.limit,
    label: c.label,
    unit: c.unit,
    margin: c.margin,
    valueText: c.valueText,
    tripsWhen: c.tripsWhen,
  };
}

/** The trip in force (not reset yet). */
export function tripBody(trip: TripRecord): InterlockTripRecord {
  return {
    trippedAt: new Date(trip.at).toISOString(),
    firstOut: firstOutBody(trip.firstOut),
    reason: trip.reason,
    valuesAtTrip: trip.valuesAtTrip.map(conditionBody),
    reset: null,
  };
}

/** `GET /api/interlock` without `history`, and the interlock part of the WebSocket `alarms` message. */
export function interlockBody(state: InterlockState, controller: LiveState['controller']): InterlockStatus {
  return {
    state: state.state,
    firstOut: state.firstOut ? firstOutBody(state.firstOut) : null,
    conditions: state.conditions.map(conditionBody),
    hardwareTripped: controller.hardwareTripped,
    hardwareTripCause: controller.hardwareTripCause,
    trip: state.trip ? tripBody(state.trip) : null,
    caution: SUPERVISORY_CAUTION,
  };
}
