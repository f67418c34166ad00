/**
 * Unit-test helpers for forms of mat-form-fields: find a field by the label the screen shows,
 * type into its input, read the message it shows beside the input (its mat-error).
 */
import type { ComponentFixture } from '@angular/core/testing';

/** The mat-form-field whose label reads `label` (the `nth` of them, from 0). */
export function formField(host: HTMLElement, label: string, nth = 0): HTMLElement {
  const field = [...host.querySelectorAll<HTMLElement>('mat-form-field')].filter((f) => f.querySelector('mat-label')?.textContent?.trim() === label)[nth];
  if (!field) throw new Error(`no field labelled “${label}” (number ${nth + 1})`);
  return field;
}

/** Types `value` into the input of the field labelled `label`. */
export function typeInto(host: HTMLElement, label: string, value: string, nth = 0): void {
  const input = formField(host, label, nth).querySelector<HTMLInputElement | HTMLTextAreaElement>('input, textarea')!;
  input.value = value;
  input.dispatchEvent(new Event('input'));
}

/** The message shown beside the field labelled `label`, or null. */
export function fieldError(host: HTMLElement, label: string, nth = 0): string | null {
  return formField(host, label, nth).querySelector('mat-error')?.textContent?.trim() ?? null;
}

/** The text of the note under a form (role alert), or null. */
export function formAlert(host: HTMLElement): string | null {
  return host.querySelector('[role="alert"]')?.textContent?.trim() ?? null;
}

/** Lets an answered request's promise chain run, then the view update. */
export async function settle(fixture: ComponentFixture<unknown>): Promise<void> {
  await new Promise((resolve) => setTimeout(resolve, 0));
  await fixture.whenStable();
}
