import { ChangeDetectionStrategy, Component } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';

/** The cautions that belong beside the software interlock (product brief, "Cautions shown in the product"). */
@Component({
  selector: 'tw-interlock-cautions',
  imports: [MatIconModule],
  template: `
    <h2 id="cautions-title"><mat-icon aria-hidden="true">health_and_safety</mat-icon> Cautions</h2>
    <ul aria-labelledby="cautions-title">
      <li>
        <strong>This interlock is supervisory software and can fail</strong> — a stopped server, a lost network link or
        a fault in Tiltwatch itself leaves it silent. It is a second line, never the only one.
      </li>
      <li>
        The apparatus must keep its own <strong>hardware, safety-rated interlocks</strong> on coil temperature, coolant
        flow and over-current. Tiltwatch shows their state but never resets them remotely: they are reset at the
        controller, by someone standing at it.
      </li>
      <li>
        High-current coils <strong>store inductive energy and get hot</strong>. Let the currents ramp to zero and the
        windings and leads cool before touching them or opening the cooling circuit.
      </li>
      <li>
        The field near large coils can exceed <strong>0.5&nbsp;mT</strong>, the level at which people with active
        implants (pacemakers, defibrillators, neurostimulators) need an assessment (ICNIRP&nbsp;2009). Keep that zone
        marked.
      </li>
      <li>Follow the local electrical and magnetic-field safety rules and the lab's licensed practice.</li>
    </ul>
  `,
  styles: `
    :host {
      display: block;
    }
    h2 {
      display: flex;
      align-items: center;
      gap: 8px;
      font: var(--mat-sys-title-medium);
      margin: 0 0 8px;
    }
    ul {
      margin: 0;
      padding-left: 20px;
    }
    li {
      margin: 4px 0;
      max-width: 110ch;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InterlockCautions {}
