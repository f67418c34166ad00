import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { LiveState } from '../../../shared/live/live-state';

interface StatusItem {
  icon: string;
  text: string;
  /** Abnormal items get colour as well as their icon and words. */
  severity: 'plain' | 'alarm' | 'trip';
}

/** What the server knows of the controller: online, mode, hardware trip, software hold. */
@Component({
  selector: 'tw-controller-status',
  imports: [MatIconModule],
  template: `
    <ul aria-label="Controller">
      @for (item of items(); track item.text) {
        <li [attr.data-severity]="item.severity">
          <mat-icon aria-hidden="true" inline>{{ item.icon }}</mat-icon>{{ item.text }}
        </li>
      }
    </ul>
  `,
  styleUrl: './controller-status.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { '[class.stale]': 'stale()' },
})
export class ControllerStatus {
  readonly controller = input<LiveState['controller'] | null>(null);
  /** Marks the state as no longer current. */
  readonly stale = input(false);

  protected readonly items = computed<StatusItem[]>(() => {
    const c = this.controller();
    if (!c) return [{ icon: 'help', text: 'Controller state not known yet', severity: 'plain' }];
    const items: StatusItem[] = [
      c.online
        ? { icon: 'memory', text: 'Controller online', severity: 'plain' }
        : { icon: 'power_off', text: 'Controller offline', severity: 'trip' },
    ];
    if (c.mode === 'demo') items.push({ icon: 'autoplay', text: 'Demo program running', severity: 'plain' });
    if (c.mode === 'remote') items.push({ icon: 'settings_remote', text: 'Following Tiltwatch setpoints', severity: 'plain' });
    if (c.hardwareTripped) {
      items.push({ icon: 'report', text: `Hardware trip${c.hardwareTripCause ? `: ${c.hardwareTripCause}` : ''} (reset at the apparatus)`, severity: 'trip' });
    }
    if (c.softwareHold) items.push({ icon: 'pan_tool', text: 'Software interlock holding currents at zero', severity: 'trip' });
    if (c.tripped && !c.hardwareTripped && !c.softwareHold) items.push({ icon: 'report', text: 'Tripped', severity: 'trip' });
    if (!c.tripped && !c.hardwareTripped && !c.softwareHold) items.push({ icon: 'check_circle', text: 'No trip', severity: 'plain' });
    return items;
  });
}
