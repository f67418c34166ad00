import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { ROLES, type Role } from '../../../shared/auth/roles';
import type { UserAccount } from '../../../shared/auth/user-api';
import { fieldMessage } from '../api/field-errors';
import { DialogSubmission } from '../shared-ui/dialog-submission';
import { DialogFooter } from '../shared-ui/dialog-footer';
import { ROLE_MEANING } from './role-text';

export interface RoleDialogData {
  user: UserAccount;
  /** Sends the change; a rejection's text is shown in the dialog, which stays open. */
  send: (role: Role, reason: string) => Promise<unknown>;
}

/** Changes an account's role with a reason for the audit trail; the account's sign-ins end. */
@Component({
  selector: 'tw-role-dialog',
  imports: [DialogFooter, MatDialogModule, MatFormFieldModule, MatInputModule, MatSelectModule, ReactiveFormsModule],
  template: `
    <h2 mat-dialog-title>Change role</h2>
    <form [formGroup]="form" (ngSubmit)="submit()" novalidate>
      <mat-dialog-content>
        <p class="subject">{{ data.user.email }} is {{ data.user.role }} now. The account's current sign-ins end with the change.</p>
        <mat-form-field appearance="outline">
          <mat-label>New role</mat-label>
          <mat-select formControlName="role">
            @for (role of roles; track role) {
              <mat-option [value]="role">{{ role }} — {{ meaning[role] }}</mat-option>
            }
          </mat-select>
          <mat-error>{{ fieldMessage(form.controls.role) }}</mat-error>
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>Reason</mat-label>
          <textarea matInput formControlName="reason" rows="2" required maxlength="500"></textarea>
          <mat-hint>Written to the audit trail with your name</mat-hint>
          <mat-error>{{ fieldMessage(form.controls.reason) }}</mat-error>
        </mat-form-field>
      </mat-dialog-content>
      <tw-dialog-footer [submission]="submission" confirm="Change role" />
    </form>
  `,
  styleUrl: '../shared-ui/dialog-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RoleDialog {
  protected readonly data = inject<RoleDialogData>(MAT_DIALOG_DATA);
  private readonly ref = inject<MatDialogRef<RoleDialog, true>>(MatDialogRef);

  protected readonly roles = ROLES;
  protected readonly meaning = ROLE_MEANING;
  protected readonly form = new FormGroup({
    role: new FormControl<Role>(this.data.user.role, { nonNullable: true }),
    reason: new FormControl('', { nonNullable: true }),
  });
  protected readonly submission = new DialogSubmission(this.form.controls);
  protected readonly fieldMessage = fieldMessage;

  protected async submit(): Promise<void> {
    const { role, reason } = this.form.getRawValue();
    if (role === this.data.user.role) return this.submission.refuse(`Choose a role other than ${role}.`);
    if (reason.trim() === '') return this.submission.refuse('Write a reason: say why, in a few words, for the audit trail.');
    if (await this.submission.send(() => this.data.send(role, reason.trim()))) this.ref.close(true);
  }
}
