import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { PASSWORD_MAX_LENGTH, PASSWORD_MIN_LENGTH } from '../../../shared/auth/user-api';
import { fieldMessage } from '../api/field-errors';
import { Session } from '../auth/session';
import { DialogSubmission } from '../shared-ui/dialog-submission';
import { DialogFooter } from '../shared-ui/dialog-footer';

/**
 * Changes the signed-in person's own password: the current one, the new one twice. Closes
 * only when the server accepted it; this browser stays signed in with a fresh token, every
 * other sign-in of the account ends.
 */
@Component({
  selector: 'tw-change-password-dialog',
  imports: [DialogFooter, MatDialogModule, MatFormFieldModule, MatInputModule, ReactiveFormsModule],
  template: `
    <h2 mat-dialog-title>Change your password</h2>
    <form [formGroup]="form" (ngSubmit)="submit()" novalidate>
      <mat-dialog-content>
        <p class="subject note">Signed in as {{ email }}</p>
        <mat-form-field appearance="outline">
          <mat-label>Current password</mat-label>
          <input matInput type="password" formControlName="current" autocomplete="current-password" required />
          <mat-error>{{ fieldMessage(form.controls.current) }}</mat-error>
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>New password</mat-label>
          <input matInput type="password" formControlName="next" autocomplete="new-password" required [attr.maxlength]="maxLength" />
          <mat-hint>At least {{ minLength }} characters; a few unrelated words work well</mat-hint>
          <mat-error>{{ fieldMessage(form.controls.next) }}</mat-error>
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>New password again</mat-label>
          <input matInput type="password" formControlName="repeat" autocomplete="new-password" required />
        </mat-form-field>
        <p class="subject note">Your other sign-ins (other browsers, other computers) end when the password changes.</p>
      </mat-dialog-content>
      <tw-dialog-footer [submission]="submission" confirm="Change password" />
    </form>
  `,
  styleUrl: '../shared-ui/dialog-form.scss',
  styles: `
    .note {
      color: var(--mat-sys-on-surface-variant);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ChangePasswordDialog {
  private readonly session = inject(Session);
  private readonly ref = inject<MatDialogRef<ChangePasswordDialog, true>>(MatDialogRef);

  protected readonly email = this.session.user()?.email ?? '';
  protected readonly minLength = PASSWORD_MIN_LENGTH;
  protected readonly maxLength = PASSWORD_MAX_LENGTH;
  protected readonly form = new FormGroup({
    current: new FormControl('', { nonNullable: true }),
    next: new FormControl('', { nonNullable: true }),
    repeat: new FormControl('', { nonNullable: true }),
  });
  protected readonly submission = new DialogSubmission({ currentPassword: this.form.controls.current, newPassword: this.form.controls.next });
  protected readonly fieldMessage = fieldMessage;

  protected async submit(): Promise<void> {
    const { current, next, repeat } = this.form.getRawValue();
    if (current === '') return this.submission.refuse('Enter your current password.');
    if (next.length < PASSWORD_MIN_LENGTH) return this.submission.refuse(`The new password needs at least ${PASSWORD_MIN_LENGTH} characters.`);
    if (next !== repeat) return this.submission.refuse('The two new passwords differ; type the same one twice.');
    if (next === current) return this.submission.refuse('The new password must differ from the current one.');
    if (await this.submission.send(() => this.session.changePassword(current, next))) this.ref.close(true);
  }
}
