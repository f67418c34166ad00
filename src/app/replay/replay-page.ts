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
import { withAlarmMarks } from '../../../shared/levels/channel-bands';
import type { RunRecord } from '../../../shared/steering/steering-api';
import { TelemetryCharts } from '../charts/telemetry-charts';
import { CoilStrip } from '../live/coil-strip';
import { FieldPanel } from '../live/field-panel';
import { PredictionPanel } from '../prediction/prediction-panel';
import { formatLocalDateTime, formatLocalTime } from '../readout/format-quantity';
import { SPEEDS, seekTargetForKey } from './playback-clock';
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
  /** "Calibration v2 "…" · sample profile "…" v3": what was in force at the replay clock. */
  protected readonly inForceText = computed(() => {
    const moment = this.moment();
    if (!moment) return null;
    const { calibration, profile } = moment;
    return [
      calibration ? `calibration v${calibration.version} "${calibration.label}"` : 'no calibration recorded',
      profile ? `sample profile "${profile.name}" v${profile.version}` : 'no sample profile recorded',
    ].join(' · ');
  });
  /** The level set and the alarm limits in force at the clock; each changes only at an edit. */
  private readonly levels = computed(() => this.moment()?.levels ?? null);
  private readonly alarmLimits = computed(() => this.moment()?.alarmLimits ?? null);
  /** The coil strip's bands: the level set's, marked with the alarm limits in force at the clock. */
  protected readonly bands = computed(() => {
    const levels = this.levels();
    return levels ? withAlarmMarks(levels.bands, this.alarmLimits()?.limits ?? []).bands : null;
  });
  /** The coil strip's note: what history lacks, and what draws the bands and marks. */
  protected readonly coilNote = computed(() => {
    const levels = this.levels();
    const drawn = levels ? `bands and trip levels of level set v${levels.version} and alarm marks of the alarm limits, both in force at the replay clock` : '';
    return `Replay: setpoints, voltages and water temperatures are not kept in history (shown as no data); ${drawn}.`;
  });
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

  /**
   * Space plays or pauses and the left and right arrows step anywhere on the page, except where
   * those keys type, choose or press something.
   */
  protected onKey(event: KeyboardEvent): void {
    const data = this.data();
    if (!data || event.defaultPrevented || !(event.key === ' ' || event.key === 'ArrowLeft' || event.key === 'ArrowRight')) return;
    const target = event.target as HTMLElement | null;
    if (target?.closest('input, textarea, select, a, [role="slider"], [role="radio"], [role="combobox"], [role="listbox"], mat-button-toggle')) return;
    if (event.key === ' ') {
      if (target?.closest('button')) return;
      event.preventDefault();
      this.player.toggle();
      return;
    }
    event.preventDefault();
    this.player.seek(seekTargetForKey(event.key, this.player.positionMs(), data.fromMs, data.toMs) ?? this.player.positionMs());
  }
}

/** Local time to a tenth of a second, e.g. "21:04:13.2": at 20× a whole second passes in 50 ms. */
export function replayClockText(timeMs: number): string {
  return `${formatLocalTime(timeMs)}.${Math.floor((((timeMs % 1000) + 1000) % 1000) / 100)}`;
}
