import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { hasRole, type Role } from '../../../shared/auth/roles';
import { errorText } from '../api/error-text';
import { PRIORITY_LOOK, levelWords } from './alarm-look';
import type { AlarmLimitRecord } from './alarm-records';
import { channelLabel, channelQuantity } from './channel-text';
import { LevelSetPanel } from '../levels/level-set-panel';
import { LimitDialog } from './limit-dialog';

/**
 * The alarm limits with the rationale a lead wrote for each: cause, consequence of doing
 * nothing, what the operator does, time to respond. The lead may edit a limit (with a reason).
 */
@Component({
  selector: 'tw-alarm-limits',
  imports: [LevelSetPanel, MatButtonModule, MatIconModule],
  templateUrl: './alarm-limits.html',
  styleUrl: './alarm-tables.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AlarmLimits {
  private readonly dialog = inject(MatDialog);
  readonly role = input<Role | null>(null);

  protected readonly limits = httpResource<{ limits: AlarmLimitRecord[] }>(() => '/api/alarm-limits');
  protected readonly error = computed(() => (this.limits.error() ? errorText(this.limits.error()) : null));
  protected readonly canEdit = computed(() => {
    const role = this.role();
    return role !== null && hasRole(role, 'lead');
  });

  protected readonly priorityLook = PRIORITY_LOOK;
  protected readonly channelLabel = channelLabel;
  protected readonly channelQuantity = channelQuantity;

  protected readonly levelWords = levelWords;

  protected seconds(ms: number): string {
    return `${(ms / 1000).toFixed(1)}\u00a0s`;
  }

  protected edit(limit: AlarmLimitRecord): void {
    this.dialog
      .open<LimitDialog, AlarmLimitRecord, true>(LimitDialog, { data: limit, width: '640px', autoFocus: 'first-tabbable' })
      .afterClosed()
      .subscribe((saved) => {
        if (saved) this.limits.reload();
      });
  }
}
