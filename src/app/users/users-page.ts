import { HttpClient, httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { firstValueFrom } from 'rxjs';
import type { Role } from '../../../shared/auth/roles';
import type { UserAccount } from '../../../shared/auth/user-api';
import { ReasonDialog, type ReasonDialogData } from '../shared-ui/reason-dialog';
import { errorText } from '../api/error-text';
import { Session } from '../auth/session';
import { formatLocalDateTime } from '../readout/format-quantity';
import { AddUserDialog } from './add-user-dialog';
import { RoleDialog, type RoleDialogData } from './role-dialog';
import { SignInSecurity } from './sign-in-security';

/**
 * Admin → Users: every account with its role and state; add an account, change a role,
 * disable or enable (each with a reason, audited; the account's sign-ins end), and the
 * sign-in security section (throttles in force, security events).
 */
@Component({
  selector: 'tw-users-page',
  imports: [MatButtonModule, MatIconModule, SignInSecurity],
  templateUrl: './users-page.html',
  styleUrl: './users-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class UsersPage {
  private readonly http = inject(HttpClient);
  private readonly dialog = inject(MatDialog);
  protected readonly me = inject(Session).user;

  protected readonly accounts = httpResource<{ users: UserAccount[] }>(() => '/api/admin/users');
  protected readonly error = computed(() => (this.accounts.error() ? errorText(this.accounts.error()) : null));
  protected readonly users = computed(() => (this.accounts.hasValue() ? this.accounts.value().users : []));

  protected added(iso: string): string {
    return formatLocalDateTime(Date.parse(iso));
  }

  protected add(): void {
    this.dialog
      .open(AddUserDialog, { width: '480px' })
      .afterClosed()
      .subscribe((done) => done && this.accounts.reload());
  }

  protected changeRole(user: UserAccount): void {
    const data: RoleDialogData = { user, send: (role: Role, reason: string) => this.patch(user, { role, reason }) };
    this.dialog
      .open(RoleDialog, { width: '480px', data })
      .afterClosed()
      .subscribe((done) => done && this.accounts.reload());
  }

  protected toggleDisabled(user: UserAccount): void {
    const disabling = !user.disabled;
    const data: ReasonDialogData = {
      title: disabling ? 'Disable account' : 'Enable account',
      subject: disabling
        ? `${user.email} can no longer sign in; its current sign-ins end at once.`
        : `${user.email} can sign in again with its password.`,
      confirm: disabling ? 'Disable' : 'Enable',
      send: (reason) => this.patch(user, { disabled: disabling, reason }),
    };
    this.dialog
      .open(ReasonDialog, { width: '480px', data })
      .afterClosed()
      .subscribe((done) => done && this.accounts.reload());
  }

  private patch(user: UserAccount, change: { role?: Role; disabled?: boolean; reason: string }): Promise<unknown> {
    return firstValueFrom(this.http.patch(`/api/admin/users/${user.id}`, change));
  }
}
