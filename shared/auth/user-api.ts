import type { Role } from './roles.js';

/** Least length of a new password (common practice for a shared control-room system). */
export const PASSWORD_MIN_LENGTH = 12;
export const PASSWORD_MAX_LENGTH = 1024;

/** An account as `GET /api/admin/users` lists it. */
export interface UserAccount {
  id: number;
  email: string;
  role: Role;
  disabled: boolean;
  /** ISO 8601 UTC. */
  createdAt: string;
}

/** One security event (`GET /api/admin/security`). */
export interface SecurityEvent {
  id: number;
  /** ISO 8601 UTC. */
  at: string;
  kind: string;
  email: string | null;
  address: string | null;
  detail: Record<string, unknown> | null;
}

/** A sign-in throttle in force now. */
export interface SignInThrottleStatus {
  scope: 'account' | 'address';
  /** The e-mail (account scope) or client address (address scope). */
  key: string;
  failures: number;
  /** ISO 8601 UTC: the next attempt is accepted from then on; null when not delayed right now. */
  blockedUntil: string | null;
}

/** `GET /api/admin/security`. */
export interface SecurityReport {
  events: SecurityEvent[];
  throttles: SignInThrottleStatus[];
}
