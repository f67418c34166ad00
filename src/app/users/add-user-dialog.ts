import { HttpClient } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { firstValueFrom } from 'rxjs';
import { ROLES, type Role } from '../../../shared/auth/roles';
import { PASSWORD_MIN_LENGTH } from '../../../shared/auth/user-api';
import { fieldMessage } from '../api/field-errors';
import { DialogSubmission } from '../shared-ui/dialog-submission';
import { DialogFooter } from '../shared-ui/dialog-footer';
import { ROLE_MEANING } from './role-text';

/**
 * Adds an account: e-mail, role, a first password (given to the person, who changes it after
 * signing in) and an optional note for the audit trail. Closes when the server stored it.
 */
@Component({
  selector: 'tw-add-user-dialog',
  imports: [DialogFooter, MatDialogModule, MatFormFieldModule, MatInputModule, MatSelectModule, ReactiveFormsModule],
  template: `
    <h2 mat-dialog-title>Add an account</h2>
    <form [formGroup]="form" (ngSubmit)="submit()" novalidate>
      <mat-dialog-content>
        <mat-form-field appearance="outline">
          <mat-label>E-mail</mat-label>
          <input matInput type="email" formControlName="email" autocomplete="off" required />
          <mat-hint>The sign-in name</mat-hint>
          <mat-error>{{ fieldMessage(form.controls.email) }}</mat-error>
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>Role</mat-label>
          <mat-select formControlName="role">
            @for (role of roles; track role) {
              <mat-option [value]="role">{{ role }} — {{ meaning[role] }}</mat-option>
            }
          </mat-select>
          <mat-error>{{ fieldMessage(form.controls.role) }}</mat-error>
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>First password</mat-label>
          <input matInput type="password" formControlName="password" autocomplete="new-password" required />
          <mat-hint>At least {{ minLength }} characters; they change it after signing in</mat-hint>
          <mat-error>{{ fieldMessage(form.controls.password) }}</mat-error>
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>Note for the audit trail (optional)</mat-label>
          <input matInput formControlName="reason" maxlength="500" />
          <mat-error>{{ fieldMessage(form.controls.reason) }}</mat-error>
        </mat-form-field>
      </mat-dialog-content>
      <tw-dialog-footer [submission]="submission" confirm="Add account" />
    </form>
  `,
  styleUrl: '../shared-ui/dialog-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AddUserDialog {
  private readonly http = inject(HttpClient);
  private readonly ref = inject<MatDialogRef<AddUserDialog, true>>(MatDialogRef);

  protected readonly roles = ROLES;
  protected readonly meaning = ROLE_MEANING;
  protected readonly minLength = PASSWORD_MIN_LENGTH;
  protected readonly form = new FormGroup({
    email: new FormControl('', { nonNullable: true }),
    role: new FormControl<Role>('viewer', { nonNullable: true }),
    password: new FormControl('', { nonNullable: true }),
    reason: new FormControl('', { nonNullable: true }),
  });
  protected readonly submission = new DialogSubmission(this.form.controls);
  protected readonly fieldMessage = fieldMessage;

  protected async submit(): Promise<void> {
    const { email, role, password, reason } = this.form.getRawValue();
    if (email.trim() === '') return this.submission.refuse('Enter the e-mail address the person signs in with.');
    if (password.length < PASSWORD_MIN_LENGTH) return this.submission.refuse(`The first password needs at least ${PASSWORD_MIN_LENGTH} characters.`);
    const body = { email: email.trim(), role, password, ...(reason.trim() ? { reason: reason.trim() } : {}) };
    if (await this.submission.send(() => firstValueFrom(this.http.post('/api/admin/users', body)))) this.ref.close(true);
  }
}
