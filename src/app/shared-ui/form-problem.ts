import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';

/** What keeps a form from going through, under the form, announced to screen readers. */
@Component({
  selector: 'tw-form-problem',
  imports: [MatIconModule],
  template: `
    @if (text(); as t) {
      <p class="problem" role="alert"><mat-icon aria-hidden="true" inline>error</mat-icon> {{ t }}</p>
    }
  `,
  styles: `
    .problem {
      margin: 8px 0 0;
      color: var(--tw-trip-text);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FormProblem {
  readonly text = input<string | null>(null);
}
