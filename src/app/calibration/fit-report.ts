import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { CalibrationDetail } from '../../../shared/field/calibration-record';
import { formatNumber } from '../readout/format-quantity';
import { ResidualChart, type ResidualPoint } from './residual-chart';
import { formatUncertain } from '../readout/uncertain-number';

const AXES = ['x', 'y', 'z'] as const;

/**
 * A calibration version's fit report: K and B0 with their standard errors, the coil → trap
 * rotation, residual RMS and largest residual, the frame choice, and the residuals plotted
 * against each current and against |B| with the outliers marked and listed.
 */
@Component({
  selector: 'tw-fit-report',
  imports: [ResidualChart],
  templateUrl: './fit-report.html',
  styleUrl: './fit-report.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FitReport {
  readonly record = input.required<CalibrationDetail>();

  protected readonly axes = AXES;
  protected readonly fit = computed(() => this.record().fit);

  /** K rows as text, with ± standard error where the fit gives one. */
  protected readonly kRows = computed(() => {
    const r = this.record();
    const se = r.fit?.standardErrors.gaussPerAmp;
    return r.gaussPerAmp.map((row, i) => row.map((v, j) => formatUncertain(v, se?.[i][j])));
  });
  protected readonly offsets = computed(() => {
    const r = this.record();
    return r.offsetGauss.map((v, i) => formatUncertain(v, r.fit?.standardErrors.offsetGauss[i]));
  });
  protected readonly rotation = computed(() => this.record().coilToTrap.map((row) => row.map((v) => formatNumber(v, 4))));
  protected readonly rmsMilliGauss = computed(() => (this.fit() ? formatNumber(this.fit()!.residualRmsGauss * 1000, 2) : null));
  protected readonly maxMilliGauss = computed(() => (this.fit() ? formatNumber(this.fit()!.maxResidualGauss * 1000, 2) : null));

  protected readonly components = computed(() => (this.record().kind === 'vector' ? ['Bx', 'By', 'Bz'] : ['|B|']));
  protected readonly outliers = computed(() => (this.record().points ?? []).filter((p) => p.outlier));

  /** Residual points against current `axis` (0…2) or, for 3, against measured |B|. */
  protected pointsAgainst(axis: number): ResidualPoint[] {
    return (this.record().points ?? []).map((p) => ({
      line: p.line,
      x: axis < 3 ? p.currentA[axis] : p.measuredGauss,
      residualGauss: p.residualGauss,
      outlier: p.outlier,
    }));
  }

  protected readonly plots = computed(() => {
    if (!this.record().points) return [];
    return [
      { caption: 'Residual against the x-pair current', xLabel: 'Ix (A)', points: this.pointsAgainst(0) },
      { caption: 'Residual against the y-pair current', xLabel: 'Iy (A)', points: this.pointsAgainst(1) },
      { caption: 'Residual against the z-pair current', xLabel: 'Iz (A)', points: this.pointsAgainst(2) },
      { caption: 'Residual against the measured |B|', xLabel: '|B| (G)', points: this.pointsAgainst(3) },
    ];
  });

  protected residualText(values: readonly number[]): string {
    return values.map((v) => `${formatNumber(v * 1000, 2)} mG`).join(', ');
  }
}
