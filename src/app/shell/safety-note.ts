import { ChangeDetectionStrategy, Component } from '@angular/core';

/** The standing safety caution, shown on every screen (product brief, "Cautions shown in the product"). */
@Component({
  selector: 'tw-safety-note',
  template: `
    <p>
      <strong>Safety.</strong> Tiltwatch supervises; its software interlock can fail and never replaces the
      apparatus's hardware, safety-rated interlocks. Coils store inductive energy and get hot. Fields near large
      coils can exceed 0.5&nbsp;mT, the level at which active implants need assessment (ICNIRP&nbsp;2009).
      Follow local electrical and magnetic-field safety rules.
    </p>
  `,
  styles: `
    :host {
      display: block;
      font: var(--mat-sys-body-small);
      color: var(--mat-sys-on-surface-variant);
    }
    p {
      margin: 0;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SafetyNote {}
