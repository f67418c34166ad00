import type { SetpointCommand } from '../shared/telemetry/messages.js';
import { demoSetpoints } from './demo-program.js';
import type { PerAxis } from './plant.js';

export interface SetpointSourceOptions {
  /** Run the demo program when the server has been silent for `demoIdleMs`. */
  demo: boolean;
  demoIdleMs: number;
  /** Start of the simulation (the demo program's time origin), UTC epoch ms. */
  startMs: number;
}

const ZERO: PerAxis = { x: 0, y: 0, z: 0 };

/**
 * Decides which setpoints are in force: the server's last command ('remote' mode), or the demo
 * program when demo mode is on and no command has arrived for `demoIdleMs` (and at start).
 * A software trip forces zero until released. After a release the controller holds zero until
 * the server sends a new setpoint (or the demo program takes over once the server is idle), so a
 * released hold never jumps back to a setpoint chosen before the trip.
 */
export class SetpointSource {
  private remote: PerAxis = ZERO;
  private lastCommandMs: number | null = null;
  private hold = false;

  constructor(private readonly opts: SetpointSourceOptions) {}

  get softwareHold(): boolean {
    return this.hold;
  }

  mode(nowMs: number): 'demo' | 'remote' {
    const idle = this.lastCommandMs === null || nowMs - this.lastCommandMs >= this.opts.demoIdleMs;
    return this.opts.demo && idle ? 'demo' : 'remote';
  }

  /**
   * Takes a validated setpoint command received at `nowMs` (UTC epoch ms). While a software
   * hold is in force the setpoints are not taken (returns false), but the server counts as
   * active so the demo program stays off.
   */
  command(cmd: SetpointCommand, nowMs: number): boolean {
    this.lastCommandMs = nowMs;
    if (this.hold) return false;
    this.remote = { ...cmd.setpointA };
    return true;
  }

  /** Software trip: ramp to zero and hold until `release()`. */
  trip(): void {
    this.hold = true;
    this.remote = ZERO;
  }

  release(): void {
    this.hold = false;
  }

  /** Setpoints (A) in force at `nowMs` (UTC epoch ms). */
  setpointAt(nowMs: number): PerAxis {
    if (this.hold) return ZERO;
    if (this.mode(nowMs) === 'demo') return demoSetpoints((nowMs - this.opts.startMs) / 1000);
    return this.remote;
  }
}
