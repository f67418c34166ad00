import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, ElementRef, computed, effect, inject, signal, untracked } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatTabsModule } from '@angular/material/tabs';
import { firstValueFrom } from 'rxjs';
import { errorText } from '../api/error-text';
import { Session } from '../auth/session';
import { LiveFeed } from '../feed/live-feed';
import type { AlarmHealthReport, AlarmListItem } from '../../../shared/alarms/alarm-api';
import { formatLocalDateTime } from '../readout/format-quantity';
import { keepFocusOnAlarm } from './alarm-focus';
import { AlarmHistory } from './alarm-history';
import { AlarmLimits } from './alarm-limits';
import { AlarmList } from './alarm-list';
import type { AlarmActionRequest, ListedAlarm } from './alarm-row';
import { AlarmRequests } from './alarm-requests';
import { AlarmSystemHealth } from './alarm-system-health';
import { channelLabel, channelQuantity } from './channel-text';
import { ReasonDialog, type ReasonDialogData } from '../shared-ui/reason-dialog';

/** Longest shelving offered, minutes (one shift; the server enforces its own maximum). */
export const MAX_SHELVE_MINUTES = 480;

/** How often the alarms set aside are read again while the page is open, ms. */
const SET_ASIDE_REFRESH_MS = 1000;

const ANNUNCIATED = new Set(['unacknowledged', 'acknowledged', 'returned-unacknowledged', 'latched']);
const SET_ASIDE = new Set(['shelved', 'suppressed', 'out-of-service']);
const PRIORITY_RANK: Record<string, number> = { high: 0, medium: 1, low: 2 };

/**
 * The Alarms page: the active alarms (first-out groups folded), the alarms set aside
 * (shelved, suppressed by design, out of service), the history, the limits with their
 * rationale, and the health of the alarm system itself.
 */
@Component({
  selector: 'tw-alarms-page',
  imports: [AlarmHistory, AlarmLimits, AlarmList, AlarmSystemHealth, MatButtonModule, MatIconModule, MatTabsModule],
  templateUrl: './alarms-page.html',
  styleUrl: './alarms-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AlarmsPage {
  private readonly feed = inject(LiveFeed);
  private readonly requests = inject(AlarmRequests);
  private readonly dialog = inject(MatDialog);
  private readonly host = inject<ElementRef<HTMLElement>>(ElementRef);
  protected readonly role = inject(Session).role;

  /** Every alarm with its state; reloaded whenever the server pushes a change and after each request. */
  protected readonly all = httpResource<{ alarms: AlarmListItem[] }>(() => '/api/alarms?state=all');
  protected readonly allError = computed(() => (this.all.error() ? errorText(this.all.error()) : null));
  protected readonly health = httpResource<AlarmHealthReport>(() => '/api/alarms/health');
  protected readonly healthError = computed(() => (this.health.error() ? errorText(this.health.error()) : null));

  /** The pushed list when there is one (it is newest), else the fetched one. */
  protected readonly active = computed<ListedAlarm[]>(() => {
    const pushed = this.feed.alarms()?.active;
    if (pushed) return pushed;
    const fetched = this.all.hasValue() ? this.all.value().alarms : [];
    return fetched
      .filter((a) => ANNUNCIATED.has(a.state))
      .sort(
        (a, b) =>
          PRIORITY_RANK[a.priority] - PRIORITY_RANK[b.priority] ||
          Date.parse(a.conditionSince ?? a.raisedAt ?? '') - Date.parse(b.conditionSince ?? b.raisedAt ?? ''),
      );
  });

  protected readonly setAside = computed<ListedAlarm[]>(() => {
    const fetched = this.all.hasValue() ? this.all.value().alarms : [];
    return fetched.filter((a) => SET_ASIDE.has(a.state)).map((a) => ({ ...a, note: a.shelf ? shelfNote(a.shelf) : undefined }));
  });

  /** Why the last request failed, shown above the list until the next one. */
  protected readonly problem = signal<string | null>(null);

  constructor() {
    // A new revision is a change of state (raise, clear, action): read the lists again. Pushes
    // between revisions only carry present values, which the active list takes as they come.
    effect(() => {
      if (this.feed.alarmsRevision() === null) return;
      untracked(() => {
        this.all.reload();
        this.health.reload();
      });
    });
    // The alarms set aside are not pushed: their present values are read again every second.
    let lastRead = Date.now();
    effect(() => {
      const now = this.feed.clock();
      if (now - lastRead < SET_ASIDE_REFRESH_MS) return;
      lastRead = now;
      untracked(() => {
        if (!this.all.isLoading()) this.all.reload();
      });
    });
  }

  protected async perform({ alarm, action }: AlarmActionRequest): Promise<void> {
    this.problem.set(null);
    const subject = `${channelLabel(alarm.channel)} (${alarm.id}): ${channelQuantity(alarm.channel, alarm.value)}, limit ${channelQuantity(alarm.channel, alarm.limit)}`;
    switch (action) {
      case 'acknowledge':
        return this.send(alarm.id, () => this.requests.acknowledge(alarm.id));
      case 'unshelve':
        return this.send(alarm.id, () => this.requests.unshelve(alarm.id, ''));
      case 'shelve':
        return this.ask(alarm.id, {
          title: 'Shelve alarm',
          subject: `${subject}. A shelved alarm is still evaluated and logged, but not shown to the shift.`,
          confirm: 'Shelve',
          maxMinutes: MAX_SHELVE_MINUTES,
          send: (reason, minutes) => this.requests.shelve(alarm.id, minutes ?? 0, reason),
        });
      case 'reset':
        return this.ask(alarm.id, {
          title: 'Reset latched alarm',
          subject: `${subject}. The condition has cleared; the reset also acknowledges it.`,
          confirm: 'Reset',
          send: (reason) => this.requests.reset(alarm.id, reason),
        });
      case 'out-of-service':
        return this.ask(alarm.id, {
          title: 'Take alarm out of service',
          subject: `${subject}. It will not be evaluated at all until returned to service.`,
          confirm: 'Take out of service',
          send: (reason) => this.requests.setOutOfService(alarm.id, true, reason),
        });
      case 'return-to-service':
        return this.ask(alarm.id, {
          title: 'Return alarm to service',
          subject,
          confirm: 'Return to service',
          send: (reason) => this.requests.setOutOfService(alarm.id, false, reason),
        });
    }
  }

  /** Sends a request without a dialog; the keyboard stays on the alarm's row while its buttons change. */
  private async send(alarmId: string, request: () => Promise<unknown>): Promise<void> {
    await keepFocusOnAlarm(this.host.nativeElement, alarmId, async () => {
      try {
        await request();
      } catch (err) {
        this.problem.set(errorText(err));
      }
      this.all.reload();
    });
  }

  /** Asks for the reason in a dialog; on closing, the keyboard comes back to the alarm's row. */
  private ask(alarmId: string, data: ReasonDialogData): Promise<void> {
    return keepFocusOnAlarm(this.host.nativeElement, alarmId, async () => {
      const ref = this.dialog.open<ReasonDialog, ReasonDialogData, true>(ReasonDialog, { data, width: '480px', autoFocus: 'first-tabbable' });
      if (await firstValueFrom(ref.afterClosed())) this.all.reload();
    });
  }
}

function shelfNote(shelf: NonNullable<AlarmListItem['shelf']>): string {
  return `by ${shelf.by} until ${formatLocalDateTime(Date.parse(shelf.until))}: ${shelf.reason}`;
}
