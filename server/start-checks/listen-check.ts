import { createServer } from 'node:net';
import { listenProblem } from '../../shared/net/listen-problem.js';
import { ConfigError, type ServerConfig } from '../config.js';

/** A socket the product will listen on, with the variables that choose it. */
export interface ListenSlot {
  what: string;
  host: string;
  port: number;
  vars: { port: string; host?: string };
}

/** The sockets a start with `config` listens on (`simControlPort` when the demo simulator runs too). */
export function listenSlots(config: ServerConfig, simControlPort: number | null = null): ListenSlot[] {
  const slots: ListenSlot[] = [{ what: 'The web server', host: config.host, port: config.port, vars: { port: 'PORT', host: 'HOST' } }];
  if (config.mqtt.mode === 'embedded') {
    slots.push({ what: 'The embedded MQTT broker', host: config.mqtt.host, port: config.mqtt.port, vars: { port: 'MQTT_PORT', host: 'MQTT_HOST' } });
  }
  if (simControlPort !== null) {
    slots.push({ what: "The simulator's control endpoint", host: '127.0.0.1', port: simControlPort, vars: { port: 'SIM_CONTROL_PORT' } });
  }
  return slots;
}

/**
 * Opens and closes a listener on each slot: with `port: 0` this only proves the host is an
 * address of this machine (HOST, MQTT_HOST), otherwise also that the port is free. Throws a
 * `ConfigError` naming the variables to change.
 */
export async function checkListenSlots(slots: ListenSlot[], opts: { portsToo: boolean }): Promise<void> {
  const problems: string[] = [];
  for (const slot of slots) {
    const port = opts.portsToo ? slot.port : 0;
    const problem = await tryListen(slot.host, port);
    if (problem) problems.push(listenProblem(slot.what, slot.vars, slot.host, port === 0 ? slot.port : port, problem));
  }
  if (problems.length > 0) throw new ConfigError(problems);
}

function tryListen(host: string, port: number): Promise<NodeJS.ErrnoException | null> {
  return new Promise((resolve) => {
    const server = createServer();
    server.once('error', (error: NodeJS.ErrnoException) => resolve(error));
    server.listen({ port, host, exclusive: true }, () => server.close(() => resolve(null)));
  });
}
