import { ConfigError, type ServerConfig } from '../config.js';

/** The simulator's default control port (simulator/environment.ts). */
const DEFAULT_SIM_CONTROL_PORT = 4281;

/** `--demo` runs the simulator against the embedded broker: refuse what contradicts that. */
export function demoConflicts(config: ServerConfig, demo: boolean): void {
  if (demo && config.mqtt.mode === 'external') {
    throw new ConfigError(['--demo runs the simulator against the embedded broker; unset MQTT_URL, or run the simulator yourself (npm run simulator)']);
  }
}

/** The control port the demo simulator will take (its own variable, SIM_CONTROL_PORT). */
export function simulatorControlPort(env: NodeJS.ProcessEnv): number {
  const text = env.SIM_CONTROL_PORT?.trim();
  if (text === undefined || text === '') return DEFAULT_SIM_CONTROL_PORT;
  const port = Number(text);
  if (!/^\d+$/.test(text) || port > 65535) {
    throw new ConfigError([`SIM_CONTROL_PORT=${JSON.stringify(text)} must be a port number 0…65535 (0 = any free port)`]);
  }
  return port;
}
