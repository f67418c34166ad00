import { HttpClient, httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { firstValueFrom } from 'rxjs';
import type { SecurityEvent, SecurityReport, SignInThrottleStatus } from '../../../shared/auth/user-api';
import { ReasonDialog, type ReasonDialogData } from '../shared-ui/reason-dialog';
import { errorText } from '../api/error-text';
import { formatLocalDateTime } from '../readout/format-quantity';
import { securityEventText } from './role-text';

/**
 * Sign-in security on the Users page: the sign-in throttles in force (an admin lifts one with a
 * reason, e.g. after the owner mistyped) and the security events of the last 24 h.
 */
@Component({
  selector: 'tw-sign-in-security',
  imports: [MatButtonModule, MatIconModule],
  templateUrl: './sign-in-security.html',
  styleUrl: './users-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SignInSecurity {
  private readonly http = inject(HttpClient);
  private readonly dialog = inject(MatDialog);

  protected readonly report = httpResource<SecurityReport>(() => '/api/admin/security?hours=24');
  protected readonly error = computed(() => (this.report.error() ? errorText(this.report.error()) : null));
  protected readonly throttles = computed(() => (this.report.hasValue() ? this.report.value().throttles : []));
  protected readonly events = computed(() => (this.report.hasValue() ? this.report.value().events : []));

  protected readonly eventText = securityEventText;

  protected time(iso: string): string {
    return formatLocalDateTime(Date.parse(iso));
  }

  protected detail(e: SecurityEvent): string {
    const d = e.detail ?? {};
    const parts: string[] = [];
    if (typeof d['failures'] === 'number') parts.push(`${d['failures']} failures`);
    if (typeof d['delayMs'] === 'number') parts.push(`next attempt after ${Math.round(d['delayMs'] / 1000)} s`);
    if (typeof d['windowMs'] === 'number') parts.push(`within ${Math.round(d['windowMs'] / 1000)} s`);
    if (typeof d['by'] === 'string') parts.push(`by ${d['by']}`);
    if (typeof d['reason'] === 'string') parts.push(`“${d['reason']}”`);
    return parts.join(', ');
  }

  protected lift(t: SignInThrottleStatus): void {
    const what = t.scope === 'account' ? `the account ${t.key}` : `the address ${t.key}`;
    const data: ReasonDialogData = {
      title: 'Lift sign-in delay',
      subject: `Sign-ins for ${what} are accepted again at once (${t.failures} failed attempts on record).`,
      confirm: 'Lift',
      send: (reason) =>
        firstValueFrom(this.http.post('/api/admin/security/lift', { ...(t.scope === 'account' ? { email: t.key } : { address: t.key }), reason })),
    };
    this.dialog
      .open(ReasonDialog, { width: '480px', data })
      .afterClosed()
      .subscribe((done) => done && this.report.reload());
  }
}
