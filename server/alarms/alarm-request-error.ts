/**
 * A refused alarm request (acknowledge, shelve, reset, out of service). `code` tells the HTTP
 * layer how to answer: `not-found` → 404, `invalid` → 400 (fix the request), `conflict` → 409
 * (the alarm's state does not allow it now). The message says what to do instead.
 */
export class AlarmRequestError extends Error {
  constructor(
    readonly code: 'not-found' | 'invalid' | 'conflict',
    message: string,
    /** Path of the request field the message is about (`reason`, `minutes`), for the form. */
    readonly field: string | null = null,
  ) {
    super(message);
    this.name = 'AlarmRequestError';
  }
}
