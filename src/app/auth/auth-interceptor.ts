import { HttpErrorResponse, HttpInterceptorFn } from '@angular/common/http';
import { inject } from '@angular/core';
import { catchError, throwError } from 'rxjs';
import { Session } from './session';

const LOGIN_URL = '/api/auth/login';

/**
 * Adds the bearer token to calls to our own API and ends the session when the server answers
 * 401 (token expired, revoked, or signed by a previous server secret). A 401 to a call sent
 * with a token the session has since replaced (a password change revokes the old one while
 * calls with it are still under way) does not end the new session.
 */
export const authInterceptor: HttpInterceptorFn = (req, next) => {
  if (!req.url.startsWith('/api/') || req.url === LOGIN_URL) return next(req);
  const session = inject(Session);
  const token = session.token();
  const authorised = token ? req.clone({ setHeaders: { Authorization: `Bearer ${token}` } }) : req;
  return next(authorised).pipe(
    catchError((err: unknown) => {
      if (err instanceof HttpErrorResponse && err.status === 401 && session.token() === token) {
        session.expire('The server no longer accepts your sign-in. Sign in again to continue.');
      }
      return throwError(() => err);
    }),
  );
};
