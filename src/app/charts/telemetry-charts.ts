import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { PREDICTED } from '../prediction/prediction-series';
import { ChartPanel, type ChartAxis, type ChartLine, type TimeMarker } from './chart-panel';
import type { RingBuffer } from './ring-buffer';
import { FAST, SLOW } from './telemetry-history';

const AXIS_LINES = [
  { axis: 'X', color: '--tw-series-1' },
  { axis: 'Y', color: '--tw-series-2', dash: [7, 4] },
  { axis: 'Z', color: '--tw-series-3', dash: [2, 3] },
];

const CURRENT_LINES: ChartLine[] = AXIS_LINES.map((l, i) => ({
  label: `I${l.axis.toLowerCase()} (A)`, column: FAST.currentX + i, scale: 'A', color: l.color, dash: l.dash, digits: 3,
}));
const CURRENT_AXES: ChartAxis[] = [{ scale: 'A', label: 'Current (A)', side: 'left' }];

const TEMPERATURE_LINES: ChartLine[] = AXIS_LINES.map((l, i) => ({
  label: `T${l.axis.toLowerCase()} (°C)`, column: SLOW.temperatureX + i, scale: '°C', color: l.color, dash: l.dash, digits: 2,
}));
const TEMPERATURE_AXES: ChartAxis[] = [{ scale: '°C', label: 'Coil temperature (°C)', side: 'left' }];

const FIELD_LINES: ChartLine[] = [
  { label: 'θ (°)', column: FAST.theta, scale: 'deg', color: '--tw-series-1', digits: 1 },
  { label: 'φ (°)', column: FAST.phi, scale: 'deg', color: '--tw-series-2', dash: [7, 4], digits: 1, breakAbove: 180 },
  { label: '|B| (G)', column: FAST.bMag, scale: 'G', color: '--tw-series-3', dash: [2, 3], digits: 3 },
];
const FIELD_AXES: ChartAxis[] = [
  { scale: 'deg', label: 'Angle (°)', side: 'left', range: [0, 360], step: 90 },
  { scale: 'G', label: '|B| (G)', side: 'right', fromZero: true },
];

// The TOF line is the profile's first TOF time along its camera, as in the prediction panel.
const PREDICTED_LINES: ChartLine[] = [
  { label: 'β − 1 (%)', column: PREDICTED.betaDeviation, scale: '%', color: '--tw-series-1', digits: 3 },
  { label: 'TOF aspect − 1 (%)', column: PREDICTED.tofDeviation, scale: '%', color: '--tw-series-2', dash: [7, 4], digits: 3 },
];
const PREDICTED_AXES: ChartAxis[] = [{ scale: '%', label: 'Deformation (%)', side: 'left' }];

/**
 * The four charts of the Live and Replay pages: coil currents, coil temperatures, field angles
 * and the predicted shape, from buffers filled by the live feed or by a loaded history window.
 */
@Component({
  selector: 'tw-telemetry-charts',
  imports: [ChartPanel],
  template: `
    <tw-chart-panel caption="Coil currents" [buffer]="fast()" [lines]="currentLines" [axes]="currentAxes" [windowSeconds]="windowSeconds()"
                    [endMs]="windowEndMs()" [marker]="marker()" [staleNote]="staleNote()" />
    <tw-chart-panel caption="Coil temperatures" [buffer]="slow()" [lines]="temperatureLines" [axes]="temperatureAxes" [windowSeconds]="windowSeconds()"
                    [endMs]="windowEndMs()" [marker]="marker()" [staleNote]="staleNote()" />
    <tw-chart-panel caption="Field angles" [buffer]="fast()" [lines]="fieldLines" [axes]="fieldAxes" [windowSeconds]="windowSeconds()"
                    [endMs]="windowEndMs()" [marker]="marker()" [staleNote]="staleNote()" />
    <tw-chart-panel caption="Predicted shape" [buffer]="predicted()" [lines]="predictedLines" [axes]="predictedAxes" [windowSeconds]="windowSeconds()"
                    [endMs]="windowEndMs()" [marker]="marker()" [staleNote]="predictedNote() ?? staleNote()" />
  `,
  styleUrl: './telemetry-charts.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TelemetryCharts {
  /** `FAST` columns. */
  readonly fast = input.required<RingBuffer>();
  /** `SLOW` columns. */
  readonly slow = input.required<RingBuffer>();
  /** `PREDICTED` columns. */
  readonly predicted = input.required<RingBuffer>();
  readonly windowSeconds = input.required<number>();
  /** End of the window, Unix epoch ms; null follows the newest sample (live). */
  readonly windowEndMs = input<number | null>(null);
  readonly marker = input<TimeMarker | null>(null);
  readonly staleNote = input<string | null>(null);
  /** Why the predicted shape has a gap now (field too weak to orient, stale data); null shows `staleNote`. */
  readonly predictedNote = input<string | null>(null);

  protected readonly currentLines = CURRENT_LINES;
  protected readonly currentAxes = CURRENT_AXES;
  protected readonly temperatureLines = TEMPERATURE_LINES;
  protected readonly temperatureAxes = TEMPERATURE_AXES;
  protected readonly fieldLines = FIELD_LINES;
  protected readonly fieldAxes = FIELD_AXES;
  protected readonly predictedLines = PREDICTED_LINES;
  protected readonly predictedAxes = PREDICTED_AXES;
}
