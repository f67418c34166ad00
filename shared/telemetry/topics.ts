/**
 * MQTT topic names shared by the controller (simulator/), the broker's ACL and the server.
 * Telemetry and status flow controller → server; commands flow server → controller.
 */
export const TOPIC_ROOT = 'tiltwatch/v1/controller';

export const TOPICS = {
  /** 1 kHz currents and voltages, batched (FastFrame). Published by the controller, QoS 0. */
  fast: `${TOPIC_ROOT}/telemetry/fast`,
  /** 10 Hz coil temperatures, flows and water temperatures (SlowFrame). Controller, QoS 0. */
  slow: `${TOPIC_ROOT}/telemetry/slow`,
  /** Retained ControllerStatus; the controller's last will sets `online: false`. */
  status: `${TOPIC_ROOT}/status`,
  /** SetpointCommand from the server. */
  setpoints: `${TOPIC_ROOT}/cmd/setpoints`,
  /** TripCommand from the server: ramp every axis to zero and hold. */
  trip: `${TOPIC_ROOT}/cmd/trip`,
  /** ReleaseCommand from the server: end a software-trip hold (after an interlock reset). */
  release: `${TOPIC_ROOT}/cmd/release`,
} as const;

/** Topics only the controller may publish. */
export const CONTROLLER_TOPICS = [TOPICS.fast, TOPICS.slow, TOPICS.status] as const;
/** Topics only the server may publish. */
export const SERVER_TOPICS = [TOPICS.setpoints, TOPICS.trip, TOPICS.release] as const;

/** MQTT user names of the two kinds of client the broker admits. */
export const MQTT_USERS = { controller: 'controller', server: 'server' } as const;
