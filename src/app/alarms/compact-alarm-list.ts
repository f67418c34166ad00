import { ChangeDetectionStrategy, Component, ElementRef, computed, inject, input, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import type { ActiveAlarm } from '../../../shared/alarms/alarm-api';
import { hasRole, type Role } from '../../../shared/auth/roles';
import { errorText } from '../api/error-text';
import { keepFocusOnAlarm } from './alarm-focus';
import { PRIORITY_LOOK, awaitsAcknowledgement, levelWords, stateWords } from './alarm-look';
import { AlarmRequests } from './alarm-requests';
import { channelLabel, channelQuantity } from './channel-text';

/**
 * A compact list of active alarms, one line each, with Acknowledge for operators. After an
 * acknowledgement the keyboard focus stays on that alarm's line (its button goes away), so a
 * keyboard user does not lose their place. Counts say what they count: all active alarms, of
 * which so many are not yet acknowledged.
 */
@Component({
  selector: 'tw-compact-alarm-list',
  imports: [MatButtonModule, MatIconModule, RouterLink],
  templateUrl: './compact-alarm-list.html',
  styleUrl: './compact-alarm-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CompactAlarmList {
  private readonly requests = inject(AlarmRequests);
  private readonly host = inject<ElementRef<HTMLElement>>(ElementRef);

  readonly alarms = input.required<readonly ActiveAlarm[]>();
  readonly role = input<Role | null>(null);
  /** Heading text, e.g. "Active alarms" or "Alarms of coil pair X". */
  readonly heading = input.required<string>();

  protected readonly unacknowledged = computed(() => this.alarms().filter((a) => awaitsAcknowledgement(a.state)).length);
  protected readonly canAcknowledge = computed(() => {
    const role = this.role();
    return role !== null && hasRole(role, 'operator');
  });
  protected readonly problem = signal<string | null>(null);
  protected readonly priorityLook = PRIORITY_LOOK;
  protected readonly channelLabel = channelLabel;
  protected readonly channelQuantity = channelQuantity;
  protected readonly levelWords = levelWords;
  protected readonly stateWords = stateWords;
  protected readonly awaitsAcknowledgement = awaitsAcknowledgement;

  protected async acknowledge(alarm: ActiveAlarm): Promise<void> {
    this.problem.set(null);
    // The button disappears with the new state; keep the keyboard on the same alarm's line.
    await keepFocusOnAlarm(this.host.nativeElement, alarm.id, async () => {
      try {
        await this.requests.acknowledge(alarm.id);
      } catch (err) {
        this.problem.set(`${alarm.id} was not acknowledged: ${errorText(err)}`);
      }
    });
  }
}
