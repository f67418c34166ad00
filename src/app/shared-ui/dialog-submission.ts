import { signal } from '@angular/core';
import type { AbstractControl } from '@angular/forms';
import { placeServerError } from '../api/field-errors';

/**
 * How a form dialog sends its request: one at a time (`sending` disables the button), a
 * refusal shown next to the field the server names (`field` of the 400, mapped by `controls`)
 * or else under the form (`problem`), and success reported only once the server accepted it,
 * so the dialog closes then and only then.
 */
export class DialogSubmission {
  readonly problem = signal<string | null>(null);
  readonly sending = signal(false);

  /** @param controls the dialog's controls by the request field each one sends. */
  constructor(private readonly controls: Readonly<Record<string, AbstractControl | undefined>> = {}) {}

  /** Shows what to fix before anything is sent. */
  refuse(text: string): void {
    this.problem.set(text);
  }

  /** Sends `request`; true once the server accepted it, false after a refusal (shown). */
  async send(request: () => Promise<unknown>): Promise<boolean> {
    this.problem.set(null);
    this.sending.set(true);
    try {
      await request();
      return true;
    } catch (err) {
      this.problem.set(placeServerError(err, this.controls));
      return false;
    } finally {
      this.sending.set(false);
    }
  }
}
