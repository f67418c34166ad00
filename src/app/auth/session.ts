import { HttpClient } from '@angular/common/http';
import { DestroyRef, Injectable, computed, inject, signal } from '@angular/core';
import { Router } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { ROLES, type Role } from '../../../shared/auth/roles';
import { tokenExpiry } from './token-expiry';

export interface SessionUser {
  email: string;
  role: Role;
}

/** Body of `POST /api/auth/login`. */
export interface LoginResponse {
  token: string;
  user: SessionUser;
}

interface StoredSession {
  token: string;
  user: SessionUser;
  /** Unix epoch ms, or null when the token does not say. */
  expiresAt: number | null;
}

/** localStorage key; the session survives a reload and ends when the token expires. */
export const SESSION_STORAGE_KEY = 'tiltwatch.session';

/** Longest delay `setTimeout` honours (about 24.8 days); longer waits are re-armed. */
const MAX_TIMER_MS = 2 ** 31 - 1;

/**
 * The signed-in user of this browser: token, user and role as signals, kept in localStorage.
 * Ends itself when the token expires and when the server says the token is no longer valid.
 */
@Injectable({ providedIn: 'root' })
export class Session {
  private readonly http = inject(HttpClient);
  private readonly router = inject(Router);
  private readonly current = signal<StoredSession | null>(null);
  private expiryTimer: ReturnType<typeof setTimeout> | null = null;

  readonly token = computed(() => this.current()?.token ?? null);
  readonly user = computed(() => this.current()?.user ?? null);
  /** Role of the signed-in user; features offer only what this role may do. */
  readonly role = computed<Role | null>(() => this.current()?.user.role ?? null);
  readonly signedIn = computed(() => this.current() !== null);
  /** Why the previous session ended, shown once on the sign-in page. */
  readonly notice = signal<string | null>(null);

  constructor() {
    inject(DestroyRef).onDestroy(() => {
      if (this.expiryTimer !== null) clearTimeout(this.expiryTimer);
    });
    const stored = readStoredSession();
    if (stored && stored.expiresAt !== null && stored.expiresAt <= Date.now()) {
      localStorage.removeItem(SESSION_STORAGE_KEY);
      this.notice.set(`Your session expired at ${new Date(stored.expiresAt).toLocaleString()}. Sign in again to continue.`);
    } else if (stored) {
      this.adopt(stored);
    }
  }

  /** Signs in; rejects with the server's error (an `HttpErrorResponse`) on failure. */
  async signIn(email: string, password: string): Promise<SessionUser> {
    const body = await firstValueFrom(this.http.post<LoginResponse>('/api/auth/login', { email, password }));
    this.replaceToken(body);
    return body.user;
  }

  /**
   * Changes the signed-in user's password. The server revokes every earlier token of the
   * account and answers with a fresh one, which this session takes over (so this browser stays
   * signed in while other sign-ins of the account end). Rejects with the server's error.
   */
  async changePassword(currentPassword: string, newPassword: string): Promise<void> {
    const body = await firstValueFrom(this.http.post<LoginResponse>('/api/auth/password', { currentPassword, newPassword }));
    this.replaceToken(body);
  }

  private replaceToken(body: LoginResponse): void {
    const session: StoredSession = { token: body.token, user: body.user, expiresAt: tokenExpiry(body.token) };
    localStorage.setItem(SESSION_STORAGE_KEY, JSON.stringify(session));
    this.notice.set(null);
    this.adopt(session);
  }

  /** Re-reads the user (and so the role) from the server, which may have changed it. */
  async refreshUser(): Promise<void> {
    this.takeUser(await firstValueFrom(this.http.get<SessionUser>('/api/auth/me')));
  }

  /**
   * Takes the user as the server now has it (an admin may have changed the role: the live
   * feed's greeting says so at once), so screens offer only what the new role may do.
   * Another account's user is ignored.
   */
  takeUser(user: SessionUser): void {
    const session = this.current();
    if (!session || !isUser(user) || user.email !== session.user.email) return;
    if (user.role === session.user.role) return;
    const next = { ...session, user: { email: user.email, role: user.role } };
    localStorage.setItem(SESSION_STORAGE_KEY, JSON.stringify(next));
    this.current.set(next);
  }

  /** Ends the session at the user's request. */
  signOut(): void {
    this.end(null);
  }

  /** Ends the session because it is no longer valid, and says why on the sign-in page. */
  expire(reason: string): void {
    if (!this.current()) return;
    this.end(reason);
  }

  private end(notice: string | null): void {
    if (this.expiryTimer !== null) clearTimeout(this.expiryTimer);
    this.expiryTimer = null;
    localStorage.removeItem(SESSION_STORAGE_KEY);
    this.current.set(null);
    this.notice.set(notice);
    void this.router.navigate(['/sign-in']);
  }

  private adopt(session: StoredSession): void {
    this.current.set(session);
    this.armExpiry(session);
  }

  private armExpiry(session: StoredSession): void {
    if (this.expiryTimer !== null) clearTimeout(this.expiryTimer);
    this.expiryTimer = null;
    if (session.expiresAt === null) return;
    const wait = session.expiresAt - Date.now();
    this.expiryTimer = setTimeout(() => {
      if (this.current() !== session) return;
      if (wait > MAX_TIMER_MS) this.armExpiry(session);
      else this.expire('Your session expired. Sign in again to continue.');
    }, Math.min(Math.max(wait, 0), MAX_TIMER_MS));
  }
}

function isUser(value: unknown): value is SessionUser {
  const v = value as Partial<SessionUser> | null;
  return !!v && typeof v.email === 'string' && typeof v.role === 'string' && (ROLES as readonly string[]).includes(v.role);
}

/** The stored session, or null when there is none or it is not in the expected shape. */
function readStoredSession(): StoredSession | null {
  try {
    const raw: unknown = JSON.parse(localStorage.getItem(SESSION_STORAGE_KEY) ?? 'null');
    const s = raw as Partial<StoredSession> | null;
    if (!s || typeof s.token !== 'string' || !isUser(s.user)) return null;
    return { token: s.token, user: s.user, expiresAt: tokenExpiry(s.token) };
  } catch {
    return null;
  }
}
