import { randomBytes } from 'node:crypto';
import mqtt from 'mqtt';
import * as z from 'zod/mini';
import {
  ReleaseCommand,
  SetpointCommand,
  TripCommand,
  type ControllerStatus,
} from '../shared/telemetry/messages.js';
import type { MqttProtocolLevel } from '../shared/telemetry/mqtt-protocol.js';
import { TOPICS } from '../shared/telemetry/topics.js';
import { startControlEndpoint } from './control-endpoint.js';
import { DEMO_PARAMETERS } from '../shared/apparatus/coil-data.js';
import { Simulation } from './simulation.js';
import { TelemetryPublisher } from './telemetry-publisher.js';

export interface SimulatorOptions {
  mqttUrl: string;
  username: string;
  password: string;
  /** MQTT protocol level: 4 (3.1.1, the default; all the embedded broker speaks) or 5. */
  protocolVersion?: MqttProtocolLevel;
  /** Port of the local control endpoint; 0 picks a free one. */
  controlPort: number;
  /** Interface of the control endpoint; default 127.0.0.1 (this machine only). */
  controlHost?: string;
  /** Run the demo program at start and whenever the server is idle; default true. */
  demo?: boolean;
  /** Server silence after which the demo program takes over, ms; default 30 000. */
  demoIdleMs?: number;
  /** Seed of the measurement noise; default 1. */
  seed?: number;
  /** Factor by which the thermal dynamics run faster than real time; default 1. */
  thermalSpeedup?: number;
  /** Fast-frame period, ms; default 20. */
  frameMs?: number;
  /** Sample rate of the fast channels, Hz; default 1000. */
  sampleRateHz?: number;
  log?: (msg: string, fields?: object) => void;
}

export interface RunningSimulator {
  controlPort: number;
  controlUrl: string;
  /** Publishes the offline status, disconnects and stops the timer and the control endpoint. */
  close(): Promise<void>;
}

/** After a stall longer than this (a suspended process) the model jumps instead of replaying. */
const MAX_CATCH_UP_MS = 1000;

/**
 * Starts the simulated field-orientation controller: the model advanced in real time, MQTT
 * telemetry and status (with a last will), the command subscriptions and the local control
 * endpoint. Resolves once the control endpoint listens; the MQTT connection is made in the
 * background and retried, as a controller would.
 */
