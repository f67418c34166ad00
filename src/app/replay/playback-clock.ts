/** Replay speeds offered, as multiples of real time. */
export const SPEEDS: readonly number[] = [0.5, 1, 2, 5, 10, 20];

/**
 * The replay's clock over a window [fromMs, toMs] of recorded time: play, pause, seek and
 * speed. Pure arithmetic on the wall-clock time the caller passes (ms, e.g.
 * `performance.now()`), so it can be driven by animation frames and tested without timers. It
 * stops by itself at the end of the window.
 */
export class PlaybackClock {
  private anchorMs: number;
  private anchorWallMs = 0;
  private running = false;
  private rate = 1;

  constructor(
    readonly fromMs: number,
    readonly toMs: number,
  ) {
    this.anchorMs = fromMs;
  }

  get playing(): boolean {
    return this.running;
  }

  get speed(): number {
    return this.rate;
  }

  /** Recorded time shown at wall-clock `wallMs`; a clock that ran to the end pauses there. */
  timeAt(wallMs: number): number {
    if (!this.running) return this.anchorMs;
    const t = this.anchorMs + (wallMs - this.anchorWallMs) * this.rate;
    if (t < this.toMs) return Math.max(this.fromMs, t);
    this.running = false;
    this.anchorMs = this.toMs;
    return this.toMs;
  }

  /** Starts playing; from the start again when the clock stands at the end. */
  play(wallMs: number): void {
    const t = this.timeAt(wallMs);
    this.anchorMs = t >= this.toMs ? this.fromMs : t;
    this.anchorWallMs = wallMs;
    this.running = true;
  }

  pause(wallMs: number): void {
    this.anchorMs = this.timeAt(wallMs);
    this.running = false;
  }

  toggle(wallMs: number): void {
    if (this.running) this.pause(wallMs);
    else this.play(wallMs);
  }

  /** Jumps to `timeMs` (clamped to the window), playing on if it was playing. */
  seek(timeMs: number, wallMs: number): void {
    this.anchorMs = Math.min(this.toMs, Math.max(this.fromMs, timeMs));
    this.anchorWallMs = wallMs;
  }

  /** Changes the speed without a jump in recorded time. */
  setSpeed(speed: number, wallMs: number): void {
    if (!(speed > 0)) throw new RangeError(`speed must be positive, got ${speed}`);
    this.anchorMs = this.timeAt(wallMs);
    this.anchorWallMs = wallMs;
    this.rate = speed;
  }
}
