import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { provideNativeDateAdapter } from '@angular/material/core';
import { MatDatepickerModule } from '@angular/material/datepicker';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { ActivatedRoute } from '@angular/router';
import type { RunRecord } from '../../../shared/steering/steering-api';
import { TelemetryCharts } from '../charts/telemetry-charts';
import { ChannelBandsSource } from '../gauges/channel-bands';
import { CoilStrip } from '../live/coil-strip';
import { FieldPanel } from '../live/field-panel';
import { PredictionPanel } from '../prediction/prediction-panel';
import { ActiveProfile } from '../profiles/active-profile';
import { formatLocalDateTime, formatLocalTime } from '../readout/format-quantity';
import { SPEEDS } from './playback-clock';
import { holdMs } from './replay-data';
import { ReplayPlayer } from './replay-player';
import { ReplayPresence } from './replay-presence';
import { ReplayTimeline } from './replay-timeline';
import { readWindow, windowBefore, type WindowForm } from './window-pick';

/**
 * Replay: a recorded window (a run, or from/to on a calendar) played back through the same
 * panels and charts as Live, under a frame that says it is a replay and of when.
 */
@Component({
  selector: 'tw-replay-page',
  imports: [
    CoilStrip, FieldPanel, FormsModule, MatButtonModule, MatButtonToggleModule, MatDatepickerModule, MatFormFieldModule, MatIconModule,
    MatInputModule, MatSelectModule, PredictionPanel, ReplayTimeline, TelemetryCharts,
  ],
  providers: [ReplayPlayer, provideNativeDateAdapter()],
  templateUrl: './replay-page.html',
  styleUrl: './replay-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { '(keydown)': 'onKey($event)' },
})
export class ReplayPage {
  protected readonly player = inject(ReplayPlayer);
  protected readonly bands = inject(ChannelBandsSource);
  /** Names the profile of a recorded prediction when it is the one active now (else its id is shown). */
  protected readonly activeProfile = inject(ActiveProfile).record;
  protected readonly speeds = SPEEDS;
  protected readonly runs = httpResource<{ runs: RunRecord[] }>(() => '/api/runs');
  protected readonly runChoices = computed(() =>
    (this.runs.hasValue() ? this.runs.value().runs : []).map((run) => ({
      id: run.id,
      text: `#${run.id} ${run.sequenceName} v${run.sequenceVersion} · ${formatLocalDateTime(Date.parse(run.startedAt))} · ${run.state}`,
    })),
  );
  protected readonly runId = signal<number | null>(null);
  protected readonly form = signal<WindowForm>(windowBefore(Date.now()));
  protected readonly formProblem = signal<string | null>(null);

  protected readonly data = this.player.data;
  protected readonly moment = this.player.moment;
  /** "2 Dec, 09:10:00 – 09:20:00" (the end's date only when it differs). */
  protected readonly windowText = computed(() => {
    const data = this.data();
    if (!data) return '';
    const sameDay = new Date(data.fromMs).toDateString() === new Date(data.toMs).toDateString();
    return `${formatLocalDateTime(data.fromMs)} – ${sameDay ? formatLocalTime(data.toMs) : formatLocalDateTime(data.toMs)}`;
  });
  /** "run 7: …, done" beside the window when a run was loaded. */
  protected readonly runText = computed(() => {
    const run = this.data()?.run;
    return run ? `run ${run.id}: ${run.label}, ${run.state}` : null;
  });
  protected readonly clockText = computed(() => replayClockText(this.player.positionMs()));
  protected readonly clockDate = computed(() => new Date(this.player.positionMs()).toLocaleDateString(undefined, { day: 'numeric', month: 'short', year: 'numeric' }));
  /** Said in the panels when nothing was recorded close to the replayed moment. */
  protected readonly gapNote = computed(() => {
    const data = this.data();
    return data && this.moment()?.field === null ? `Nothing recorded within ${Math.round(holdMs(data.resolutionMs) / 1000)} s before this moment` : null;
  });

  constructor() {
    const presence = inject(ReplayPresence);
    presence.active.set(true);
    inject(DestroyRef).onDestroy(() => presence.active.set(false));
    // `/replay?run=7` (linked from a run) opens that run at once.
    const run = Number(inject(ActivatedRoute).snapshot.queryParamMap.get('run'));
    if (Number.isInteger(run) && run > 0) {
      this.runId.set(run);
      void this.loadRun();
    }
  }

  protected updateForm(change: Partial<WindowForm>): void {
    this.form.update((form) => ({ ...form, ...change }));
  }

  protected lastMinutes(): void {
    this.form.set(windowBefore(Date.now()));
    void this.loadWindow();
  }

  protected async loadWindow(): Promise<void> {
    const window = readWindow(this.form());
    if ('problem' in window) {
      this.formProblem.set(window.problem);
      return;
    }
    this.formProblem.set(null);
    await this.player.load(window);
  }

  protected async loadRun(): Promise<void> {
    const runId = this.runId();
    if (runId === null) {
      this.formProblem.set('Run: choose a run.');
      return;
    }
    this.formProblem.set(null);
    await this.player.load({ runId });
  }

  /** Space plays or pauses anywhere on the page except where space types or presses something. */
  protected onKey(event: KeyboardEvent): void {
    if (event.key !== ' ' || event.defaultPrevented || !this.data()) return;
    const target = event.target as HTMLElement | null;
    if (target?.closest('input, textarea, select, button, a, [role="slider"], [role="combobox"], [role="listbox"], mat-button-toggle')) return;
    event.preventDefault();
    this.player.toggle();
  }
}

/** Local time to a tenth of a second, e.g. "21:04:13.2": at 20× a whole second passes in 50 ms. */
export function replayClockText(timeMs: number): string {
  return `${formatLocalTime(timeMs)}.${Math.floor((((timeMs % 1000) + 1000) % 1000) / 100)}`;
}
