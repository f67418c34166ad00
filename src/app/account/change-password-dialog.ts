import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { PASSWORD_MAX_LENGTH, PASSWORD_MIN_LENGTH } from '../../../shared/auth/user-api';
import { errorText } from '../api/error-text';
import { Session } from '../auth/session';

/**
 * Changes the signed-in person's own password: the current one, the new one twice. Closes
 * only when the server accepted it; this browser stays signed in with a fresh token, every
 * other sign-in of the account ends.
 */
@Component({
  selector: 'tw-change-password-dialog',
  imports: [MatButtonModule, MatDialogModule, MatFormFieldModule, MatIconModule, MatInputModule, ReactiveFormsModule],
  template: `
    <h2 mat-dialog-title>Change your password</h2>
    <form [formGroup]="form" (ngSubmit)="submit()" novalidate>
      <mat-dialog-content>
        <p class="who">Signed in as {{ email }}</p>
        <mat-form-field appearance="outline">
          <mat-label>Current password</mat-label>
          <input matInput type="password" formControlName="current" autocomplete="current-password" required />
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>New password</mat-label>
          <input matInput type="password" formControlName="next" autocomplete="new-password" required [attr.maxlength]="maxLength" />
          <mat-hint>At least {{ minLength }} characters; a few unrelated words work well</mat-hint>
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>New password again</mat-label>
          <input matInput type="password" formControlName="repeat" autocomplete="new-password" required />
        </mat-form-field>
        <p class="note">Your other sign-ins (other browsers, other computers) end when the password changes.</p>
        @if (problem(); as text) {
          <p class="problem" role="alert"><mat-icon aria-hidden="true" inline>error</mat-icon> {{ text }}</p>
        }
      </mat-dialog-content>
      <mat-dialog-actions align="end">
        <button mat-button type="button" mat-dialog-close>Cancel</button>
        <button mat-flat-button type="submit" [disabled]="sending()">Change password</button>
      </mat-dialog-actions>
    </form>
  `,
  styles: `
    mat-form-field {
      display: block;
      width: 100%;
      margin-top: 8px;
    }
    .who,
    .note {
      margin: 0 0 8px;
      color: var(--mat-sys-on-surface-variant);
    }
    .problem {
      margin: 8px 0 0;
      color: var(--tw-trip-text);
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
  protected readonly problem = signal<string | null>(null);
  protected readonly sending = signal(false);

  protected async submit(): Promise<void> {
    const { current, next, repeat } = this.form.getRawValue();
    if (current === '') return this.problem.set('Enter your current password.');
    if (next.length < PASSWORD_MIN_LENGTH) return this.problem.set(`The new password needs at least ${PASSWORD_MIN_LENGTH} characters.`);
    if (next !== repeat) return this.problem.set('The two new passwords differ; type the same one twice.');
    if (next === current) return this.problem.set('The new password must differ from the current one.');
    this.problem.set(null);
    this.sending.set(true);
    try {
      await this.session.changePassword(current, next);
      this.ref.close(true);
    } catch (err) {
      this.problem.set(errorText(err));
    } finally {
      this.sending.set(false);
    }
  }
}
