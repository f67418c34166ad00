import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { hasRole, type Role } from '../../../shared/auth/roles';
import { BAND_KINDS, BAND_LABELS, SETTING_LABELS, TRIP_LABELS, type LevelSetVersion, type OperatingSettings, type TripLevels } from '../../../shared/levels/level-set';
import { errorText } from '../api/error-text';
import { formatLocalTime } from '../readout/format-quantity';
import { LevelDialog } from './level-dialog';

/**
 * The level set in force — trip levels, display bands, operating settings — with its version,
 * author and reason; a lead edits it (a new version, audited).
 */
@Component({
  selector: 'tw-level-set-panel',
  imports: [MatButtonModule, MatIconModule],
  templateUrl: './level-set-panel.html',
  styleUrl: '../alarms/alarm-tables.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LevelSetPanel {
  private readonly dialog = inject(MatDialog);
  readonly role = input<Role | null>(null);

  protected readonly inForce = httpResource<LevelSetVersion>(() => '/api/levels');
  protected readonly error = computed(() => (this.inForce.error() ? errorText(this.inForce.error()) : null));
  protected readonly canEdit = computed(() => {
    const role = this.role();
    return role !== null && hasRole(role, 'lead');
  });

  protected readonly rows = computed(() => {
    if (!this.inForce.hasValue()) return null;
    const { levels } = this.inForce.value();
    return {
      trips: (Object.keys(TRIP_LABELS) as (keyof TripLevels)[]).map((k) => ({ label: TRIP_LABELS[k].label, value: levels.trips[k] })),
      bands: BAND_KINDS.map((kind) => ({ label: `${BAND_LABELS[kind].label} (${BAND_LABELS[kind].unit})`, ...levels.bands[kind] })),
      settings: (Object.keys(SETTING_LABELS) as (keyof OperatingSettings)[]).map((k) => ({ label: SETTING_LABELS[k].label, value: levels.settings[k] })),
    };
  });
  protected readonly when = computed(() => (this.inForce.hasValue() ? formatLocalTime(Date.parse(this.inForce.value().createdAt)) : ''));

  protected edit(): void {
    if (!this.inForce.hasValue()) return;
    this.dialog
      .open<LevelDialog, LevelSetVersion, LevelSetVersion>(LevelDialog, { data: this.inForce.value(), width: '920px', maxWidth: '96vw', autoFocus: 'first-tabbable' })
      .afterClosed()
      .subscribe((saved) => {
        if (saved) this.inForce.set(saved);
      });
  }
}
