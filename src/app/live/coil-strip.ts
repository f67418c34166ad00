import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { BandId, ChannelBand } from '../../../shared/live/channels';
import type { LiveState, PerAxis } from '../../../shared/live/live-state';
import { RouterLink } from '@angular/router';
import { GaugeBar } from '../gauges/gauge-bar';
import { formatQuantity } from '../readout/format-quantity';

type Axis = keyof PerAxis<number>;

/** The readings the strip shows; a replay has only some of them (the rest null). */
export type CoilReadings = Pick<LiveState, 'currents' | 'setpoints' | 'voltageV' | 'temperatureC' | 'flowLpm' | 'waterSupplyC' | 'waterReturnC'>;
const AXES: readonly Axis[] = ['x', 'y', 'z'];

/**
 * The three coil pairs side by side: per axis current against setpoint, voltage, coil
 * temperature and coolant flow as gauge bars, plus the return-water temperature and its rise
 * over the supply; below them the shared water supply.
 */
@Component({
  selector: 'tw-coil-strip',
  imports: [GaugeBar, RouterLink],
  templateUrl: './coil-strip.html',
  styleUrl: './coil-strip.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { role: 'region', 'aria-label': 'Coils' },
})
export class CoilStrip {
  readonly readings = input<CoilReadings | null>(null);
  readonly bands = input.required<Record<BandId, ChannelBand>>();
  readonly stale = input(false);
  /** A line under the strip, e.g. which channels a replay does not have. */
  readonly note = input<string | null>(null);

  protected readonly axes = computed(() => {
    const live = this.readings();
    const pick = (values: PerAxis<number> | null | undefined, axis: Axis) => values?.[axis] ?? null;
    return AXES.map((axis) => {
      const returnC = pick(live?.waterReturnC, axis);
      const supplyC = live?.waterSupplyC ?? null;
      return {
        axis,
        name: axis.toUpperCase(),
        band: {
          current: this.bands()[`current.${axis}`],
          voltage: this.bands()[`voltage.${axis}`],
          temperature: this.bands()[`temperature.${axis}`],
          flow: this.bands()[`flow.${axis}`],
        },
        current: pick(live?.currents, axis),
        setpoint: pick(live?.setpoints, axis),
        voltage: pick(live?.voltageV, axis),
        temperature: pick(live?.temperatureC, axis),
        flow: pick(live?.flowLpm, axis),
        returnText: formatQuantity(returnC, '°C', 1),
        riseText: returnC !== null && supplyC !== null ? `ΔT ${formatSigned(returnC - supplyC)}` : null,
      };
    });
  });
}

/** Temperature difference with explicit sign, in kelvin (a difference, not a temperature). */
function formatSigned(differenceK: number): string {
  const text = formatQuantity(differenceK, 'K', 1);
  return differenceK >= 0.05 ? `+${text}` : text;
}
