import type { SignInThrottleStatus } from '../../shared/auth/user-api.js';

export interface ThrottleRules {
  /** Failed sign-ins of one account answered without delay. */
  freeFailures: number;
  /** Delay after the first failure beyond the free ones, ms; it doubles with each further failure. */
  firstDelayMs: number;
  /** Longest delay between two attempts on one account, ms: short, so the owner is never locked out for long. */
  maxDelayMs: number;
  /** An account's failures are forgotten after this long without a failure, ms. */
  forgetAfterMs: number;
  /** Failed sign-ins allowed from one client address per window, across all accounts (password spraying). */
  addressFailures: number;
  addressWindowMs: number;
}

export const DEFAULT_THROTTLE_RULES: ThrottleRules = {
  freeFailures: 3,
  firstDelayMs: 1000,
  maxDelayMs: 30_000,
  forgetAfterMs: 15 * 60_000,
  addressFailures: 10,
  addressWindowMs: 60_000,
};

/** What the throttle tells the security log. */
export type ThrottleEvent =
  | { kind: 'sign-in.account-delayed'; email: string; address: string; failures: number; delayMs: number }
  | { kind: 'sign-in.address-throttled'; address: string; failures: number; windowMs: number };

export type ThrottleVerdict = { allowed: true } | { allowed: false; scope: 'account' | 'address'; retryAfterMs: number };

export interface AccountState {
  failures: number;
  lastFailureAt: number;
  nextAttemptAt: number;
}

/** A throttle entry as it changed (null: gone), for the store that keeps it over a restart. */
export type ThrottleChange =
  | { scope: 'account'; key: string; state: AccountState | null }
  | { scope: 'address'; key: string; state: number[] | null };

/** Entries kept per map before the oldest are dropped, so spraying cannot grow memory without bound. */
const MAX_ENTRIES = 10_000;

/**
 * Slows password guessing without locking the owner out. Per account: after a few free
 * failures each further failure makes the next attempt wait a short, doubling delay (1 s, 2 s,
 * 4 s … at most 30 s), and a success or an admin's lift clears it. Per client address, across
 * accounts: more than `addressFailures` failures in a window refuse further attempts from that
 * address until the window has room again. Attempts refused here are never checked against the
 * password. Both throttles are reported as events for the security log. Decisions are made from
 * memory, never waiting for storage; every change is handed to `store` (the
 * `sign_in_throttles` table) and `restore` takes the stored entries back at start, so a restart
 * does not wipe a growing delay.
 */
export class SignInThrottle {
  private readonly accounts = new Map<string, AccountState>();
  private readonly addresses = new Map<string, number[]>();

  constructor(
    private readonly rules: ThrottleRules,
    private readonly report: (event: ThrottleEvent) => void,
    private readonly now: () => number = Date.now,
    private readonly store: (change: ThrottleChange) => void = () => undefined,
  ) {}

  /** Takes back entries stored before a restart (those already forgotten are skipped on first use). */
  restore(entries: readonly ThrottleChange[]): void {
    for (const entry of entries) {
      if (entry.scope === 'account' && entry.state) remember(this.accounts, entry.key, entry.state);
      if (entry.scope === 'address' && entry.state) remember(this.addresses, entry.key, entry.state);
    }
  }

  /** Whether an attempt for `email` from `address` may be checked now. */
  check(email: string, address: string): ThrottleVerdict {
    const t = this.now();
    const recent = this.recentFailures(address, t);
    if (recent.length >= this.rules.addressFailures) {
      return { allowed: false, scope: 'address', retryAfterMs: recent[0] + this.rules.addressWindowMs - t };
    }
    const account = this.account(email, t);
    if (account && account.nextAttemptAt > t) return { allowed: false, scope: 'account', retryAfterMs: account.nextAttemptAt - t };
    return { allowed: true };
  }

