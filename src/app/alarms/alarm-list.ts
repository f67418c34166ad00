import { ChangeDetectionStrategy, Component, computed, input, output, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import type { Role } from '../../../shared/auth/roles';
import { groupByFirstOut } from './alarm-grouping';
import { AlarmRow, type AlarmActionRequest, type ListedAlarm } from './alarm-row';

/**
 * A list of alarms in the order given. Alarms grouped under a first-out alarm are folded
 * beneath it with their count, so a cascade from one cause reads as one line.
 */
@Component({
  selector: 'tw-alarm-list',
  imports: [AlarmRow, MatButtonModule, MatIconModule],
  templateUrl: './alarm-list.html',
  styleUrl: './alarm-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AlarmList {
  readonly alarms = input.required<readonly ListedAlarm[]>();
  readonly role = input<Role | null>(null);
  /** Accessible name of the list ("Active alarms"). */
  readonly label = input.required<string>();
  readonly act = output<AlarmActionRequest>();

  protected readonly groups = computed(() => groupByFirstOut(this.alarms()));
  private readonly opened = signal<ReadonlySet<string>>(new Set());

  protected isOpen(id: string): boolean {
    return this.opened().has(id);
  }

  protected toggleGroup(id: string): void {
    this.opened.update((open) => {
      const next = new Set(open);
      if (!next.delete(id)) next.add(id);
      return next;
    });
  }
}
