import type { RequestHandler } from 'express';
import { z } from 'zod';
import { HttpError } from '../http/http-error.js';
import type { RouteHandlers } from '../http/route-table.js';
import { emailAddress, secretText } from '../http/fields.js';
import { parseInput } from '../http/validate.js';
import type { LoginUseCase } from './login.js';
import { loginRateLimit } from './login-rate-limit.js';

const LoginRequest = z.object({
  email: emailAddress(),
  password: secretText({ min: 1, max: 1024 }),
});

/** `POST /api/auth/login` (rate-limited) and `GET /api/auth/me`. */
export function authHandlers(login: LoginUseCase, loginAttemptsPerMinute: number): Pick<RouteHandlers, 'auth.login' | 'auth.me'> {
  const signIn: RequestHandler = async (req, res) => {
    const body = parseInput(LoginRequest, req.body, 'body');
    res.json(await login.login(body.email, body.password));
  };
  const me: RequestHandler = (req, res) => {
    if (!req.user) throw new HttpError(401, 'Sign in first');
    res.json({ email: req.user.email, role: req.user.role });
  };
  return { 'auth.login': [loginRateLimit(loginAttemptsPerMinute), signIn], 'auth.me': me };
}
