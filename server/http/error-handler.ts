import type { ErrorRequestHandler, RequestHandler } from 'express';
import type { Logger } from 'pino';
import { isConnectionFailure } from '../db/database-health.js';
import { HttpError } from './http-error.js';

/** JSON 404 for any `/api` path no route claimed. */
export const apiNotFound: RequestHandler = (req) => {
  throw new HttpError(404, `No API route ${req.method} ${req.originalUrl.split('?')[0]}: see the API list in the README`);
};

/**
 * The one error funnel: HttpError → its status and message; body-parser failures → 400/413
 * with a message saying what to fix; a lost database connection → 503; anything else → 500,
 * logged, without internals.
 */
export function errorHandler(log: Logger): ErrorRequestHandler {
  return (error: unknown, req, res, _next) => {
    const { status, message } = describe(error);
    const field = error instanceof HttpError ? error.field : null;
    if (status >= 500) log.error({ err: error, method: req.method, url: req.originalUrl }, 'request failed');
    if (res.headersSent) {
      res.destroy();
      return;
    }
    res.status(status).json(field === null ? { error: message } : { error: message, field });
  };
}

function describe(error: unknown): { status: number; message: string } {
  if (error instanceof HttpError) return { status: error.status, message: error.message };
  const bodyError = error as { type?: string; status?: number; limit?: number };
  if (bodyError.type === 'entity.parse.failed') return { status: 400, message: 'The request body is not valid JSON' };
  if (bodyError.type === 'entity.too.large') return { status: 413, message: `The request body is larger than ${bodyError.limit} bytes` };
  if (typeof bodyError.status === 'number' && bodyError.status >= 400 && bodyError.status < 500) {
    return { status: bodyError.status, message: (error as Error).message };
  }
  if (isConnectionFailure(error)) {
    return { status: 503, message: 'The database cannot be reached right now; nothing was changed. Supervision goes on; try again once /api/health reports the database up.' };
  }
  return { status: 500, message: 'Internal server error (logged on the server)' };
}
