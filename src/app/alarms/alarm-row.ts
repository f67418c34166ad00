import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import type { AlarmPriority } from '../../../shared/alarms/alarm-api';
import type { Role } from '../../../shared/auth/roles';
import { formatLocalDateTime } from '../readout/format-quantity';
import { ACTION_LOOK, PRIORITY_LOOK, actionsFor, levelWords, stateWords, type AlarmAction } from './alarm-look';
import { channelLabel, channelQuantity } from './channel-text';

/** What a row needs of an alarm (an active alarm or one from the full list). */
export interface ListedAlarm {
  id: string;
  channel: string;
  priority: AlarmPriority;
  state: string;
  /** Present value, live. */
  value: number | null;
  /** Value when the alarm was raised; null or absent while normal. */
  valueAtRaise?: number | null;
  limit: number;
  /** ISO 8601 UTC; null while normal. */
  raisedAt: string | null;
  /** When the condition began (before the on-delay), ISO 8601 UTC. */
  conditionSince?: string | null;
  level?: string;
  firstOutOf?: string;
  /** Extra line under the state, e.g. who shelved it until when. */
  note?: string;
}

export interface AlarmActionRequest {
  alarm: ListedAlarm;
  action: AlarmAction;
}

/**
 * One alarm: priority as shape and word, ISA-18.2 state in words, the present value (live) and
 * the value at the raise apart, the limit with units, raised time in local time, and the actions
 * the signed-in role may take (none for a viewer).
 */
@Component({
  selector: 'tw-alarm-row',
  imports: [MatButtonModule, MatIconModule],
  templateUrl: './alarm-row.html',
  styleUrl: './alarm-row.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AlarmRow {
  readonly alarm = input.required<ListedAlarm>();
  /** Marks the alarm as the first out of a group. */
  readonly root = input(false);
  readonly role = input<Role | null>(null);
  readonly act = output<AlarmActionRequest>();

  protected readonly actions = computed(() => actionsFor(this.alarm().state, this.role()));
  protected readonly raised = computed(() => {
    const at = this.alarm().raisedAt;
    return at === null ? '—' : formatLocalDateTime(Date.parse(at));
  });

  protected readonly priorityLook = PRIORITY_LOOK;
  protected readonly actionLook = ACTION_LOOK;
  protected readonly stateWords = stateWords;
  protected readonly levelWords = levelWords;
  protected readonly channelLabel = channelLabel;
  protected readonly channelQuantity = channelQuantity;
}
