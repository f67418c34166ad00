import type { AbstractControl } from '@angular/forms';
import { errorField, errorText } from './error-text';

/** The key of a message placed on a control; the template shows it in the field's mat-error. */
export const SERVER_ERROR = 'server';

/** Marks `control` with `message`, shown next to the field (mat-error) until it is edited. */
export function markField(control: AbstractControl, message: string): void {
  control.setErrors({ [SERVER_ERROR]: message });
  control.markAsTouched();
}

/** The message placed on a control, for its mat-error. */
export function fieldMessage(control: AbstractControl): string | null {
  const message: unknown = control.getError(SERVER_ERROR);
  return typeof message === 'string' ? message : null;
}

/**
 * Places a server refusal next to the field it names (`field` in the 400 body, mapped to a
 * control by `controls`); returns the message when no field matches, for a general note.
 */
export function placeServerError(err: unknown, controls: Readonly<Record<string, AbstractControl | undefined>>): string | null {
  const message = errorText(err);
  const field = errorField(err);
  const control = field === null ? undefined : controls[field];
  if (!control) return message;
  markField(control, message);
  return null;
}

/** Marks each control that `problems` names (by the same key as in `controls`) with its message: checks made before sending. */
export function markFields(controls: Readonly<Record<string, AbstractControl | undefined>>, problems: Readonly<Record<string, string | undefined>>): void {
  for (const [key, message] of Object.entries(problems)) {
    const control = controls[key];
    if (control && message !== undefined) markField(control, message);
  }
}
