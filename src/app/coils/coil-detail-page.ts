import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { ActivatedRoute, RouterLink } from '@angular/router';
import { map } from 'rxjs';
import type { LevelSetVersion } from '../../../shared/levels/level-set';
import { windingTemperatureC } from '../../../shared/levels/winding-temperature';
import { CompactAlarmList } from '../alarms/compact-alarm-list';
import type { AlarmLimitRecord } from '../alarms/alarm-records';
import { Session } from '../auth/session';
import { ChartPanel, type ChartAxis, type ChartLine } from '../charts/chart-panel';
import { FAST, SLOW, TelemetryHistory } from '../charts/telemetry-history';
import { DEFAULT_WINDOW_SECONDS } from '../charts/time-window';
import { isStale } from '../feed/connection-state';
import { LiveFeed } from '../feed/live-feed';
import { ChannelBandsSource } from '../gauges/channel-bands';
import { GaugeBar } from '../gauges/gauge-bar';
import { ControllerStatus } from '../live/controller-status';
import { formatLocalTime, formatQuantity } from '../readout/format-quantity';
import { chainRow } from './coil-trip-chain';

type Axis = 'x' | 'y' | 'z';
const AXES: readonly Axis[] = ['x', 'y', 'z'];

/**
 * Coil detail: one coil pair — current against setpoint, voltage, the winding temperature
 * derived from its resistance, coil and water temperatures, coolant flow, its trip chain
 * (alarm levels, software trip, hardware trip), its active alarms, and its charts.
 */
