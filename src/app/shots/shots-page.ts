import { HttpClient, HttpErrorResponse } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatSortModule, type Sort } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { ActivatedRoute, Router } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { hasRole } from '../../../shared/auth/roles';
import type { ShotsResponse } from '../../../shared/shots/shots-api';
import type { RunRecord } from '../../../shared/steering/steering-api';
import { errorText } from '../api/error-text';
import { fieldMessage, markField } from '../api/field-errors';
import { Session } from '../auth/session';
import { formatLocalDateTime, formatNumber, formatQuantity, NO_VALUE } from '../readout/format-quantity';
import { SteeringRequests } from '../steering/steering-requests';
import { MeasurementUpload } from './measurement-upload';
import { ShotChart } from './shot-chart';
import { agreement, shotsCsv, shotView, sortShots, type ShotColumn, type ShotView } from './shot-comparison';

/**
 * The Shots page: the shots of a run with the prediction stored at each and the TOF image the
 * imaging analysis measured, as a sortable table, two charts against θ (aspect ratios with
 * error bars, and their difference), how far measured and predicted deformations are apart,
 * a CSV export, and for operators the upload of measurement files. The run list holds the
 * newest runs; an older one opens by its number (or `?run=ID`).
 */
@Component({
  selector: 'tw-shots-page',
  imports: [MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatSelectModule, MatSortModule, MatTableModule, MeasurementUpload, ReactiveFormsModule, ShotChart],
  templateUrl: './shots-page.html',
  styleUrl: './shots-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ShotsPage {
  private readonly http = inject(HttpClient);
  private readonly requests = inject(SteeringRequests);
  private readonly router = inject(Router);
  private readonly route = inject(ActivatedRoute);
  private readonly session = inject(Session);

  protected readonly isOperator = computed(() => hasRole(this.session.role() ?? 'viewer', 'operator'));
  protected readonly runs = signal<RunRecord[]>([]);
  protected readonly runId = signal<number | null>(null);
  protected readonly views = signal<ShotView[]>([]);
  protected readonly sort = signal<Sort>({ active: 'atMs', direction: '' });
  protected readonly loading = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly notice = signal<string | null>(null);

  protected readonly columns: ShotColumn[] = [
    'label', 'atMs', 'thetaDeg', 'phiDeg', 'magnitudeG', 'predictedAspect', 'measuredAspect', 'deformationRatio', 'predictedAngleDeg', 'measuredAngleDeg',
  ];
  protected readonly rows = computed(() => sortShots(this.views(), this.sort().active as ShotColumn, this.sort().direction));
  protected readonly agreement = computed(() => agreement(this.views()));
  protected readonly measuredCount = computed(() => this.views().filter((v) => v.measuredAspect !== null).length);
  protected readonly run = computed(() => this.runs().find((r) => r.id === this.runId()) ?? null);
  /** Opens any run by its number, also one older than the list holds. */
  protected readonly runNumber = new FormControl<number | null>(null);
  protected readonly fieldMessage = fieldMessage;

  protected readonly number = (value: number | null, digits: number) => (value === null ? NO_VALUE : formatNumber(value, digits));
  protected readonly quantity = formatQuantity;
  protected readonly dateTime = (iso: string | number) => formatLocalDateTime(typeof iso === 'number' ? iso : Date.parse(iso));

  constructor() {
    void this.loadRuns();
  }

  /** Reads the runs again (a running one may have taken shots since) and the shown run's shots. */
  protected async reload(): Promise<void> {
    await this.loadRuns(this.runId());
  }

  private async loadRuns(keep: number | null = null): Promise<void> {
    try {
      const runs = await this.requests.runs();
      this.runs.set(runs);
      const asked = keep ?? Number(this.route.snapshot.queryParamMap.get('run'));
      if (Number.isInteger(asked) && asked > 0 && !runs.some((r) => r.id === asked)) return await this.openRun(asked);
      const first = runs.find((r) => r.id === asked) ?? runs.find((r) => r.shots.length > 0) ?? runs[0];
      if (first) await this.showRun(first.id);
    } catch (err) {
      this.problem.set(errorText(err));
    }
  }

  /** Shows the run numbered `id` (the field's number by default), reading it when the list does not hold it. */
  protected async openRun(id = this.runNumber.value): Promise<void> {
    if (id === null || !Number.isInteger(id) || id < 1) return markField(this.runNumber, 'Run number: give a whole number from 1');
    if (!this.runs().some((r) => r.id === id)) {
      try {
        const run = await this.requests.getRun(id);
        this.runs.update((runs) => [...runs, run].sort((a, b) => b.id - a.id));
      } catch (err) {
        const missing = err instanceof HttpErrorResponse && err.status === 404;
        return markField(this.runNumber, missing ? `Run number: there is no run ${id}` : `Run number: ${errorText(err)}`);
      }
    }
    await this.showRun(id);
  }

  protected async showRun(runId: number): Promise<void> {
    // Another run's rows must not stand under this run's heading while its shots load.
    if (runId !== this.runId()) this.views.set([]);
    this.runId.set(runId);
    void this.router.navigate([], { relativeTo: this.route, queryParams: { run: runId }, replaceUrl: true });
    await this.loadShots();
  }

  private async loadShots(): Promise<void> {
    const runId = this.runId();
    if (runId === null) return;
    this.loading.set(true);
    this.problem.set(null);
    try {
      const body = await firstValueFrom(this.http.get<ShotsResponse>('/api/shots', { params: { run: runId } }));
      if (this.runId() === runId) this.views.set(body.shots.map(shotView));
    } catch (err) {
      this.problem.set(errorText(err));
    } finally {
      this.loading.set(false);
    }
  }

  protected async measurementsStored(count: number): Promise<void> {
    this.notice.set(`Stored ${count} measured ${count === 1 ? 'image' : 'images'}.`);
    await this.loadShots();
  }

  protected exportCsv(): void {
    const blob = new Blob([shotsCsv(this.rows())], { type: 'text/csv;charset=utf-8' });
    const link = document.createElement('a');
    link.href = URL.createObjectURL(blob);
    link.download = `tiltwatch-shots-run-${this.runId()}.csv`;
    link.click();
    // Released once the download has taken the data.
    setTimeout(() => URL.revokeObjectURL(link.href), 10_000);
  }
}
