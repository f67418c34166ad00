import type { RequestHandler } from 'express';
import type { Role } from '../../shared/auth/roles.js';

export type HttpMethod = 'get' | 'post' | 'put' | 'patch' | 'delete';

export interface RouteSpec {
  id: string;
  method: HttpMethod;
  path: string;
  /** Least role that may call the route; null for the two public routes. */
  minRole: Role | null;
  summary: string;
}

/**
 * Every API route with the least role allowed to call it: the single source for the access
 * check (app.ts puts `requireRole(minRole)` in front of each handler), for the table-driven
 * access test and for the README's API list. Only health and login are public.
 */
export const API_ROUTES = [
  { id: 'health', method: 'get', path: '/api/health', minRole: null, summary: 'Liveness and counters' },
  { id: 'auth.login', method: 'post', path: '/api/auth/login', minRole: null, summary: 'Sign in: { email, password } → { token, user }' },
  { id: 'auth.me', method: 'get', path: '/api/auth/me', minRole: 'viewer', summary: 'The signed-in user' },
  { id: 'live', method: 'get', path: '/api/live', minRole: 'viewer', summary: 'Latest state of the apparatus' },
  { id: 'series', method: 'get', path: '/api/series', minRole: 'viewer', summary: 'Chart points of the last N seconds (?seconds=N)' },
  { id: 'channels', method: 'get', path: '/api/channels', minRole: 'viewer', summary: 'Display bands of the live channels' },
  { id: 'calibrations.list', method: 'get', path: '/api/calibrations', minRole: 'viewer', summary: 'Calibration versions, the active one marked' },
  { id: 'calibrations.active', method: 'get', path: '/api/calibrations/active', minRole: 'viewer', summary: 'The active calibration' },
] as const satisfies readonly RouteSpec[];

export type RouteId = (typeof API_ROUTES)[number]['id'];

/** The handlers of every route, by id; the type makes a route without a handler a compile error. */
export type RouteHandlers = Record<RouteId, RequestHandler | RequestHandler[]>;