@Component({
  selector: 'tw-coil-detail-page',
  imports: [ChartPanel, CompactAlarmList, ControllerStatus, GaugeBar, MatButtonModule, MatIconModule, RouterLink],
  providers: [TelemetryHistory],
  templateUrl: './coil-detail-page.html',
  styleUrl: './coil-detail-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CoilDetailPage {
  private readonly feed = inject(LiveFeed);
  protected readonly history = inject(TelemetryHistory);
  protected readonly role = inject(Session).role;
  protected readonly bandsSource = inject(ChannelBandsSource);
  protected readonly axes = AXES;

  protected readonly axis = toSignal(
    inject(ActivatedRoute).paramMap.pipe(map((p) => (AXES.includes(p.get('axis') as Axis) ? (p.get('axis') as Axis) : 'x'))),
    { initialValue: 'x' as Axis },
  );
  protected readonly name = computed(() => this.axis().toUpperCase());

  private readonly levels = httpResource<LevelSetVersion>(() => '/api/levels');
  private readonly limits = httpResource<{ limits: AlarmLimitRecord[] }>(() => '/api/alarm-limits');

  protected readonly live = this.feed.live;
  protected readonly stale = computed(() => isStale(this.feed.connection().state));
  protected readonly staleNote = computed(() => {
    const reading = this.feed.connection();
    if (!isStale(reading.state)) return null;
    return reading.newestDataAtMs === null ? 'No data received yet' : `Stale since ${formatLocalTime(reading.newestDataAtMs)}`;
  });

  protected readonly bands = computed(() => {
    const inForce = this.bandsSource.bands();
    if (!inForce) return null;
    const a = this.axis();
    return {
      current: inForce.bands[`current.${a}`],
      voltage: inForce.bands[`voltage.${a}`],
      temperature: inForce.bands[`temperature.${a}`],
      flow: inForce.bands[`flow.${a}`],
      waterSupply: inForce.bands.waterSupply,
    };
  });

  protected readonly reading = computed(() => {
    const live = this.live();
    const a = this.axis();
    const current = live?.currents?.[a] ?? null;
    const setpoint = live?.setpoints?.[a] ?? null;
    const voltage = live?.voltageV?.[a] ?? null;
    const r20 = this.levels.hasValue() ? this.levels.value().levels.windingsR20Ohm[a] : null;
    const winding = r20 === null ? null : windingTemperatureC(voltage, current, setpoint, r20);
    const returnC = live?.waterReturnC?.[a] ?? null;
    const supplyC = live?.waterSupplyC ?? null;
    const resistance = current !== null && voltage !== null && Math.abs(current) >= 1 ? (voltage / current) * 1000 : null;
    return {
      current,
      setpoint,
      voltage,
      temperature: live?.temperatureC?.[a] ?? null,
      flow: live?.flowLpm?.[a] ?? null,
      supplyC,
      deviation: current !== null && setpoint !== null ? formatQuantity(current - setpoint, 'A', 3) : '—',
      resistance: resistance === null ? '—' : formatQuantity(resistance, 'mΩ', 1),
      r20: r20 === null ? '—' : formatQuantity(r20 * 1000, 'mΩ', 0),
      winding: winding === null ? '—' : formatQuantity(winding, '°C', 1),
      windingNote: winding === null ? 'needs ≥ 1 A and a settled current' : 'mean over the winding, from V/I',
      returnText: formatQuantity(returnC, '°C', 1),
      rise: returnC !== null && supplyC !== null ? formatQuantity(returnC - supplyC, 'K', 1) : '—',
    };
  });

  protected readonly chain = computed(() => {
    const bands = this.bands();
    if (!bands) return [];
    const a = this.axis();
    const r = this.reading();
    const limits = this.limits.hasValue() ? this.limits.value().limits : [];
    const conditions = this.feed.alarms()?.interlock.conditions ?? [];
    const find = (name: string) => conditions.find((c) => c.name === name);
    return [
      chainRow('Coil current', `current.${a}`, r.current === null ? null : Math.abs(r.current), bands.current, limits, find(`over-current-${a}`)),
      chainRow('Coil temperature', `temperature.${a}`, r.temperature, bands.temperature, limits, find(`over-temperature-${a}`)),
      chainRow('Coolant flow', `flow.${a}`, r.flow, bands.flow, limits, find(`low-flow-${a}`)),
    ];
  });

  protected readonly hardware = computed(() => {
    const controller = this.live()?.controller;
    if (!controller) return 'unknown (no data yet)';
    return controller.hardwareTripped ? `TRIPPED${controller.hardwareTripCause ? ` (${controller.hardwareTripCause})` : ''}: reset at the apparatus` : 'not tripped';
  });

  /** Active alarms of this pair's channels (current, deviation, temperature, flow, return water). */
  protected readonly alarms = computed(() => {
    const suffix = `.${this.axis()}`;
    return (this.feed.alarms()?.active ?? []).filter((alarm) => alarm.channel.endsWith(suffix));
  });

  protected readonly currentLines = computed<ChartLine[]>(() => {
    const i = AXES.indexOf(this.axis());
    return [{ label: `I${this.axis()} (A)`, column: FAST.currentX + i, scale: 'A', color: '--tw-series-1', digits: 3 }];
  });
  protected readonly currentAxes: ChartAxis[] = [{ scale: 'A', label: 'Current (A)', side: 'left' }];
  protected readonly thermalLines = computed<ChartLine[]>(() => {
    const i = AXES.indexOf(this.axis());
    return [
      { label: `T${this.axis()} (°C)`, column: SLOW.temperatureX + i, scale: '°C', color: '--tw-series-1', digits: 2 },
      { label: `Flow ${this.axis()} (L/min)`, column: SLOW.flowX + i, scale: 'L/min', color: '--tw-series-2', dash: [7, 4], digits: 2 },
    ];
  });
  protected readonly thermalAxes: ChartAxis[] = [
    { scale: '°C', label: 'Coil temperature (°C)', side: 'left' },
    { scale: 'L/min', label: 'Flow (L/min)', side: 'right', fromZero: true },
  ];
  protected readonly windowSeconds = DEFAULT_WINDOW_SECONDS;

  constructor() {
    void this.history.showWindow(this.windowSeconds);
  }
}
