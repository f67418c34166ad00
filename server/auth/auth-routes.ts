import type { Request, RequestHandler } from 'express';
import { ipKeyGenerator } from 'express-rate-limit';
import { z } from 'zod';
import { PASSWORD_MAX_LENGTH, PASSWORD_MIN_LENGTH } from '../../shared/auth/user-api.js';
import { emailAddress, secretText } from '../http/fields.js';
import { labelled } from '../http/field-labels.js';
import { HttpError } from '../http/http-error.js';
import type { RouteHandlers } from '../http/route-table.js';
import { parseInput } from '../http/validate.js';
import type { UserAccounts } from '../users/user-accounts.js';
import { accountHttpError } from '../users/user-routes.js';
import { SignInThrottledError, type LoginUseCase } from './login.js';
import type { TokenIssuer } from './tokens.js';

/** Labels as the sign-in screen shows them. */
export const LoginRequest = z.object({
  email: labelled(emailAddress(), 'Email'),
  password: labelled(secretText({ min: 1, max: PASSWORD_MAX_LENGTH }), 'Password'),
});

/** Labels as the Change password dialog shows them. */
export const PasswordChange = z.strictObject({
  currentPassword: labelled(secretText({ min: 1, max: PASSWORD_MAX_LENGTH }), 'Current password'),
  newPassword: labelled(secretText({ min: PASSWORD_MIN_LENGTH, max: PASSWORD_MAX_LENGTH }), 'New password'),
});

/** The client address as the sign-in throttle counts it (an IPv6 client by its /56 network). */
export function clientAddress(req: Request): string {
  return ipKeyGenerator(req.ip ?? 'unknown');
}

/**
 * `POST /api/auth/login` (throttled per account and per client address; 429 with Retry-After),
 * `GET /api/auth/me`, and `POST /api/auth/password` (own password, current one required; the
 * answer carries a fresh token, every older token of the account is revoked).
 */
export function authHandlers(deps: { login: LoginUseCase; accounts: UserAccounts; tokens: TokenIssuer }): Pick<RouteHandlers, 'auth.login' | 'auth.me' | 'auth.password'> {
  const signIn: RequestHandler = async (req, res) => {
    const body = parseInput(LoginRequest, req.body, 'body');
    try {
      res.json(await deps.login.login(body.email, body.password, clientAddress(req)));
    } catch (error) {
      if (error instanceof SignInThrottledError) res.setHeader('Retry-After', String(error.retryAfterS));
      throw error;
    }
  };
  const me: RequestHandler = (req, res) => {
    if (!req.user) throw new HttpError(401, 'Sign in first');
    res.json({ email: req.user.email, role: req.user.role });
  };
  const changePassword: RequestHandler = async (req, res) => {
    if (!req.user) throw new HttpError(401, 'Sign in first');
    const body = parseInput(PasswordChange, req.body, 'body');
    let user;
    try {
      user = await deps.accounts.changePassword(req.user.id, body.currentPassword, body.newPassword);
    } catch (error) {
      throw accountHttpError(error);
    }
    res.json({
      token: deps.tokens.sign({ userId: user.id, email: user.email, role: user.role, tokenVersion: user.tokenVersion }),
      user: { email: user.email, role: user.role },
    });
  };
  return { 'auth.login': signIn, 'auth.me': me, 'auth.password': changePassword };
}
