import { HttpClient, httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { firstValueFrom } from 'rxjs';
import { hasRole } from '../../../shared/auth/roles';
import type { CalibrationDetail, CalibrationFitResponse, CalibrationRecord } from '../../../shared/field/calibration-record';
import { errorText } from '../api/error-text';
import { Session } from '../auth/session';
import { LiveFeed } from '../feed/live-feed';
import { formatLocalDateTime } from '../readout/format-quantity';
import { CalibrationComparison } from './calibration-comparison';
import { CalibrationUpload } from './calibration-upload';
import { FitReport } from './fit-report';

const KIND_TEXT: Record<CalibrationRecord['kind'], string> = { demo: 'demo values', magnitude: '|B| fit', vector: 'vector-probe fit' };

/**
 * The Calibration page (Setup): every stored version with who fitted and approved it; a
 * version's fit report with residual plots; the comparison with the active version at the
 * present currents; and, for the lead and above only, fitting a new draft from a measurement
 * file and approving a draft with a reason, which makes it active at once.
 */
@Component({
  selector: 'tw-calibration-page',
  imports: [FormsModule, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, CalibrationComparison, CalibrationUpload, FitReport],
  templateUrl: './calibration-page.html',
  styleUrl: './calibration-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CalibrationPage {
  private readonly http = inject(HttpClient);
  private readonly session = inject(Session);
  private readonly feed = inject(LiveFeed);

  protected readonly list = httpResource<{ calibrations: CalibrationRecord[] }>(() => '/api/calibrations');
  protected readonly listError = computed(() => (this.list.error() ? errorText(this.list.error()) : null));
  /** Newest first. */
  protected readonly versions = computed(() => (this.list.hasValue() ? [...this.list.value().calibrations].sort((a, b) => b.version - a.version) : []));
  protected readonly active = computed(() => this.versions().find((v) => v.active) ?? null);

  protected readonly canEdit = computed(() => {
    const role = this.session.role();
    return role !== null && hasRole(role, 'lead');
  });

  private readonly chosenId = signal<number | null>(null);
  protected readonly selectedId = computed(() => this.chosenId() ?? this.active()?.id ?? null);
  protected readonly detail = httpResource<CalibrationDetail>(() => {
    const id = this.selectedId();
    return id === null ? undefined : `/api/calibrations/${id}`;
  });
  protected readonly selected = computed(() => (this.detail.hasValue() && this.detail.value().id === this.selectedId() ? this.detail.value() : null));
  protected readonly detailError = computed(() => (this.detail.error() ? errorText(this.detail.error()) : null));

  protected readonly currents = computed(() => this.feed.live()?.currents ?? null);
  protected readonly currentsTime = computed(() => this.feed.live()?.time ?? null);

  protected readonly notice = signal<string | null>(null);
  protected approvalReason = '';
  protected readonly approving = signal(false);
  protected readonly approvalError = signal<string | null>(null);

  protected select(record: CalibrationRecord): void {
    this.chosenId.set(record.id);
    this.approvalError.set(null);
    this.approvalReason = '';
  }

  protected afterFit(response: CalibrationFitResponse): void {
    this.notice.set(`Fitted ${response.calibration.sourceName} as draft v${response.calibration.version}. Check the report, then approve it with a reason.`);
    this.list.reload();
    this.chosenId.set(response.id);
  }

  protected async approve(record: CalibrationRecord): Promise<void> {
    const reason = this.approvalReason.trim();
    if (!reason) {
      this.approvalError.set('Reason for approving: say why (it goes into the audit trail).');
      return;
    }
    this.approving.set(true);
    this.approvalError.set(null);
    try {
      const approved = await firstValueFrom(this.http.post<CalibrationRecord>(`/api/calibrations/${record.id}/approve`, { reason }));
      this.notice.set(`v${approved.version} is approved and active: the field on Live now uses it.`);
      this.approvalReason = '';
      this.list.reload();
      this.detail.reload();
    } catch (err) {
      this.approvalError.set(errorText(err));
    } finally {
      this.approving.set(false);
    }
  }

  protected kindText(record: CalibrationRecord): string {
    return KIND_TEXT[record.kind];
  }

  protected when(iso: string | null): string {
    return iso ? formatLocalDateTime(Date.parse(iso)) : '';
  }
}
