import type { RequestHandler } from 'express';
import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import { HttpError } from '../http/http-error.js';
import { normaliseEmail } from './users-repository.js';

/**
 * Limits failed sign-ins to `attemptsPerMinute` per client address and e-mail (successful
 * ones do not count), so guessing one account's password is slow while a colleague at the
 * same control-room computer can still sign in. Over the limit: 429.
 */
export function loginRateLimit(attemptsPerMinute: number): RequestHandler {
  return rateLimit({
    windowMs: 60_000,
    limit: attemptsPerMinute,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => {
      const body = req.body as { email?: unknown } | undefined;
      const email = typeof body?.email === 'string' ? normaliseEmail(body.email) : '';
      return `${ipKeyGenerator(req.ip ?? 'unknown')}|${email}`;
    },
    handler: (_req, _res, next) => next(new HttpError(429, 'Too many failed sign-in attempts; wait a minute and try again')),
  });
}
