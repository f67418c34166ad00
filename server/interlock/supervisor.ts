/**
 * Runs the software interlock and the alarms on the live state, on every admitted telemetry
 * message and on a timer (so silence is noticed without frames). Each evaluation, in order:
 * channel values → interlock, whose trip publishes the TripCommand at once (QoS 1, before any
 * storage or mail) → alarm book → queued storage, mail and fan-out. Nothing here awaits.
 *
 * Supervisory only: the apparatus's hardware interlocks stay authoritative.
 */
import type { Logger } from 'pino';
import type { AlarmsMessage } from '../../shared/alarms/alarm-api.js';
import type { Vec3 } from '../../shared/field/field-vector.js';
import type { PerAxis } from '../../shared/live/live-state.js';
import { AXES, type FastFrame, type ReleaseCommand, type TripCommand } from '../../shared/telemetry/messages.js';
import { TOPICS } from '../../shared/telemetry/topics.js';
import { activeAlarms } from '../alarms/alarm-body.js';
import type { AlarmBook } from '../alarms/alarm-book.js';
import { channelValues, type ChannelExtras } from '../alarms/channel-values.js';
import type { SupervisionLog } from '../alarms/supervision-log.js';
import type { AdmittedMessage } from '../ingest/frame-gate.js';
import type { LiveStore } from '../live/live-store.js';
import type { OnCallNotifier } from '../notify/on-call-notifier.js';
import type { Interlock, ResetResult } from './interlock.js';
import { interlockBody } from './interlock-body.js';
import { interlockInputs } from './trip-conditions.js';

/** How commands reach the controller (the server's MQTT client). */
export interface CommandLink {
  publish(topic: string, payload: string, qos: 0 | 1): void;
}

/** What steering tells the alarms at a moment: the target direction (trap frame) and whether a ramp is programmed. */
export interface SteeringContext {
  alarmContext(nowMs: number): { targetDirection: Vec3 | null; rampProgrammed: boolean };
}

/** Where changes of the interlock state and the active alarm list go (the WebSocket fan-out). */
export interface AlarmsSink {
  publishAlarms(message: AlarmsMessage): void;
}

export interface SupervisorDeps {
  live: LiveStore;
  interlock: Interlock;
  book: AlarmBook;
  records: Pick<SupervisionLog, 'addTrip' | 'addAlarmEvents'>;
  notifier: Pick<OnCallNotifier, 'trip' | 'alarmEvents'>;
  sink: AlarmsSink;
  log: Logger;
  /** Channel inputs from outside the live state (the database outage), read at each evaluation. */
  extras?: () => ChannelExtras;
  /** Server clock, Unix epoch ms (default `Date.now`). */
  now?: () => number;
  /** The target in force and whether a ramp is programmed (steering); none when absent. */
  steering?: SteeringContext;
  /** Period of the timer evaluation, ms (default 20: silence is seen within the stale limit + 20 ms). */
  tickMs?: number;
}

/** While tripped, a controller seen online but not holding gets the TripCommand again, at most this often (ms). */
const REPUBLISH_AFTER_MS = 1000;
/** Timer lateness up to this (ms) is ordinary jitter; beyond it this process itself was paused. */
const JITTER_MS = 10;
/** Most of this process's own pause time credited against staleness, in stale limits. */
const MAX_PAUSE_CREDIT = 3;
const MAX_COMMAND_REASON_CHARS = 500;

export class Supervisor {
  private link: CommandLink | null = null;
  private timer: NodeJS.Timeout | null = null;
  /** Largest |I| per axis in the newest fast frame, A: the interlock must see peaks, not means. */
  private peakCurrent: PerAxis<number> | null = null;
  private lastTripSentMs = -Infinity;
  private announcedKey = '';
  private lastTickAt = 0;
  /** Time this process was paused since the newest fast frame, ms (see `tick`). */
  private pausedMs = 0;
  /** True when the newest word from the controller is a status saying offline (its last will). */
  private reportedOffline = false;
  private readonly now: () => number;

  constructor(private readonly deps: SupervisorDeps) {
    this.now = deps.now ?? Date.now;
  }

  /** Connects the command link; a trip already latched (e.g. restored) is sent at once. */
  attach(link: CommandLink): void {
    this.link = link;
    const trip = this.deps.interlock.state().trip;
    if (trip) this.sendTrip(trip.reason, this.now());
  }

  /** Starts the timer evaluation. */
  start(): void {
    const tickMs = this.deps.tickMs ?? 20;
    this.lastTickAt = performance.now();
    this.timer ??= setInterval(() => this.tick(tickMs), tickMs);
  }


  /** Takes an admitted message after the pipeline has applied it to the live state. */
  observe(message: AdmittedMessage): void {
    const now = this.now();
    if (message.kind === 'fast') {
      this.deps.interlock.observeFrame(message.frame.seq, now);
      this.peakCurrent = peakAbs(message.frame);
      this.pausedMs = 0;
    }
    // Telemetry proves the controller is online even when it overtakes the status that says so
    // (QoS 0 frames can pass a QoS 1 status on reconnection); only the last will comes after the last frame.
    this.reportedOffline = message.kind === 'status' ? !message.status.online : false;
    this.evaluate(now);
  }