  failed(email: string, address: string): void {
    const t = this.now();
    const account = this.account(email, t) ?? { failures: 0, lastFailureAt: t, nextAttemptAt: t };
    account.failures++;
    account.lastFailureAt = t;
    const beyond = account.failures - this.rules.freeFailures;
    const delayMs = beyond > 0 ? Math.min(this.rules.maxDelayMs, this.rules.firstDelayMs * 2 ** (beyond - 1)) : 0;
    account.nextAttemptAt = t + delayMs;
    remember(this.accounts, email, account);
    this.store({ scope: 'account', key: email, state: account });
    if (delayMs > 0) this.report({ kind: 'sign-in.account-delayed', email, address, failures: account.failures, delayMs });

    const recent = this.recentFailures(address, t);
    recent.push(t);
    remember(this.addresses, address, recent);
    this.store({ scope: 'address', key: address, state: recent });
    if (recent.length === this.rules.addressFailures) {
      this.report({ kind: 'sign-in.address-throttled', address, failures: recent.length, windowMs: this.rules.addressWindowMs });
    }
  }

  succeeded(email: string): void {
    this.forgetAccount(email);
  }

  /** Lifts the throttle of an account (e-mail) or a client address; true when there was one. */
  lift(key: { email?: string; address?: string }): boolean {
    let lifted = false;
    if (key.email !== undefined) lifted = this.forgetAccount(key.email) || lifted;
    if (key.address !== undefined) lifted = this.forgetAddress(key.address) || lifted;
    return lifted;
  }

  /** Throttles with failures on record now, accounts first, most failures first. */
  status(): SignInThrottleStatus[] {
    const t = this.now();
    const iso = (ms: number) => (ms > t ? new Date(ms).toISOString() : null);
    const accounts: SignInThrottleStatus[] = [];
    for (const [email] of this.accounts) {
      const a = this.account(email, t);
      if (a) accounts.push({ scope: 'account', key: email, failures: a.failures, blockedUntil: iso(a.nextAttemptAt) });
    }
    const addresses: SignInThrottleStatus[] = [];
    for (const [address] of this.addresses) {
      const recent = this.recentFailures(address, t);
      if (recent.length === 0) continue;
      const blocked = recent.length >= this.rules.addressFailures ? recent[0] + this.rules.addressWindowMs : 0;
      addresses.push({ scope: 'address', key: address, failures: recent.length, blockedUntil: iso(blocked) });
    }
    const byFailures = (a: SignInThrottleStatus, b: SignInThrottleStatus) => b.failures - a.failures;
    return [...accounts.sort(byFailures), ...addresses.sort(byFailures)];
  }

  private account(email: string, t: number): AccountState | undefined {
    const state = this.accounts.get(email);
    if (state && t - state.lastFailureAt > this.rules.forgetAfterMs) {
      this.forgetAccount(email);
      return undefined;
    }
    return state;
  }

  private forgetAccount(email: string): boolean {
    if (!this.accounts.delete(email)) return false;
    this.store({ scope: 'account', key: email, state: null });
    return true;
  }

  private forgetAddress(address: string): boolean {
    if (!this.addresses.delete(address)) return false;
    this.store({ scope: 'address', key: address, state: null });
    return true;
  }

  /** Failure times of `address` inside the window ending at `t`, oldest first. */
  private recentFailures(address: string, t: number): number[] {
    const times = this.addresses.get(address);
    if (!times) return [];
    const recent = times.filter((at) => t - at < this.rules.addressWindowMs);
    if (recent.length === 0) this.forgetAddress(address);
    else this.addresses.set(address, recent);
    return recent;
  }
}

/** Sets `key` as the newest entry of `map`, dropping the oldest entries beyond the bound. */
function remember<V>(map: Map<string, V>, key: string, value: V): void {
  map.delete(key);
  map.set(key, value);
  while (map.size > MAX_ENTRIES) map.delete(map.keys().next().value as string);
}
