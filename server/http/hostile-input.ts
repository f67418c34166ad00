import type { RequestHandler } from 'express';
import type { z } from 'zod';
import { hostileValueProblem, textProblem } from '../../shared/validation/edge-rules.js';
import { fieldLabel, labelledMessage } from './field-labels.js';
import { HttpError } from './http-error.js';

/**
 * Refuses hostile input on every API request before any route sees it: NUL and control
 * characters, lone surrogates, non-finite or absurdly large numbers and deep nesting in the
 * path and the query (named by the query parameter, e.g. `Invalid request query: state must
 * not contain a NUL character`). The JSON body is checked per route (`refuseHostileBody`).
 */
export const refuseHostilePathAndQuery: RequestHandler = (req, _res, next) => {
  let path: string;
  try {
    path = decodeURIComponent(req.path);
  } catch {
    throw new HttpError(400, 'Invalid request path: it is not valid percent-encoded UTF-8');
  }
  const pathProblem = textProblem(path);
  if (pathProblem) throw new HttpError(400, `Invalid request path: it ${pathProblem}`);
  const found = req.query === undefined ? null : hostileValueProblem(req.query);
  if (found) throw new HttpError(400, `Invalid request query: ${found.path === '' ? 'query' : found.path} ${found.problem}`);
  next();
};

/**
 * The same generic rules for a route's JSON body (field names included), before the route and
 * its access check see it. The 400 names the field as the form labels it, from the labels of
 * the route's request schema (`Reason for the reset: must not contain a NUL character`), with
 * `field` set to its path so the screen shows the message next to that input.
 */
export function refuseHostileBody(schema: z.ZodType | null): RequestHandler {
  return (req, _res, next) => {
    const found = req.body === undefined ? null : hostileValueProblem(req.body);
    if (found) {
      const path = found.path === '' ? [] : found.path.split('.');
      const label = schema === null ? null : fieldLabel(schema, path);
      throw new HttpError(400, path.length > 0 ? labelledMessage(label, path, found.problem) : `The request body ${found.problem}`, path.length > 0 ? found.path : null);
    }
    next();
  };
}
