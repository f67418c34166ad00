import type { Request } from 'express';
import { z } from 'zod';
import { ROLES } from '../../shared/auth/roles.js';
import { PASSWORD_MAX_LENGTH, PASSWORD_MIN_LENGTH, type SecurityReport } from '../../shared/auth/user-api.js';
import type { SecurityLog } from '../auth/security-log.js';
import type { SignInThrottle } from '../auth/sign-in-throttle.js';
import { normaliseEmail } from '../auth/users-repository.js';
import { appendAudit } from '../audit/audit-log.js';
import type { Db } from '../db/database.js';
import { emailAddress, queryNumber, reasonText, safeText, secretText } from '../http/fields.js';
import { labelled } from '../http/field-labels.js';
import { HttpError } from '../http/http-error.js';
import type { RouteHandlers } from '../http/route-table.js';
import { parseInput } from '../http/validate.js';
import { AccountError, type UserAccounts } from './user-accounts.js';

const role = z.enum(ROLES, { error: `must be one of ${ROLES.join(', ')}` });

/** Labels as the Add account dialog shows them. */
export const NewUser = z.strictObject({
  email: labelled(emailAddress(), 'E-mail'),
  role: labelled(role, 'Role'),
  password: labelled(secretText({ min: PASSWORD_MIN_LENGTH, max: PASSWORD_MAX_LENGTH }), 'First password'),
  reason: labelled(reasonText(), 'Note for the audit trail').optional(),
});

/** Labels as the Change role and Disable dialogs show them. */
export const UserChange = z
  .strictObject({
    role: labelled(role, 'New role').optional(),
    disabled: labelled(z.boolean({ error: 'must be true or false' }), 'Disabled').optional(),
    reason: labelled(reasonText(), 'Reason'),
  })
  .refine((c) => c.role !== undefined || c.disabled !== undefined, 'send role, disabled or both');

const UserId = z.object({ id: z.coerce.number({ error: 'must be an account id' }).int('must be a whole number').positive('must be an account id ≥ 1') });

const SecurityQuery = z.object({ hours: queryNumber({ min: 1, max: 24 * 30, unit: 'h' }).default(24) });

/** Labels as the Sign-in security panel's Lift dialog shows them. */
export const Lift = z
  .strictObject({
    email: labelled(safeText({ max: 320 }), 'Account').optional(),
    address: labelled(safeText({ max: 100 }), 'Address').optional(),
    reason: labelled(reasonText(), 'Reason'),
  })
  .refine((l) => l.email !== undefined || l.address !== undefined, 'send the email or the address whose throttle to lift');

/** AccountError → 404 / 409 / 400 with its message; anything else unchanged. */
export function accountHttpError(error: unknown): unknown {
  if (!(error instanceof AccountError)) return error;
  return new HttpError(error.kind === 'not-found' ? 404 : error.kind === 'conflict' ? 409 : 400, error.message, error.field);
}

function actorOf(req: Request): string {
  if (!req.user) throw new HttpError(401, 'Sign in first');
  return req.user.email;
}

/**
 * Admin → Users: `GET /api/admin/users`, `POST /api/admin/users` (add; 201), `PATCH
 * /api/admin/users/:id` (role, disabled; audited with a reason), `GET /api/admin/security`
 * (security events and sign-in throttles in force) and `POST /api/admin/security/lift`.
 */
export function userHandlers(deps: {
  db: Db;
  accounts: UserAccounts;
  throttle: SignInThrottle;
  security: SecurityLog;
}): Pick<RouteHandlers, 'users.list' | 'users.create' | 'users.update' | 'security.report' | 'security.lift'> {
  const { accounts, throttle, security } = deps;
  return {
    'users.list': async (_req, res) => {
      res.json({ users: await accounts.list() });
    },
    'users.create': async (req, res) => {
      const body = parseInput(NewUser, req.body, 'body');
      try {
        res.status(201).json({ user: await accounts.create(body, actorOf(req), body.reason ?? null) });
      } catch (error) {
        throw accountHttpError(error);
      }
    },
    'users.update': async (req, res) => {
      const { id } = parseInput(UserId, req.params, 'path');
      const body = parseInput(UserChange, req.body, 'body');
      try {
        res.json(await accounts.update(id, { role: body.role, disabled: body.disabled }, actorOf(req), body.reason));
      } catch (error) {
        throw accountHttpError(error);
      }
    },
    'security.report': async (req, res) => {
      const { hours } = parseInput(SecurityQuery, req.query, 'query');
      const report: SecurityReport = { events: await security.recent(hours), throttles: throttle.status() };
      res.json(report);
    },
    'security.lift': async (req, res) => {
      const body = parseInput(Lift, req.body, 'body');
      const email = body.email === undefined ? undefined : normaliseEmail(body.email);
      const actor = actorOf(req);
      const subject = email !== undefined ? `sign-in:${email}` : `sign-in-address:${body.address}`;
      await deps.db.transaction(async (tx) => {
        await appendAudit(tx, { actor, action: 'sign-in.throttle-lift', subject, reason: body.reason });
        await security.recordNow({ kind: 'sign-in.throttle-lifted', email, address: body.address, detail: { by: actor, reason: body.reason } }, tx);
      });
      const lifted = throttle.lift({ email, address: body.address });
      res.json({ lifted });
    },
  };
}
