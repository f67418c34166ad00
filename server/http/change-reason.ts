import { HttpError } from './http-error.js';

/** Longest reason accepted for a lead's change; it goes into the audit trail. */
export const MAX_CHANGE_REASON_CHARS = 500;
/** How the edit forms label the reason field. */
export const CHANGE_REASON_LABEL = 'Reason for this change';

/**
 * The trimmed reason of a lead's change, or a 400 naming the field as the forms label it
 * (`field: "reason"`), so the screen shows the message beside it.
 */
export function changeReason(value: unknown, what: string): string {
  const text = typeof value === 'string' ? value.trim() : '';
  if (text === '') throw new HttpError(400, `${CHANGE_REASON_LABEL} is required: say why ${what} changes (it goes into the audit trail)`, 'reason');
  if (text.length > MAX_CHANGE_REASON_CHARS) throw new HttpError(400, `${CHANGE_REASON_LABEL} must be at most ${MAX_CHANGE_REASON_CHARS} characters`, 'reason');
  return text;
}
