import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { fieldMessage } from '../api/field-errors';
import { DialogSubmission } from './dialog-submission';
import { DialogFooter } from './dialog-footer';

/** Longest reason the server accepts, characters. */
export const MAX_REASON_CHARS = 500;

export interface ReasonDialogData {
  /** "Shelve alarm", "Reset latched alarm", … */
  title: string;
  /** The alarm in words, shown under the title. */
  subject: string;
  /** Label of the confirming button ("Shelve"). */
  confirm: string;
  /** Ask for a number of minutes as well, from 1 to this maximum (shelving). */
  maxMinutes?: number;
  /** Sends the request; a rejection's text is shown in the dialog, which stays open. */
  send: (reason: string, minutes: number | null) => Promise<unknown>;
}

/**
 * Asks for the reason an alarm request needs (and the shelving time), sends the request and
 * closes only when the server accepted it. Nothing is sent without a reason.
 */
@Component({
  selector: 'tw-reason-dialog',
  imports: [DialogFooter, MatDialogModule, MatFormFieldModule, MatInputModule, ReactiveFormsModule],
  template: `
    <h2 mat-dialog-title>{{ data.title }}</h2>
    <form [formGroup]="form" (ngSubmit)="submit()" novalidate>
      <mat-dialog-content>
        <p class="subject">{{ data.subject }}</p>
        @if (data.maxMinutes; as max) {
          <mat-form-field appearance="outline">
            <mat-label>Minutes</mat-label>
            <input matInput type="number" formControlName="minutes" min="1" [max]="max" step="1" required />
            <mat-hint>1 to {{ max }} min; the alarm returns by itself afterwards</mat-hint>
            <mat-error>{{ fieldMessage(form.controls.minutes) }}</mat-error>
          </mat-form-field>
        }
        <mat-form-field appearance="outline">
          <mat-label>Reason</mat-label>
          <textarea matInput formControlName="reason" rows="3" required [attr.maxlength]="maxReason"></textarea>
          <mat-hint>Written to the audit trail with your name</mat-hint>
          <mat-error>{{ fieldMessage(form.controls.reason) }}</mat-error>
        </mat-form-field>
      </mat-dialog-content>
      <tw-dialog-footer [submission]="submission" [confirm]="data.confirm" />
    </form>
  `,
  styleUrl: './dialog-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReasonDialog {
  protected readonly data = inject<ReasonDialogData>(MAT_DIALOG_DATA);
  private readonly ref = inject<MatDialogRef<ReasonDialog, true>>(MatDialogRef);

  protected readonly maxReason = MAX_REASON_CHARS;
  protected readonly form = new FormGroup({
    minutes: new FormControl<number | null>(this.data.maxMinutes ? Math.min(60, this.data.maxMinutes) : null),
    reason: new FormControl('', { nonNullable: true }),
  });
  protected readonly submission = new DialogSubmission(this.form.controls);
  protected readonly fieldMessage = fieldMessage;

  protected async submit(): Promise<void> {
    const reason = this.form.controls.reason.value.trim();
    const minutes = this.form.controls.minutes.value;
    const max = this.data.maxMinutes;
    if (max !== undefined && (minutes === null || !Number.isFinite(minutes) || minutes < 1 || minutes > max)) {
      return this.submission.refuse(`Enter a shelving time from 1 to ${max} minutes.`);
    }
    if (reason === '') return this.submission.refuse('Write a reason: say why, in a few words, for the audit trail and the next shift.');
    if (await this.submission.send(() => this.data.send(reason, max !== undefined ? minutes : null))) this.ref.close(true);
  }
}