  /** One evaluation at server time `nowMs` (Unix epoch ms). Never throws (errors are logged). */
  evaluate(nowMs: number = this.now()): void {
    const { live, interlock, book, records, notifier, log } = this.deps;
    try {
      const state = live.snapshot();
      const steering = this.deps.steering?.alarmContext(nowMs) ?? { targetDirection: null, rampProgrammed: false };
      const values = channelValues(state, nowMs, { ...this.deps.extras?.(), targetDirection: steering.targetDirection });
      if (this.peakCurrent && state.currents) {
        for (const axis of AXES) values[`current.${axis}`] = this.peakCurrent[axis];
      }
      const inputs = interlockInputs(state, values);
      inputs.controllerOnline = !this.reportedOffline;
      if (inputs.lastFrameAtMs !== null) inputs.lastFrameAtMs += this.pausedMs;
      if (values.stale !== undefined) values.stale = Math.max(0, values.stale - this.pausedMs);
      const trip = interlock.evaluate(inputs, nowMs);
      if (trip) this.sendTrip(trip.reason, nowMs);
      const events = book.evaluate(values, nowMs, { rampProgrammed: steering.rampProgrammed });
      if (trip) {
        log.warn({ firstOut: trip.firstOut }, 'software interlock tripped');
        records.addTrip(trip);
        notifier.trip(trip);
      } else if (interlock.state().trip && !this.reportedOffline && state.controller.online && !state.controller.softwareHold) {
        this.republishTrip(nowMs);
      }
      if (events.length > 0) {
        records.addAlarmEvents(events);
        notifier.alarmEvents(events);
      }
      this.announce();
    } catch (error) {
      log.error({ err: error }, 'alarm and interlock evaluation failed');
    }
  }

  /**
   * Resets the latched interlock (roles are the route's business). On success publishes the
   * ReleaseCommand; the caller stores the reset.
   */
  resetInterlock(actor: string, reason: unknown): ResetResult {
    const now = this.now();
    const result = this.deps.interlock.reset(actor, reason, now);
    if (result.ok) {
      const release: ReleaseCommand = { tMs: now, reason: `Interlock reset by ${actor}: ${result.reset.reason}`.slice(0, MAX_COMMAND_REASON_CHARS) };
      this.link?.publish(TOPICS.release, JSON.stringify(release), 1);
      this.deps.log.info({ actor, reason: result.reset.reason }, 'software interlock reset');
      this.announce();
    }
    return result;
  }

  /** The interlock state and the active alarms, as the WebSocket `alarms` message carries them. */
  alarmsMessage(): AlarmsMessage {
    return {
      type: 'alarms',
      interlock: interlockBody(this.deps.interlock.state(), this.deps.live.snapshot().controller),
      active: activeAlarms(this.deps.book),
    };
  }

  /**
   * Sends the `alarms` message when the interlock state or the active alarm list changed. The
   * check costs the same however many alarms and clients there are: the interlock and the
   * alarm book count their changes, so the message is built only when there is news.
   */
  announce(): void {
    const { controller } = this.deps.live.snapshot();
    const key = `${this.deps.interlock.revision()}/${this.deps.book.revision()}/${controller.hardwareTripped}/${controller.hardwareTripCause}`;
    if (key === this.announcedKey) return;
    this.announcedKey = key;
    this.deps.sink.publishAlarms(this.alarmsMessage());
  }

  /** Stops the timer. */
  close(): void {
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
  }

  /**
   * A late tick means this process was not running (garbage collection, a long call into the
   * embedded database): frames sent meanwhile may still wait unread in a socket, so that time
   * must not count against the controller. Staleness is therefore measured in time this
   * process was able to listen; the credit is capped at three times the stale limit, so a
   * silent controller is still caught within four times the limit however often the server
   * pauses, and a server paused longer than that trips (it could not have acted meanwhile).
   */
  private tick(tickMs: number): void {
    const t = performance.now();
    const late = t - this.lastTickAt - tickMs;
    this.lastTickAt = t;
    if (late > JITTER_MS) this.pausedMs = Math.min(this.pausedMs + late, MAX_PAUSE_CREDIT * this.deps.interlock.config.staleMs);
    this.evaluate();
  }

  private sendTrip(reason: string, nowMs: number): void {
    const command: TripCommand = { tMs: nowMs, reason };
    this.link?.publish(TOPICS.trip, JSON.stringify(command), 1);
    this.lastTripSentMs = nowMs;
  }

  /** The controller came back (or never took the command): tell it again that it must hold. */
  private republishTrip(nowMs: number): void {
    if (nowMs - this.lastTripSentMs < REPUBLISH_AFTER_MS) return;
    const trip = this.deps.interlock.state().trip;
    if (!trip) return;
    this.deps.log.warn({ firstOut: trip.firstOut }, 'controller online but not holding while tripped: trip command sent again');
    this.sendTrip(trip.reason, nowMs);
  }
}

function peakAbs(frame: FastFrame): PerAxis<number> {
  const peak = (samples: readonly number[]) => {
    let max = 0;
    for (const v of samples) max = Math.max(max, Math.abs(v));
    return max;
  };
  return { x: peak(frame.currentA.x), y: peak(frame.currentA.y), z: peak(frame.currentA.z) };
}
