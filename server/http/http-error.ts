/**
 * An error with an HTTP status and a message for the client that says what to fix. Thrown
 * anywhere below a route; the error funnel (error-handler.ts) turns it into a JSON response.
 */
export class HttpError extends Error {
  /**
   * @param field path of the form field the message is about (e.g. `limit`,
   *   `trips.currentHighA`), sent as `field` so the screen shows the message next to it.
   */
  constructor(
    readonly status: number,
    message: string,
    readonly field: string | null = null,
  ) {
    super(message);
    this.name = 'HttpError';
  }
}