export async function startSimulator(opts: SimulatorOptions): Promise<RunningSimulator> {
  const log = opts.log ?? (() => {});
  const frameMs = opts.frameMs ?? 20;
  const sim = new Simulation({
    params: DEMO_PARAMETERS,
    startMs: Date.now(),
    sampleRateHz: opts.sampleRateHz ?? 1000,
    frameMs,
    seed: opts.seed ?? 1,
    thermalSpeedup: opts.thermalSpeedup ?? 1,
    demo: opts.demo ?? true,
    demoIdleMs: opts.demoIdleMs ?? 30_000,
  });
  const commands = { accepted: 0, invalid: 0, ignoredWhileHeld: 0 };

  const statusAt = (online: boolean): ControllerStatus => sim.status(online, Math.max(Date.now(), sim.nowMs));
  const will = () => ({ topic: TOPICS.status, payload: Buffer.from(JSON.stringify(statusAt(false))), qos: 1 as const, retain: true });
  const client = mqtt.connect(opts.mqttUrl, {
    protocolVersion: opts.protocolVersion ?? 4, // the embedded aedes broker speaks MQTT 3.1.1 only
    clientId: `tiltwatch-controller-${randomBytes(4).toString('hex')}`,
    username: opts.username,
    password: opts.password,
    clean: true,
    reconnectPeriod: 1000,
    connectTimeout: 5000,
    will: will(),
  });
  const publisher = new TelemetryPublisher(client, sim.plant.faults);

  // Set once close() begins: the offline status is the last word, so no command or status after it
  // (a command answered while closing would publish `online` again after the offline status).
  let stopping = false;
  let lastStatusKey = '';
  const publishStatusIfChanged = (force = false): void => {
    if (stopping) return;
    const status = statusAt(true);
    const key = JSON.stringify({ ...status, tMs: 0 });
    if (!force && key === lastStatusKey) return;
    lastStatusKey = key;
    // A reconnect sends the will given in the options: keep it describing the present state.
    client.options.will = will();
    publisher.publishStatus(status).catch((error: Error) => log('status publish failed', { error: error.message }));
  };

  client.on('connect', () => {
    // Frames are small and time-critical: Nagle's algorithm would hold each one back for tens of ms.
    (client.stream as { setNoDelay?: (noDelay: boolean) => void }).setNoDelay?.(true);
    log('controller connected to MQTT', { url: opts.mqttUrl });
    client.subscribe([TOPICS.setpoints, TOPICS.trip, TOPICS.release], { qos: 1 }, (error) => {
      if (error) log('command subscription failed', { error: error.message });
    });
    publishStatusIfChanged(true);
  });
  client.on('error', (error) => log('MQTT error', { error: error.message }));
  client.on('message', (topic, payload) => {
    if (stopping) return;
    const outcome = handleCommand(sim, topic, payload);
    if (outcome === 'invalid') {
      commands.invalid++;
      log('invalid command ignored', { topic, bytes: payload.length });
    } else if (outcome === 'held') {
      commands.ignoredWhileHeld++;
    } else {
      commands.accepted++;
      if (topic !== TOPICS.setpoints) log('command applied', { topic, softwareHold: sim.setpoints.softwareHold });
    }
    publishStatusIfChanged();
  });

  const tick = (): void => {
    const now = Date.now();
    const behind = Math.floor((now - sim.nowMs) / frameMs);
    if (behind * frameMs > MAX_CATCH_UP_MS) {
      const skip = behind - Math.ceil(MAX_CATCH_UP_MS / frameMs);
      log('controller stalled; skipping frames', { frames: skip });
      sim.skipFrames(skip);
    }
    while (sim.nowMs + frameMs <= Date.now()) publisher.publishFrames(sim.nextFrame());
    publishStatusIfChanged();
  };
  const timer = setInterval(tick, Math.max(1, Math.floor(frameMs / 2)));

  let control;
  try {
    control = await startControlEndpoint(
      {
        state: () => ({
          status: statusAt(client.connected),
          mqttConnected: client.connected,
          setpointA: sim.setpoints.setpointAt(sim.nowMs),
          faults: sim.plant.faults.list(),
          commands,
          published: publisher.published,
          truth: sim.plant.truth(),
        }),
        injectFault: (fault) => {
          sim.plant.faults.add(fault);
          log('fault injected', fault);
        },
        clearFaults: () => {
          sim.plant.faults.clear();
          log('faults cleared');
        },
        resetHardwareTrip: () => {
          const outcome = sim.plant.resetHardwareTrip();
          log(outcome.reset ? 'hardware trip reset locally' : 'hardware trip reset refused', outcome);
          publishStatusIfChanged();
          return outcome;
        },
      },
      opts.controlPort,
      opts.controlHost,
    );
  } catch (error) {
    clearInterval(timer);
    await client.endAsync(true);
    throw error;
  }

  let closing: Promise<void> | undefined;
  return {
    controlPort: control.port,
    controlUrl: control.url,
    close() {
      closing ??= (async () => {
        stopping = true;
        clearInterval(timer);
        if (client.connected) {
          await publisher.publishStatus(statusAt(false)).catch((error: Error) => log('offline status failed', { error: error.message }));
          await client.endAsync();
        } else {
          await client.endAsync(true);
        }
        await control.close();
      })();
      return closing;
    },
  };
}

/** Applies one MQTT command; 'invalid' when the payload is not JSON or fails its schema. */
function handleCommand(sim: Simulation, topic: string, payload: Buffer): 'accepted' | 'held' | 'invalid' {
  let json: unknown;
  try {
    json = JSON.parse(payload.toString('utf8'));
  } catch {
    return 'invalid';
  }
  const valid = <T extends z.ZodMiniType>(schema: T) => z.safeParse(schema, json).success;
  switch (topic) {
    case TOPICS.setpoints: {
      const parsed = z.safeParse(SetpointCommand, json);
      if (!parsed.success) return 'invalid';
      return sim.setpoints.command(parsed.data, sim.nowMs) ? 'accepted' : 'held';
    }
    case TOPICS.trip:
      if (!valid(TripCommand)) return 'invalid';
      sim.setpoints.trip();
      return 'accepted';
    case TOPICS.release:
      if (!valid(ReleaseCommand)) return 'invalid';
      sim.setpoints.release();
      return 'accepted';
    default:
      return 'invalid';
  }
}
