import express, { type Express } from 'express';
import type { z } from 'zod';
import type { Logger } from 'pino';
import type { AccessControl } from '../auth/access-control.js';
import { apiNotFound, errorHandler } from './error-handler.js';
import { refuseHostileBody, refuseHostilePathAndQuery } from './hostile-input.js';
import { requestLogger } from './request-logger.js';
import { ROUTE_BODIES } from './route-bodies.js';
import { API_ROUTES, type RouteHandlers } from './route-table.js';
import { securityHeaders } from './security-headers.js';
import { webApp } from './web-app.js';

/**
 * The Express application: security headers, request log, JSON bodies up to 100 kB, hostile
 * input refused on every `/api` request (NUL, lone surrogates, absurd numbers; a body's fields
 * named by the route's labels), the API routes of the route table (each behind
 * `requireRole(minRole)` unless public), a JSON 404 for
 * other `/api` paths, the web app, and the error funnel last.
 */
export function createApp(deps: { handlers: RouteHandlers; access: AccessControl; webRoot: string; log: Logger }): Express {
  const app = express();
  app.disable('x-powered-by');
  app.use(securityHeaders());
  app.use(requestLogger(deps.log));
  app.use(express.json({ limit: '100kb' }));
  app.use('/api', refuseHostilePathAndQuery);
  for (const route of API_ROUTES) {
    const guard = route.minRole === null ? [] : [deps.access.requireRole(route.minRole)];
    const body = refuseHostileBody((ROUTE_BODIES as Partial<Record<string, z.ZodType>>)[route.id] ?? null);
    app[route.method](route.path, body, ...guard, ...[deps.handlers[route.id]].flat());
  }
  app.use('/api', apiNotFound);
  app.use(webApp(deps.webRoot));
  app.use(errorHandler(deps.log));
  return app;
}
