import { HttpClient, provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { authInterceptor } from './auth-interceptor';
import { SESSION_STORAGE_KEY, Session } from './session';
import { tokenExpiry } from './token-expiry';

/** An unsigned token with the given claims (the browser never checks signatures). */
function token(claims: Record<string, unknown>): string {
  const encode = (value: unknown) => btoa(JSON.stringify(value)).replace(/\+/g, '-').replace(/\//g, '_').replace(/=+$/, '');
  return `${encode({ alg: 'HS256', typ: 'JWT' })}.${encode(claims)}.signature`;
}

const IN_ONE_HOUR_S = Math.floor(Date.now() / 1000) + 3600;
const AN_HOUR_AGO_S = Math.floor(Date.now() / 1000) - 3600;
const OPERATOR = { email: 'operator@tiltwatch.example', role: 'operator' as const };

describe('tokenExpiry', () => {
  it('reads the exp claim (seconds) as epoch milliseconds', () => {
    expect(tokenExpiry(token({ sub: 'x', exp: 1_900_000_000 }))).toBe(1_900_000_000_000);
  });

  it('reads payloads whose base64url form needs padding and uses - and _', () => {
    expect(tokenExpiry(token({ sub: 'ü?>', exp: 1_700_000_001 }))).toBe(1_700_000_001_000);
  });

  it('returns null for a token without exp or that is not a JWT', () => {
    expect(tokenExpiry(token({ sub: 'x' }))).toBeNull();
    expect(tokenExpiry('not-a-token')).toBeNull();
    expect(tokenExpiry('a.%%%.c')).toBeNull();
  });
});

describe('Session', () => {
  let http: HttpTestingController;

  function configure(): void {
    TestBed.configureTestingModule({
      providers: [provideRouter([{ path: '**', children: [] }]), provideHttpClient(withInterceptors([authInterceptor])), provideHttpClientTesting()],
    });
    http = TestBed.inject(HttpTestingController);
  }

  /** A fresh session object reading localStorage, as after a page reload. */
  function reloaded(): Session {
    return TestBed.runInInjectionContext(() => new Session());
  }

  beforeEach(() => {
    localStorage.clear();
    configure();
  });

  afterEach(() => {
    http.verify();
    localStorage.clear();
  });

  it('keeps the token and user in localStorage so the sign-in survives a reload', async () => {
    const session = TestBed.inject(Session);
    const signingIn = session.signIn('operator@tiltwatch.example', 'secret');
    http.expectOne('/api/auth/login').flush({ token: token({ exp: IN_ONE_HOUR_S }), user: OPERATOR });
    await signingIn;

    const after = reloaded();
    expect(after.signedIn()).toBe(true);
    expect(after.user()).toEqual(OPERATOR);
    expect(after.role()).toBe('operator');
  });

  it('does not restore an expired token and says that the session expired', () => {
    localStorage.setItem(SESSION_STORAGE_KEY, JSON.stringify({ token: token({ exp: AN_HOUR_AGO_S }), user: OPERATOR }));
    const session = reloaded();
    expect(session.signedIn()).toBe(false);
    expect(session.notice()).toMatch(/session expired/);
    expect(localStorage.getItem(SESSION_STORAGE_KEY)).toBeNull();
  });

  it('ignores a stored session of the wrong shape', () => {
    localStorage.setItem(SESSION_STORAGE_KEY, JSON.stringify({ token: 'x', user: { email: 'a@b.example', role: 'superuser' } }));
    expect(reloaded().signedIn()).toBe(false);
  });

  it('sends the token as a bearer header on API calls', async () => {
    const jwt = token({ exp: IN_ONE_HOUR_S });
    localStorage.setItem(SESSION_STORAGE_KEY, JSON.stringify({ token: jwt, user: OPERATOR }));
    TestBed.resetTestingModule();
    configure();
    const call = firstValueFrom(TestBed.inject(HttpClient).get('/api/live'));
    const request = http.expectOne('/api/live');
    expect(request.request.headers.get('Authorization')).toBe(`Bearer ${jwt}`);
    request.flush({});
    await call;
  });

  it('ends the session with a notice when the server answers 401', async () => {
    localStorage.setItem(SESSION_STORAGE_KEY, JSON.stringify({ token: token({ exp: IN_ONE_HOUR_S }), user: OPERATOR }));
    TestBed.resetTestingModule();
    configure();
    const session = TestBed.inject(Session);
    const call = firstValueFrom(TestBed.inject(HttpClient).get('/api/live')).catch(() => 'refused');
    http.expectOne('/api/live').flush({ error: 'token expired' }, { status: 401, statusText: 'Unauthorized' });
    expect(await call).toBe('refused');
    expect(session.signedIn()).toBe(false);
    expect(session.notice()).toMatch(/Sign in again/);
    expect(localStorage.getItem(SESSION_STORAGE_KEY)).toBeNull();
  });

  it('keeps a session whose token a password change replaced while a call with the old token was under way', async () => {
    localStorage.setItem(SESSION_STORAGE_KEY, JSON.stringify({ token: token({ exp: IN_ONE_HOUR_S }), user: OPERATOR }));
    TestBed.resetTestingModule();
    configure();
    const session = TestBed.inject(Session);
    const oldCall = firstValueFrom(TestBed.inject(HttpClient).get('/api/live')).catch(() => 'refused');
    const changing = session.changePassword('old pass phrase', 'new pass phrase');
    const fresh = token({ exp: IN_ONE_HOUR_S, tv: 2 });
    http.expectOne('/api/auth/password').flush({ token: fresh, user: OPERATOR });
    await changing;
    http.expectOne('/api/live').flush({ error: 'token revoked' }, { status: 401, statusText: 'Unauthorized' });
    expect(await oldCall).toBe('refused');
    expect(session.signedIn()).toBe(true);
    expect(session.token()).toBe(fresh);
  });

  it('takes a changed role of its own account (from the live feed greeting) and keeps it across a reload; another account is ignored', () => {
    localStorage.setItem(SESSION_STORAGE_KEY, JSON.stringify({ token: token({ exp: IN_ONE_HOUR_S }), user: OPERATOR }));
    const session = reloaded();
    session.takeUser({ email: 'lead@tiltwatch.example', role: 'viewer' });
    expect(session.role()).toBe('operator');
    session.takeUser({ email: OPERATOR.email, role: 'viewer' });
    expect(session.role()).toBe('viewer');
    expect(reloaded().role()).toBe('viewer');
  });

  it('forgets the session on sign-out', async () => {
    localStorage.setItem(SESSION_STORAGE_KEY, JSON.stringify({ token: token({ exp: IN_ONE_HOUR_S }), user: OPERATOR }));
    const session = reloaded();
    session.signOut();
    expect(session.signedIn()).toBe(false);
    expect(session.notice()).toBeNull();
    expect(reloaded().signedIn()).toBe(false);
  });
});
