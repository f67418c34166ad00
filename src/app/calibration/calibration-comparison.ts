import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { CalibrationRecord } from '../../../shared/field/calibration-record';
import { calibrationShift } from '../../../shared/field/calibration-shift';
import { fieldUncertainty, type FieldUncertainty } from '../../../shared/field/field-uncertainty';
import type { FieldState } from '../../../shared/field/field-vector';
import type { PerAxis } from '../../../shared/live/live-state';
import { NO_VALUE, formatLocalTime, formatNumber } from '../readout/format-quantity';
import { formatUncertain } from '../readout/uncertain-number';

interface Column {
  magnitude: string;
  theta: string;
  phi: string;
}

/**
 * A calibration version beside the active one: the field each gives at the present coil
 * currents (with its uncertainty from the version's covariance), how far |B|, θ and φ would
 * move on approval, and the largest change in K and B0.
 */
@Component({
  selector: 'tw-calibration-comparison',
  templateUrl: './calibration-comparison.html',
  styleUrl: './calibration-comparison.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CalibrationComparison {
  readonly candidate = input.required<CalibrationRecord>();
  readonly active = input.required<CalibrationRecord>();
  /** Present mean coil currents, A; null without telemetry. */
  readonly currents = input<PerAxis<number> | null>(null);
  /** ISO time of the currents. */
  readonly time = input<string | null>(null);

  protected readonly at = computed(() => {
    const t = this.time();
    return t ? formatLocalTime(Date.parse(t)) : null;
  });

  protected readonly shift = computed(() => {
    const i = this.currents();
    if (!i) return null;
    const s = calibrationShift(this.active(), this.candidate(), i);
    return {
      active: column(s.from, sigma(this.active(), i)),
      candidate: column(s.to, sigma(this.candidate(), i)),
      magnitude: signed(s.magnitudeGauss * 1000, 1, 'mG'),
      theta: s.thetaDeg === null ? NO_VALUE : signed(s.thetaDeg, 2, '°'),
      phi: s.phiDeg === null ? NO_VALUE : signed(s.phiDeg, 2, '°'),
      direction: s.directionDeg === null ? NO_VALUE : `${formatNumber(s.directionDeg, 2)}°`,
    };
  });

  protected readonly matrixChange = computed(() => {
    const a = this.active();
    const c = this.candidate();
    const dk = Math.max(...a.gaussPerAmp.flatMap((row, i) => row.map((v, j) => Math.abs(c.gaussPerAmp[i][j] - v))));
    const db = Math.max(...a.offsetGauss.map((v, i) => Math.abs(c.offsetGauss[i] - v)));
    return { k: `${formatNumber(dk * 1000, 2)} mG/A`, b0: `${formatNumber(db * 1000, 1)} mG` };
  });
}

function sigma(record: CalibrationRecord, currents: PerAxis<number>): FieldUncertainty | null {
  return record.covariance ? fieldUncertainty(record, record.covariance, currents) : null;
}

function column(field: FieldState, s: FieldUncertainty | null): Column {
  return {
    magnitude: formatUncertain(field.magnitude, s?.magnitudeGauss ?? null, 'G', 3),
    theta: field.thetaDeg === null ? NO_VALUE : formatUncertain(field.thetaDeg, s?.thetaDeg ?? null, '°', 2),
    phi: field.phiDeg === null ? NO_VALUE : formatUncertain(field.phiDeg, s?.phiDeg ?? null, '°', 2),
  };
}

function signed(value: number, digits: number, unit: string): string {
  const text = formatNumber(Math.abs(value), digits);
  const sign = Number(text) === 0 ? '±' : value > 0 ? '+' : '−';
  return `${sign}${text}${unit === '°' ? unit : ` ${unit}`}`;
}
