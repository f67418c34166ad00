/**
 * Runs the software interlock and the alarms on the live state, on every message the pipeline
 * applied (with the state it produced, passed on) and on a timer (so silence is noticed without
 * frames). Each evaluation, in order: channel values → interlock, whose trip publishes the
 * TripCommand at once (QoS 1, before any storage or mail) → alarm book → storage, mail and
 * fan-out. Nothing here awaits; a trip's record is written at once in its own transaction and
 * the on-call notice follows that write.
 *
 * Supervisory only: the apparatus's hardware interlocks stay authoritative.
 */
import type { Logger } from 'pino';
import type { AlarmsMessage } from '../../shared/alarms/alarm-api.js';
import type { Vec3 } from '../../shared/field/field-vector.js';
import type { LiveState, PerAxis } from '../../shared/live/live-state.js';
import { AXES, type FastFrame, type ReleaseCommand, type TripCommand } from '../../shared/telemetry/messages.js';
import { TOPICS } from '../../shared/telemetry/topics.js';
import { activeAlarms } from '../alarms/alarm-body.js';
import type { AlarmBook } from '../alarms/alarm-book.js';
import { channelValues, type ChannelExtras } from '../alarms/channel-values.js';
import type { SupervisionLog } from '../alarms/supervision-log.js';
import { writeFailureText } from '../db/write-failure.js';
import type { LiveStore } from '../live/live-store.js';
import type { OnCallNotifier } from '../notify/on-call-notifier.js';
import type { AppliedMessage } from '../pipeline/telemetry-pipeline.js';
import type { Interlock, ResetResult, TripRecord } from './interlock.js';
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

/** A reset that was decided but could not be stored: the latch stayed closed. */
export type ResetOutcome = ResetResult | { ok: false; code: 'not-recorded'; message: string };

export interface SupervisorDeps {
  /** The newest live state, read by the timer evaluation. */
  live: Pick<LiveStore, 'snapshot' | 'lastFrameAtMs'>;
  interlock: Interlock;
  book: AlarmBook;
  records: Pick<SupervisionLog, 'recordTrip' | 'recordReset' | 'addAlarmEvents'>;
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
/** Present values of active alarms and trip conditions are sent at most this often, ms. */
const VALUE_REFRESH_MS = 250;

export class Supervisor {
  private link: CommandLink | null = null;
  private timer: NodeJS.Timeout | null = null;
  private stopped = false;
  /** Largest |I| per axis in the newest fast frame, A: the interlock must see peaks, not means. */
  private peakCurrent: PerAxis<number> | null = null;
  private lastTripSentMs = -Infinity;
  private announcedKey = '';
  private announcedValues = '';
  private announcedAt = -Infinity;
  private revision = 0;
  private lastTickAt = 0;
  /** Time this process was paused since the newest fast frame, ms (see `tick`). */
  private pausedMs = 0;
  /** True when the newest word from the controller is a status saying offline (its last will). */
  private reportedOffline = false;
  /** Set once the first controller status was compared with the latch on record. */
  private reconciled = false;
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
    if (this.stopped) return;
    const tickMs = this.deps.tickMs ?? 20;
    this.lastTickAt = performance.now();
    this.timer ??= setInterval(() => this.tick(tickMs), tickMs);
  }

  /** Takes a message the pipeline applied, with the live state it produced. */
  observe(applied: AppliedMessage): void {
    if (this.stopped) return;
    const { message } = applied;
    const now = this.now();
    if (message.kind === 'fast') {
      this.deps.interlock.observeFrame(message.frame.seq, now);
      this.peakCurrent = peakAbs(message.frame);
      this.pausedMs = 0;
    }
    // Telemetry proves the controller is online even when it overtakes the status that says so
    // (QoS 0 frames can pass a QoS 1 status on reconnection); only the last will comes after the last frame.
    this.reportedOffline = message.kind === 'status' ? !message.status.online : false;
    if (message.kind === 'status' && message.status.online && !this.reconciled) {
      this.reconciled = true;
      if (message.status.softwareHold) this.foundHolding(now);
    }
    this.evaluate(now, applied.live, applied.lastFrameAtMs);
  }

