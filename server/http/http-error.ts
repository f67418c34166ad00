/**
 * An error with an HTTP status and a message for the client that says what to fix. Thrown
 * anywhere below a route; the error funnel (error-handler.ts) turns it into a JSON response.
 */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    message: string,
  ) {
    super(message);
    this.name = 'HttpError';
  }
}
