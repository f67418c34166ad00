import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { formatLocalTime } from '../readout/format-quantity';
import { MARK_LOOK, type TimelineMark } from './timeline-marks';

/** Share of the window one arrow key press moves, and one Page Up/Down press. */
const STEP_SHARE = 0.01;
const PAGE_SHARE = 0.1;

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
    const span = this.toMs() - this.fromMs();
    const at = this.positionMs();
    const target: Record<string, number> = {
      ArrowLeft: at - STEP_SHARE * span,
      ArrowDown: at - STEP_SHARE * span,
      ArrowRight: at + STEP_SHARE * span,
      ArrowUp: at + STEP_SHARE * span,
      PageDown: at - PAGE_SHARE * span,
      PageUp: at + PAGE_SHARE * span,
      Home: this.fromMs(),
      End: this.toMs(),
    };
    if (event.key === ' ') {
      event.preventDefault();
      this.togglePlay.emit();
    } else if (event.key in target) {
      event.preventDefault();
      this.seek.emit(Math.min(this.toMs(), Math.max(this.fromMs(), target[event.key])));
    }
  }

  private percentOf(timeMs: number): number {
    const span = this.toMs() - this.fromMs();
    return span > 0 ? Math.min(100, Math.max(0, ((timeMs - this.fromMs()) / span) * 100)) : 0;
  }
}
