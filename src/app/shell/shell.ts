import { BreakpointObserver } from '@angular/cdk/layout';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatListModule } from '@angular/material/list';
import { MatMenuModule } from '@angular/material/menu';
import { MatSidenavModule } from '@angular/material/sidenav';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatToolbarModule } from '@angular/material/toolbar';
import { RouterLink, RouterLinkActive, RouterOutlet } from '@angular/router';
import { map } from 'rxjs';
import { hasRole } from '../../../shared/auth/roles';
import { ChangePasswordDialog } from '../account/change-password-dialog';
import { awaitsAcknowledgement } from '../alarms/alarm-look';
import { Session } from '../auth/session';
import { LiveFeed } from '../feed/live-feed';
import { InterlockBanner } from '../interlocks/interlock-banner';
import { ReplayPresence } from '../replay/replay-presence';
import { ConnectionIndicator } from './connection-indicator';
import { SafetyNote } from './safety-note';

/** Widest screen on which the navigation folds away behind a menu button. */
const WIDE_SCREEN = '(min-width: 1000px)';

/** The signed-in frame: toolbar, navigation, connection state, the page, and the safety note. */
@Component({
  selector: 'tw-shell',
  imports: [
    ConnectionIndicator, InterlockBanner, MatButtonModule, MatIconModule, MatListModule, MatMenuModule, MatSidenavModule, MatToolbarModule,
    RouterLink, RouterLinkActive, RouterOutlet, SafetyNote,
  ],
  templateUrl: './shell.html',
  styleUrl: './shell.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Shell {
  private readonly session = inject(Session);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  protected readonly feed = inject(LiveFeed);

  protected readonly user = this.session.user;
  protected readonly isAdmin = computed(() => {
    const role = this.session.role();
    return role !== null && hasRole(role, 'admin');
  });
  /** Alarms waiting for an acknowledgement, for the badge on the Alarms entry; 0 shows nothing. */
  protected readonly unacknowledged = computed(() => this.feed.alarms()?.active.filter((a) => awaitsAcknowledgement(a.state)).length ?? 0);
  protected readonly wide = toSignal(inject(BreakpointObserver).observe(WIDE_SCREEN).pipe(map((state) => state.matches)), {
    initialValue: true,
  });
  /** While the Replay page shows, the toolbar and the interlock banner say they are about now. */
  protected readonly replaying = inject(ReplayPresence).active;
  protected readonly navToggled = signal(false);
  protected readonly navOpen = computed(() => this.wide() || this.navToggled());

  constructor() {
    this.feed.start();
    inject(DestroyRef).onDestroy(() => this.feed.stop());
    this.session.refreshUser().catch(() => undefined); // a 401 ends the session in the interceptor
  }

  /** Moves the keyboard focus past toolbar and navigation to the page itself. */
  protected skipToContent(event: Event): void {
    event.preventDefault();
    document.getElementById('tw-main')?.focus();
  }

  protected toggleNavigation(): void {
    this.navToggled.update((open) => !open);
  }

  protected closeNavigationOnNarrowScreen(): void {
    if (!this.wide()) this.navToggled.set(false);
  }

  protected changePassword(): void {
    this.dialog
      .open(ChangePasswordDialog, { width: '440px' })
      .afterClosed()
      .subscribe((changed) => {
        if (changed) this.snackBar.open('Password changed. Your other sign-ins have ended.', 'OK', { duration: 6000 });
      });
  }

  protected signOut(): void {
    this.feed.stop();
    this.session.signOut();
  }
}
