import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import type { AlarmPriority } from '../../../shared/alarms/alarm-api';
import { fieldMessage, markField, placeServerError } from '../api/field-errors';
import { PRIORITY_LOOK } from './alarm-look';
import type { AlarmLimitChanges, AlarmLimitRecord } from './alarm-records';
import { AlarmRequests } from './alarm-requests';
import { channelLabel, channelUnit } from './channel-text';
import { MAX_REASON_CHARS } from '../shared-ui/reason-dialog';

const num = (value: number) => new FormControl<number | null>(value);
const text = (value: string) => new FormControl(value, { nonNullable: true });

/**
 * A lead's edit of one alarm limit and its rationale. Sends it with the required reason;
 * the server validates the whole limit set and its refusal is shown as it says it.
 */
@Component({
  selector: 'tw-limit-dialog',
  imports: [MatButtonModule, MatCheckboxModule, MatDialogModule, MatFormFieldModule, MatIconModule, MatInputModule, MatSelectModule, ReactiveFormsModule],
  templateUrl: './limit-dialog.html',
  styleUrl: './limit-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LimitDialog {
  protected readonly limit = inject<AlarmLimitRecord>(MAT_DIALOG_DATA);
  private readonly ref = inject<MatDialogRef<LimitDialog, true>>(MatDialogRef);
  private readonly requests = inject(AlarmRequests);

  protected readonly unit = channelUnit(this.limit.channel);
  protected readonly title = `${channelLabel(this.limit.channel)} — ${this.limit.id}`;
  protected readonly priorities = (Object.keys(PRIORITY_LOOK) as AlarmPriority[]).map((p) => ({ value: p, label: PRIORITY_LOOK[p].label }));
  protected readonly maxReason = MAX_REASON_CHARS;

  protected readonly form = new FormGroup({
    limit: num(this.limit.limit),
    deadband: num(this.limit.deadband),
    onDelayMs: num(this.limit.onDelayMs),
    offDelayMs: num(this.limit.offDelayMs),
    priority: new FormControl<AlarmPriority>(this.limit.priority, { nonNullable: true }),
    latching: new FormControl(this.limit.latching, { nonNullable: true }),
    cause: text(this.limit.rationale.cause),
    consequence: text(this.limit.rationale.consequence),
    action: text(this.limit.rationale.action),
    respondWithinMin: num(this.limit.rationale.respondWithinMin),
    reason: text(''),
  });
  protected readonly problem = signal<string | null>(null);
  protected readonly sending = signal(false);
  protected readonly fieldMessage = fieldMessage;

  /** Server field paths → the controls that show their refusals. */
  private readonly fieldControls = {
    limit: this.form.controls.limit,
    deadband: this.form.controls.deadband,
    onDelayMs: this.form.controls.onDelayMs,
    offDelayMs: this.form.controls.offDelayMs,
    priority: this.form.controls.priority,
    latching: this.form.controls.latching,
    'rationale.cause': this.form.controls.cause,
    'rationale.consequence': this.form.controls.consequence,
    'rationale.action': this.form.controls.action,
    'rationale.respondWithinMin': this.form.controls.respondWithinMin,
    reason: this.form.controls.reason,
  };

  protected async save(): Promise<void> {
    const v = this.form.getRawValue();
    const c = this.form.controls;
    const numbers = [c.limit, c.deadband, c.onDelayMs, c.offDelayMs, c.respondWithinMin];
    const missing = numbers.filter((control) => control.value === null || !Number.isFinite(control.value));
    for (const control of missing) markField(control, 'Enter a number');
    if (v.reason.trim() === '') markField(c.reason, 'Write a reason: it goes to the audit trail with the old and new values.');
    if (missing.length || v.reason.trim() === '') {
      this.problem.set(null);
      return;
    }
    const changes: AlarmLimitChanges = {
      level: this.limit.level,
      limit: v.limit!,
      deadband: v.deadband!,
      onDelayMs: v.onDelayMs!,
      offDelayMs: v.offDelayMs!,
      priority: v.priority,
      latching: v.latching,
      suppressDuringRamp: this.limit.suppressDuringRamp ?? false,
      rationale: { cause: v.cause, consequence: v.consequence, action: v.action, respondWithinMin: v.respondWithinMin! },
    };
    this.problem.set(null);
    this.sending.set(true);
    try {
      await this.requests.updateLimit(this.limit.id, changes, v.reason.trim());
      this.ref.close(true);
    } catch (err) {
      this.problem.set(placeServerError(err, this.fieldControls));
    } finally {
      this.sending.set(false);
    }
  }
}
