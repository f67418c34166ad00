import { DestroyRef, Injectable, computed, inject, signal } from '@angular/core';
import { TimeMarker } from '../charts/chart-panel';
import { errorText } from '../api/error-text';
import { HistoryApi, type HistoryQuery } from './history-api';
import { PlaybackClock } from './playback-clock';
import { momentAt, toReplayData, type ReplayData } from './replay-data';
import { placeMarks } from './timeline-marks';

/** How often the panels' values follow the clock while playing, ms (the charts' marker follows every frame). */
const SUMMARY_INTERVAL_MS = 200;

/**
 * Plays a loaded history window: fetches it once, keeps it in typed arrays, and runs the
 * playback clock on animation frames outside change detection. The chart marker moves every
 * frame; signals (position, the values at it) change only a few times per second.
 */
@Injectable()
export class ReplayPlayer {
  private readonly api = inject(HistoryApi);
  private clock: PlaybackClock | null = null;
  private frameRequest = 0;
  private lastSummaryMs = 0;
  private loadRun = 0;

  readonly data = signal<ReplayData | null>(null);
  readonly loading = signal(false);
  readonly error = signal<string | null>(null);
  /** The replay clock, Unix epoch ms, updated a few times per second while playing. */
  readonly positionMs = signal(0);
  readonly playing = signal(false);
  readonly speed = signal(1);
  /** The charts' vertical line, moved every frame. */
  readonly marker = new TimeMarker();

  readonly marks = computed(() => {
    const data = this.data();
    return data ? placeMarks(data.events, data.fromMs, data.toMs) : [];
  });
  /** The values at the replay clock. */
  readonly moment = computed(() => {
    const data = this.data();
    return data ? momentAt(data, this.positionMs()) : null;
  });

  constructor() {
    inject(DestroyRef).onDestroy(() => {
      cancelAnimationFrame(this.frameRequest);
      this.loadRun++;
    });
  }

  /** Loads a window or a run, replacing the one shown; paused at its start. */
  async load(query: HistoryQuery): Promise<void> {
    const run = ++this.loadRun;
    this.loading.set(true);
    this.error.set(null);
    try {
      const response = await this.api.load(query);
      if (run !== this.loadRun) return;
      const data = toReplayData(response);
      this.pause();
      this.clock = new PlaybackClock(data.fromMs, data.toMs);
      this.clock.setSpeed(this.speed(), performance.now());
      this.data.set(data);
      this.publish(data.fromMs);
    } catch (e) {
      if (run === this.loadRun) this.error.set(errorText(e));
    } finally {
      if (run === this.loadRun) this.loading.set(false);
    }
  }

  play(): void {
    if (!this.clock) return;
    this.clock.play(performance.now());
    this.playing.set(true);
    cancelAnimationFrame(this.frameRequest);
    this.frameRequest = requestAnimationFrame(() => this.frame());
  }

  pause(): void {
    cancelAnimationFrame(this.frameRequest);
    if (!this.clock) return;
    this.clock.pause(performance.now());
    this.playing.set(false);
    this.publish(this.clock.timeAt(performance.now()));
  }

  toggle(): void {
    if (this.clock?.playing) this.pause();
    else this.play();
  }

  seek(timeMs: number): void {
    if (!this.clock) return;
    this.clock.seek(timeMs, performance.now());
    this.publish(this.clock.timeAt(performance.now()));
  }

  setSpeed(speed: number): void {
    this.speed.set(speed);
    this.clock?.setSpeed(speed, performance.now());
  }

  private frame(): void {
    const clock = this.clock;
    if (!clock) return;
    const now = performance.now();
    const t = clock.timeAt(now);
    this.marker.timeMs = t;
    if (!clock.playing) {
      this.playing.set(false);
      this.publish(t);
      return;
    }
    if (now - this.lastSummaryMs >= SUMMARY_INTERVAL_MS) this.publish(t);
    this.frameRequest = requestAnimationFrame(() => this.frame());
  }

  private publish(timeMs: number): void {
    this.lastSummaryMs = performance.now();
    this.marker.timeMs = timeMs;
    this.positionMs.set(timeMs);
  }
}