  /**
   * One evaluation at server time `nowMs` (Unix epoch ms) of `live`, whose newest frame arrived
   * at `lastFrameAtMs` (default: the newest state). Never throws (errors are logged).
   */
  evaluate(nowMs: number = this.now(), live: LiveState = this.deps.live.snapshot(), lastFrameAtMs: number | null = this.deps.live.lastFrameAtMs()): void {
    if (this.stopped) return;
    const { interlock, book, records, notifier, log } = this.deps;
    try {
      // Time this process could not listen does not count against the controller (see `tick`).
      const heardAtMs = lastFrameAtMs === null ? null : lastFrameAtMs + this.pausedMs;
      const steering = this.deps.steering?.alarmContext(nowMs) ?? { targetDirection: null, rampProgrammed: false };
      const values = channelValues(live, nowMs, { ...this.deps.extras?.(), targetDirection: steering.targetDirection, lastFrameAtMs: heardAtMs });
      if (this.peakCurrent && live.currents) {
        for (const axis of AXES) values[`current.${axis}`] = this.peakCurrent[axis];
      }
      const inputs = interlockInputs(live, values, heardAtMs);
      inputs.controllerOnline = !this.reportedOffline;
      const trip = interlock.evaluate(inputs, nowMs);
      if (trip) this.sendTrip(trip.reason, nowMs);
      const events = book.evaluate(values, nowMs, { rampProgrammed: steering.rampProgrammed });
      if (trip) {
        log.warn({ firstOut: trip.firstOut }, 'software interlock tripped');
        this.record(trip);
      } else if (interlock.state().trip && !this.reportedOffline && live.controller.online && !live.controller.softwareHold) {
        this.republishTrip(nowMs);
      }
      if (events.length > 0) {
        records.addAlarmEvents(events);
        notifier.alarmEvents(events);
      }
      this.announce(nowMs);
    } catch (error) {
      log.error({ err: error }, 'alarm and interlock evaluation failed');
    }
  }

  /**
   * Resets the latched interlock (roles are the route's business): decides, stores the reset
   * with its audit entry, and only then opens the latch and publishes the ReleaseCommand. When
   * the write fails the latch stays closed and the answer says so.
   */
  async resetInterlock(actor: string, reason: unknown): Promise<ResetOutcome> {
    const now = this.now();
    const prepared = this.deps.interlock.prepareReset(actor, reason, now);
    if (!prepared.ok) return prepared;
    try {
      await this.deps.records.recordReset(prepared.reset);
    } catch (error) {
      prepared.cancel();
      this.deps.log.error({ err: error, actor }, 'interlock reset not recorded; the interlock stays tripped');
      return { ok: false, code: 'not-recorded', message: `the reset could not be recorded (${writeFailureText(error)}); the interlock stays tripped. Try again.` };
    }
    prepared.commit();
    const release: ReleaseCommand = { tMs: now, reason: `Interlock reset by ${actor}: ${prepared.reset.reason}`.slice(0, MAX_COMMAND_REASON_CHARS) };
    this.link?.publish(TOPICS.release, JSON.stringify(release), 1);
    this.deps.log.info({ actor, reason: prepared.reset.reason }, 'software interlock reset');
    this.announce();
    return { ok: true, reset: prepared.reset };
  }

  /** The interlock state and the active alarms, as the WebSocket `alarms` message carries them. */
  alarmsMessage(): AlarmsMessage {
    return {
      type: 'alarms',
      revision: this.revision,
      interlock: interlockBody(this.deps.interlock.state(), this.deps.live.snapshot().controller),
      active: activeAlarms(this.deps.book),
    };
  }

  /**
   * Sends the `alarms` message at once when the interlock state or the active alarm list
   * changed — the interlock and the alarm book count their changes, so that check costs the
   * same however many alarms there are — with a new `revision`; and otherwise at most every
   * 250 ms while the present values of active alarms move, so the values shown stay live.
   */
  announce(nowMs: number = this.now()): void {
    const { controller } = this.deps.live.snapshot();
    const key = `${this.deps.interlock.revision()}/${this.deps.book.revision()}/${controller.hardwareTripped}/${controller.hardwareTripCause}`;
    if (key !== this.announcedKey) {
      this.announcedKey = key;
      this.revision++;
      this.publishAlarms(this.alarmsMessage(), nowMs);
      return;
    }
    if (nowMs - this.announcedAt < VALUE_REFRESH_MS) return;
    const message = this.alarmsMessage();
    if (presentValues(message) !== this.announcedValues) this.publishAlarms(message, nowMs);
  }

  private publishAlarms(message: AlarmsMessage, nowMs: number): void {
    this.announcedValues = presentValues(message);
    this.announcedAt = nowMs;
    this.deps.sink.publishAlarms(message);
  }

  /**
   * Ends supervision: no more evaluations, so a controller that goes away afterwards (a clean
   * stop of the demo) neither trips the interlock nor mails on-call. Call it before anything
   * that supervision watches is stopped.
   */
  close(): void {
    this.stopped = true;
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
  }

  /**
   * The first status after start says the controller holds, but no trip is on record: the
   * latch is closed with first-out "unknown, found at start" and stored like any trip.
   */
  private foundHolding(nowMs: number): void {
    const trip = this.deps.interlock.foundAtStart(nowMs);
    if (!trip) return;
    this.deps.log.warn('controller found holding at start with no trip on record: interlock shown as tripped (first-out unknown)');
    this.record(trip);
  }

  /** Stores a trip in its own transaction; the on-call notice follows the write. */
  private record(trip: TripRecord): void {
    const { records, notifier, log } = this.deps;
    records.recordTrip(trip).then(
      () => notifier.trip(trip),
      (error) => {
        log.error({ err: error, firstOut: trip.firstOut }, 'storing the trip failed; retrying. The interlock stays tripped');
        notifier.trip(trip);
      },
    );
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

/** The present values of the active alarms, to tell whether a refresh has news. */
function presentValues(message: AlarmsMessage): string {
  return JSON.stringify(message.active.map((a) => a.value));
}
