import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialogModule } from '@angular/material/dialog';
import type { DialogSubmission } from './dialog-submission';
import { FormProblem } from './form-problem';

/**
 * The foot of a form dialog: what keeps the form from going through, then Cancel and the
 * confirming submit button, disabled while the request is on its way.
 */
@Component({
  selector: 'tw-dialog-footer',
  imports: [FormProblem, MatButtonModule, MatDialogModule],
  template: `
    <tw-form-problem [text]="submission().problem()" />
    <mat-dialog-actions align="end">
      <button mat-button type="button" mat-dialog-close>Cancel</button>
      <button mat-flat-button type="submit" [disabled]="submission().sending()">{{ confirm() }}</button>
    </mat-dialog-actions>
  `,
  styles: `
    :host {
      display: block;
      padding: 0 24px;
    }
    mat-dialog-actions {
      padding-inline: 0;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DialogFooter {
  readonly submission = input.required<DialogSubmission>();
  /** Label of the confirming button, e.g. "Change role". */
  readonly confirm = input.required<string>();
}
