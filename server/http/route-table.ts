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
  { id: 'auth.password', method: 'post', path: '/api/auth/password', minRole: 'viewer', summary: 'Change one\'s own password: { currentPassword, newPassword } → { token, user }' },
  { id: 'live', method: 'get', path: '/api/live', minRole: 'viewer', summary: 'Latest state of the apparatus' },
  { id: 'series', method: 'get', path: '/api/series', minRole: 'viewer', summary: 'Chart points of the last N seconds (?seconds=N)' },
  { id: 'history', method: 'get', path: '/api/history', minRole: 'viewer', summary: 'Stored series, predictions and records of a window (?from=ISO&to=ISO or ?run=ID, &points=N, &format=csv)' },
  { id: 'channels', method: 'get', path: '/api/channels', minRole: 'viewer', summary: 'Display bands of the live channels, from the level set and alarm limits in force' },
  { id: 'levels.get', method: 'get', path: '/api/levels', minRole: 'viewer', summary: 'The level set in force: display bands, trip levels, operating settings' },
  { id: 'levels.history', method: 'get', path: '/api/levels/history', minRole: 'viewer', summary: 'Stored versions of the level set, newest first' },
  { id: 'levels.update', method: 'put', path: '/api/levels', minRole: 'lead', summary: 'Store the next level-set version: { levels, reason } (audited)' },
  { id: 'calibrations.list', method: 'get', path: '/api/calibrations', minRole: 'viewer', summary: 'Calibration versions, the active one marked' },
  { id: 'calibrations.active', method: 'get', path: '/api/calibrations/active', minRole: 'viewer', summary: 'The active calibration' },
  { id: 'calibrations.get', method: 'get', path: '/api/calibrations/:id', minRole: 'viewer', summary: 'One calibration version with the residual of every file line' },
  { id: 'calibrations.fit', method: 'post', path: '/api/calibrations/fits', minRole: 'lead', summary: 'Fit a measurement file (multipart: file, optional mhzPerGauss) → 201 draft' },
  { id: 'calibrations.approve', method: 'post', path: '/api/calibrations/:id/approve', minRole: 'lead', summary: 'Approve a draft and make it active at once: { reason }' },
  { id: 'profiles.list', method: 'get', path: '/api/profiles', minRole: 'viewer', summary: 'Sample-profile versions, the active one marked' },
  { id: 'profiles.active', method: 'get', path: '/api/profiles/active', minRole: 'viewer', summary: 'The active sample profile' },
  { id: 'profiles.save', method: 'post', path: '/api/profiles', minRole: 'lead', summary: 'Save a profile version: { profile, reason, activate? }' },
  { id: 'profiles.activate', method: 'post', path: '/api/profiles/:id/activate', minRole: 'lead', summary: 'Make a profile version active: { reason }' },
  { id: 'prediction.history', method: 'get', path: '/api/prediction/history', minRole: 'viewer', summary: 'Live predictions of the last N seconds (?seconds=N)' },
  { id: 'alarms.list', method: 'get', path: '/api/alarms', minRole: 'viewer', summary: 'Alarms (?state=active|all) → { alarms }' },
  { id: 'alarms.history', method: 'get', path: '/api/alarms/history', minRole: 'viewer', summary: 'Alarm events of the last N hours (?hours=N) → { events }' },
  { id: 'alarms.health', method: 'get', path: '/api/alarms/health', minRole: 'viewer', summary: 'Alarm-system health: rate per 10 min, floods, chattering, stale (?hours=N)' },
  { id: 'alarms.acknowledge', method: 'post', path: '/api/alarms/:id/acknowledge', minRole: 'operator', summary: 'Acknowledge an alarm' },
  { id: 'alarms.shelve', method: 'post', path: '/api/alarms/:id/shelve', minRole: 'operator', summary: 'Shelve an alarm: { minutes, reason }' },
  { id: 'alarms.unshelve', method: 'post', path: '/api/alarms/:id/unshelve', minRole: 'operator', summary: 'End shelving early: { reason? }' },
  { id: 'alarms.out-of-service', method: 'post', path: '/api/alarms/:id/out-of-service', minRole: 'lead', summary: 'Take an alarm out of service or return it: { on, reason }' },
  { id: 'alarms.reset', method: 'post', path: '/api/alarms/:id/reset', minRole: 'operator', summary: 'Reset a latched alarm whose condition cleared: { reason }' },
  { id: 'alarm-limits.list', method: 'get', path: '/api/alarm-limits', minRole: 'viewer', summary: 'Alarm limits in force with their rationale → { limits }' },
  { id: 'alarm-limits.update', method: 'put', path: '/api/alarm-limits/:id', minRole: 'lead', summary: 'Change one alarm limit: { fields…, reason } (audited)' },
  { id: 'interlock.status', method: 'get', path: '/api/interlock', minRole: 'viewer', summary: 'Software interlock: state, first-out, conditions, hardware trip, history' },
  { id: 'interlock.reset', method: 'post', path: '/api/interlock/reset', minRole: 'operator', summary: 'Reset the tripped interlock once every condition cleared: { reason }' },
  { id: 'users.list', method: 'get', path: '/api/admin/users', minRole: 'admin', summary: 'Accounts → { users }' },
  { id: 'users.create', method: 'post', path: '/api/admin/users', minRole: 'admin', summary: 'Add an account: { email, role, password, reason? } (audited)' },
  { id: 'users.update', method: 'patch', path: '/api/admin/users/:id', minRole: 'admin', summary: 'Change role or disable/enable: { role?, disabled?, reason } (audited; revokes the account\'s tokens)' },
  { id: 'security.report', method: 'get', path: '/api/admin/security', minRole: 'admin', summary: 'Security events of the last N hours and sign-in throttles in force (?hours=N)' },
  { id: 'security.lift', method: 'post', path: '/api/admin/security/lift', minRole: 'admin', summary: 'Lift a sign-in throttle: { email | address, reason } (audited)' },
  { id: 'steering.status', method: 'get', path: '/api/steering', minRole: 'viewer', summary: 'What steers the field: mode, target, planned path, run' },
  { id: 'steering.preflight', method: 'post', path: '/api/steering/preflight', minRole: 'operator', summary: 'Pre-flight a target: { magnitudeG, thetaDeg, phiDeg, rampMs, reason } → { checks, path }' },
  { id: 'steering.target', method: 'post', path: '/api/steering/target', minRole: 'operator', summary: 'Steer to a target (same body): 200 checks, 422 failed checks, 409 tripped (audited)' },
  { id: 'steering.abort', method: 'post', path: '/api/steering/abort', minRole: 'operator', summary: 'End the ramp and hold the present field: { reason } (audited)' },
  { id: 'steering.release', method: 'post', path: '/api/steering/release', minRole: 'operator', summary: 'Stop steering; the controller goes back to its own program: { reason } (audited)' },
  { id: 'sequences.list', method: 'get', path: '/api/sequences', minRole: 'viewer', summary: 'Sequence versions → { sequences }' },
  { id: 'sequences.save', method: 'post', path: '/api/sequences', minRole: 'lead', summary: 'Save a sequence version: { name, steps, reason } → 201 { id, version }' },
  { id: 'sequences.preview', method: 'post', path: '/api/sequences/preview', minRole: 'operator', summary: 'Planned path and checks of steps: { steps } → { ok, checks, path, durationMs }' },
  { id: 'sequences.run', method: 'post', path: '/api/sequences/:id/run', minRole: 'operator', summary: 'Pre-flight and run a sequence: { reason } → 201 { runId }; 409 busy/tripped; 422 checks' },
  { id: 'runs.list', method: 'get', path: '/api/runs', minRole: 'viewer', summary: 'Runs, newest first → { runs }' },
  { id: 'runs.get', method: 'get', path: '/api/runs/:id', minRole: 'viewer', summary: 'One run with its shots' },
  { id: 'runs.abort', method: 'post', path: '/api/runs/:id/abort', minRole: 'operator', summary: 'Abort a run and hold the present field: { reason }' },
  { id: 'shots.list', method: 'get', path: '/api/shots', minRole: 'viewer', summary: 'Shots of a run or a window (?run=ID or ?from=ISO&to=ISO) with prediction and measured TOF image → { shots }' },
  { id: 'shots.measurements', method: 'post', path: '/api/shots/measurements', minRole: 'operator', summary: 'Store measured TOF images (multipart: file, CSV shot, tof_aspect_ratio, tof_angle_deg, sigma_aspect_ratio) → 201 { stored }; all lines or none' },
  { id: 'logbook.write', method: 'post', path: '/api/logbook/entries', minRole: 'operator', summary: 'Write a logbook entry: JSON { text, tags?, at?, link?, amends? } or multipart with files "file" → 201 { id }' },
  { id: 'logbook.list', method: 'get', path: '/api/logbook/entries', minRole: 'viewer', summary: 'Logbook entries, newest first (?q=&from=&to=&tag=&limit=) → { entries }' },
  { id: 'logbook.attachment', method: 'get', path: '/api/logbook/attachments/:id', minRole: 'viewer', summary: 'One attachment, served as its checked type' },
  { id: 'handovers.list', method: 'get', path: '/api/handovers', minRole: 'viewer', summary: 'Shift handovers, newest first → { handovers }' },
  { id: 'handovers.create', method: 'post', path: '/api/handovers', minRole: 'operator', summary: 'Start a handover draft filled from the records since the last accepted one → 201 { handover }' },
  { id: 'handovers.get', method: 'get', path: '/api/handovers/:id', minRole: 'viewer', summary: 'One handover with its sections, open items and both names → { handover }' },
  { id: 'handovers.update', method: 'put', path: '/api/handovers/:id', minRole: 'operator', summary: 'Edit a draft (its author or a lead): { summary?, notes?, openItems? }' },
  { id: 'handovers.submit', method: 'post', path: '/api/handovers/:id/submit', minRole: 'operator', summary: 'Submit a draft (its author or a lead)' },
  { id: 'handovers.accept', method: 'post', path: '/api/handovers/:id/accept', minRole: 'operator', summary: 'Accept a submitted handover (never its submitter): { comment? }' },
  { id: 'handover-items.close', method: 'post', path: '/api/handover-items/:id/close', minRole: 'operator', summary: 'Close an open item: { note }' },
  { id: 'admin.outbox', method: 'get', path: '/api/admin/outbox', minRole: 'admin', summary: 'Messages received by the local mailbox' },
] as const satisfies readonly RouteSpec[];

export type RouteId = (typeof API_ROUTES)[number]['id'];

/** The handlers of every route, by id; the type makes a route without a handler a compile error. */
export type RouteHandlers = Record<RouteId, RequestHandler | RequestHandler[]>;
