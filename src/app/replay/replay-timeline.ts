import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { formatLocalTime } from '../readout/format-quantity';
import { seekTargetForKey } from './playback-clock';
import { MARK_LOOK, type TimelineMark } from './timeline-marks';

/**
 * The replay's timeline: a track over the loaded window with the replay clock's position, the
 * recorded events as marks (each kind its own shape, named in the legend) and time ticks.
 * Clicking the track or a mark seeks there. Keyboard: the track is a slider (arrows 1 % of the
 * window, Page Up/Down 10 %, Home/End), space plays or pauses; each mark is a button.
 */
@Component({
  selector: 'tw-replay-timeline',
  imports: [MatIconModule],
  templateUrl: './replay-timeline.html',
  styleUrl: './replay-timeline.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReplayTimeline {
  readonly fromMs = input.required<number>();
  readonly toMs = input.required<number>();
  /** The replay clock, Unix epoch ms. */
  readonly positionMs = input.required<number>();
  readonly marks = input.required<readonly TimelineMark[]>();
  readonly seek = output<number>();
  readonly togglePlay = output<void>();

  protected readonly positionPercent = computed(() => this.percentOf(this.positionMs()));
  protected readonly positionText = computed(() => formatLocalTime(this.positionMs()));
  protected readonly ticks = computed(() =>
    [0, 0.25, 0.5, 0.75, 1].map((share) => {
      const t = this.fromMs() + share * (this.toMs() - this.fromMs());
      return { percent: share * 100, text: formatLocalTime(t) };
    }),
  );
  /** The legend: every kind that has a mark in this window. */
  protected readonly legend = computed(() => {
    const kinds = new Set(this.marks().map((m) => m.kind));
    return Object.entries(MARK_LOOK)
      .filter(([kind]) => kinds.has(kind as TimelineMark['kind']))
      .map(([kind, look]) => ({ kind, ...look }));
  });

  protected seekToPointer(event: MouseEvent): void {
    const track = event.currentTarget as HTMLElement;
    const box = track.getBoundingClientRect();
    if (box.width <= 0) return;
    const share = Math.min(1, Math.max(0, (event.clientX - box.left) / box.width));
    this.seek.emit(this.fromMs() + share * (this.toMs() - this.fromMs()));
  }

  protected onKey(event: KeyboardEvent): void {
    if (event.key === ' ') {
      event.preventDefault();
      this.togglePlay.emit();
      return;
    }
    const target = seekTargetForKey(event.key, this.positionMs(), this.fromMs(), this.toMs());
    if (target !== null) {
      event.preventDefault();
      this.seek.emit(target);
    }
  }

  private percentOf(timeMs: number): number {
    const span = this.toMs() - this.fromMs();
    return span > 0 ? Math.min(100, Math.max(0, ((timeMs - this.fromMs()) / span) * 100)) : 0;
  }
}
