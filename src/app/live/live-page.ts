import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatIconModule } from '@angular/material/icon';
import { TelemetryCharts } from '../charts/telemetry-charts';
import { TelemetryHistory } from '../charts/telemetry-history';
import { DEFAULT_WINDOW_SECONDS, TIME_WINDOWS } from '../charts/time-window';
import { isStale } from '../feed/connection-state';
import { LiveFeed } from '../feed/live-feed';
import { PredictionPanel } from '../prediction/prediction-panel';
import { PredictionSeries, predictionGapNote } from '../prediction/prediction-series';
import { ActiveProfile } from '../profiles/active-profile';
import { formatLocalTime } from '../readout/format-quantity';
import { CompactAlarmList } from '../alarms/compact-alarm-list';
import { Session } from '../auth/session';
import { ChannelBandsSource } from '../gauges/channel-bands';
import { CoilStrip } from './coil-strip';
import { ControllerStatus } from './controller-status';
import { FieldPanel } from './field-panel';
import { SteerTarget } from './steer-target';

/** The Live page: field, prediction, coils, controller state and charts of the recent past. */
@Component({
  selector: 'tw-live-page',
  imports: [CoilStrip, CompactAlarmList, ControllerStatus, FieldPanel, MatButtonModule, MatButtonToggleModule, MatIconModule, PredictionPanel, SteerTarget, TelemetryCharts],
  providers: [TelemetryHistory, PredictionSeries],
  templateUrl: './live-page.html',
  styleUrl: './live-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LivePage {
  private readonly feed = inject(LiveFeed);
  protected readonly history = inject(TelemetryHistory);
  protected readonly predicted = inject(PredictionSeries);
  protected readonly activeProfile = inject(ActiveProfile).record;

  protected readonly live = this.feed.live;
  protected readonly role = inject(Session).role;
  /** The active alarms as the server pushes them (the same list the Alarms page counts). */
  protected readonly activeAlarms = computed(() => this.feed.alarms()?.active ?? []);
  /** Bands and limits in force, as the server sends them (pushed again when a lead changes one). */
  protected readonly bands = inject(ChannelBandsSource);

  protected readonly stale = computed(() => isStale(this.feed.connection().state));
  /** "Stale since hh:mm:ss" (local time of the newest data), or null while data is current. */
  protected readonly staleNote = computed(() => {
    const reading = this.feed.connection();
    if (!isStale(reading.state)) return null;
    return reading.newestDataAtMs === null ? 'No data received yet' : `Stale since ${formatLocalTime(reading.newestDataAtMs)}`;
  });

  /** Why the predicted-shape chart has a gap now (stale data, field too weak to orient), or null. */
  protected readonly predictionGap = computed(() => predictionGapNote(this.live()?.predictionStatus ?? null, this.staleNote()));

  protected readonly windows = TIME_WINDOWS;
  protected readonly windowSeconds = signal(DEFAULT_WINDOW_SECONDS);

  constructor() {
    void this.history.showWindow(this.windowSeconds());
    void this.predicted.showWindow(this.windowSeconds());
  }

  protected chooseWindow(seconds: number): void {
    if (seconds === this.windowSeconds()) return;
    this.windowSeconds.set(seconds);
    void this.history.showWindow(seconds);
    void this.predicted.showWindow(seconds);
  }
}
