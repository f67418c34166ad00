import { HttpError } from '../http/http-error.js';

/** A failed read of stored telemetry as the 503 a history or chart request answers with. */
export function storageReadError(error: unknown): HttpError {
  return new HttpError(503, `Stored telemetry cannot be read right now (${(error as Error).message}); live data goes on. Try again shortly.`);
}
