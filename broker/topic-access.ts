import { CONTROLLER_TOPICS, SERVER_TOPICS } from '../shared/telemetry/topics.js';

/** The kind of client behind an authenticated MQTT connection. */
export type MqttRole = 'controller' | 'server';

/**
 * Topic access list. Every entry is an exact topic name: wildcard subscriptions are refused
 * for everyone, so nobody can widen what they receive by subscribing to a pattern.
 * Telemetry and status flow controller → server; commands flow server → controller.
 */
export const TOPIC_ACCESS: Readonly<Record<MqttRole, { publish: readonly string[]; subscribe: readonly string[] }>> = {
  controller: { publish: CONTROLLER_TOPICS, subscribe: SERVER_TOPICS },
  server: { publish: SERVER_TOPICS, subscribe: CONTROLLER_TOPICS },
};

/** Whether `role` may publish to `topic` (including a last will on that topic). */
export function mayPublish(role: MqttRole, topic: string): boolean {
  return TOPIC_ACCESS[role].publish.includes(topic);
}

/** Whether `role` may subscribe to the topic filter `filter`. */
export function maySubscribe(role: MqttRole, filter: string): boolean {
  return TOPIC_ACCESS[role].subscribe.includes(filter);
}
