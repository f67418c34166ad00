/**
 * MQTT protocol versions Tiltwatch's clients speak: 3.1.1 (protocol level 4; the only one the
 * embedded aedes broker accepts) and 5 (level 5, for external brokers such as mosquitto).
 * Chosen with `MQTT_PROTOCOL_VERSION` for the server and the simulator alike.
 */
export const MQTT_PROTOCOL_VERSIONS = { '3.1.1': 4, '5': 5 } as const;

export type MqttProtocolName = keyof typeof MQTT_PROTOCOL_VERSIONS;
export type MqttProtocolLevel = (typeof MQTT_PROTOCOL_VERSIONS)[MqttProtocolName];

/** The protocol level for a variable's value (empty or unset: 3.1.1); null when not a known version. */
export function mqttProtocolLevel(value: string | undefined): MqttProtocolLevel | null {
  const text = value?.trim() ?? '';
  if (text === '') return 4;
  return text in MQTT_PROTOCOL_VERSIONS ? MQTT_PROTOCOL_VERSIONS[text as MqttProtocolName] : null;
}

/**
 * CONNACK codes that mean "wrong user name or password" or "not authorised": 4 and 5 in
 * MQTT 3.1.1, 0x86 and 0x87 in MQTT 5. Retrying with the same credentials cannot help.
 */
export function isCredentialsRefusal(code: number | undefined): boolean {
  return code === 4 || code === 5 || code === 0x86 || code === 0x87;
}
