import type { RequestHandler } from 'express';
import { hostileValueProblem, textProblem } from '../../shared/validation/edge-rules.js';
import { HttpError } from './http-error.js';

/**
 * Refuses hostile input on every API route before any route sees it: NUL and control
 * characters, lone surrogates, non-finite or absurdly large numbers and deep nesting, in the
 * JSON body (field names included), the query and the path. 400 names the field, e.g.
 * `Invalid request body: profile.name: must not contain a NUL character`. Routes still check
 * their own ranges with the building blocks of `fields.ts`.
 */
export const refuseHostileInput: RequestHandler = (req, _res, next) => {
  let path: string;
  try {
    path = decodeURIComponent(req.path);
  } catch {
    throw new HttpError(400, 'Invalid request path: it is not valid percent-encoded UTF-8');
  }
  const pathProblem = textProblem(path);
  if (pathProblem) throw new HttpError(400, `Invalid request path: it ${pathProblem}`);
  for (const [where, value] of [['query', req.query], ['body', req.body]] as const) {
    const found = value === undefined ? null : hostileValueProblem(value);
    if (found) throw new HttpError(400, `Invalid request ${where}: ${found.path === '' ? where : found.path} ${found.problem}`);
  }
  next();
};
