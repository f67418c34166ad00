import { and, asc, eq, ne, sql } from 'drizzle-orm';
import type { Role } from '../../shared/auth/roles.js';
import type { UserAccount } from '../../shared/auth/user-api.js';
import { appendAudit } from '../audit/audit-log.js';
import { hashPassword, verifyPassword } from '../auth/password.js';
import { isDemoAccount, normaliseEmail, type UserRecord } from '../auth/users-repository.js';
import type { Db } from '../db/database.js';
import { users } from '../db/schema.js';
import { AccountEvents, announceAccountChange } from './account-events.js';

/** Why an account change was refused: `not-found` 404, `conflict` 409, `invalid` 400. */
export class AccountError extends Error {
  constructor(
    readonly kind: 'not-found' | 'conflict' | 'invalid',
    message: string,
    /** Path of the request field the message is about, for the form. */
    readonly field: string | null = null,
  ) {
    super(message);
    this.name = 'AccountError';
  }
}

export interface NewAccount {
  email: string;
  role: Role;
  password: string;
}

export interface AccountChange {
  role?: Role;
  disabled?: boolean;
}

function view(row: UserRecord): UserAccount {
  return { id: row.id, email: row.email, role: row.role, disabled: row.disabled, createdAt: row.createdAt.toISOString() };
}

/**
 * Managing accounts: list, add, change role, disable and enable (admins), and changing one's
 * own password. Every change is written with its audit entry in one transaction; disabling
 * and a new password raise the account's token version, which revokes every token issued
 * before, while a new role applies to the existing tokens at once (the role is read from the
 * database on every request). `events` tells the WebSocket fan-out to re-check that account's
 * sessions (closed when revoked, greeted again with the new role). At least one enabled admin
 * always remains.
 */
export class UserAccounts {
  constructor(
    private readonly db: Db,
    private readonly events: AccountEvents = new AccountEvents(),
    /** Whether the demo accounts are in use (`--demo`); otherwise they are not listed and no demo admin counts as the remaining admin. */
    private readonly demoAccounts = true,
  ) {}

  async list(): Promise<UserAccount[]> {
    const rows = await this.db.select().from(users).orderBy(asc(users.email));
    return rows.filter((r) => this.demoAccounts || !isDemoAccount(r.email)).map(view);
  }

  async create(input: NewAccount, actor: string, reason: string | null): Promise<UserAccount> {
    const email = normaliseEmail(input.email);
    const passwordHash = await hashPassword(input.password);
    return this.db.transaction(async (tx) => {
      const [existing] = await tx.select({ id: users.id }).from(users).where(eq(users.email, email));
      if (existing) throw new AccountError('conflict', `an account for ${email} exists already`);
      const [row] = await tx.insert(users).values({ email, role: input.role, passwordHash }).returning();
      await appendAudit(tx, { actor, action: 'user.create', subject: `user:${email}`, newValue: { email, role: input.role }, reason });
      return view(row);
    });
  }

  async update(id: number, change: AccountChange, actor: string, reason: string): Promise<{ user: UserAccount; changed: boolean }> {
    const result = await this.db.transaction(async (tx) => {
      const [row] = await tx.select().from(users).where(eq(users.id, id)).for('update');
      if (!row) throw new AccountError('not-found', `no account with id ${id}`);
      const role = change.role ?? row.role;
      const disabled = change.disabled ?? row.disabled;
      if (role === row.role && disabled === row.disabled) return { user: view(row), changed: false };
      const stillAdmin = role === 'admin' && !disabled;
      if (row.role === 'admin' && !row.disabled && !stillAdmin) {
        // A demo admin counts only while the demo accounts are in use: without `--demo` it cannot sign in.
        const others = await tx
          .select({ email: users.email })
          .from(users)
          .where(and(eq(users.role, 'admin'), eq(users.disabled, false), ne(users.id, id)));
        if (!others.some((a) => this.demoAccounts || !isDemoAccount(a.email))) {
          throw new AccountError('conflict', `${row.email} is the only enabled admin${others.length > 0 ? ' (demo accounts do not count: they sign in only with --demo)' : ''}; make another account admin first`);
        }
      }
      const [updated] = await tx
        .update(users)
        // The role is read from the database on every request, so a role change applies to the
        // account's tokens and open sockets at once; disabling revokes the tokens.
        .set({ role, disabled, ...(disabled && !row.disabled ? { tokenVersion: sql`${users.tokenVersion} + 1` } : {}) })
        .where(eq(users.id, id))
        .returning();
      await appendAudit(tx, {
        actor,
        action: 'user.update',
        subject: `user:${row.email}`,
        oldValue: { role: row.role, disabled: row.disabled },
        newValue: { role, disabled },
        reason,
      });
      await announceAccountChange(tx, id);
      return { user: view(updated), changed: true };
    });
    if (result.changed) this.events.changed(id);
    return result;
  }

  /** Sets a new password without the current one (the command-line tool, run by whoever runs the server); revokes the account's tokens. */
  async setPassword(email: string, password: string, actor: string): Promise<UserAccount> {
    const address = normaliseEmail(email);
    const passwordHash = await hashPassword(password);
    const updated = await this.db.transaction(async (tx) => {
      const [row] = await tx
        .update(users)
        .set({ passwordHash, tokenVersion: sql`${users.tokenVersion} + 1` })
        .where(eq(users.email, address))
        .returning();
      if (!row) throw new AccountError('not-found', `no account for ${address}`);
      await appendAudit(tx, { actor, action: 'user.password-set', subject: `user:${address}`, reason: 'set from the command line' });
      await announceAccountChange(tx, row.id);
      return row;
    });
    this.events.changed(updated.id);
    return view(updated);
  }

  /**
   * Changes the password of account `id` after checking its current one; returns the account
   * with its new token version (the caller issues a fresh token; every older one is revoked).
   */
  async changePassword(id: number, current: string, next: string): Promise<UserRecord> {
    const [row] = await this.db.select().from(users).where(eq(users.id, id));
    if (!row || row.disabled) throw new AccountError('not-found', 'this account no longer exists or is disabled');
    if (!(await verifyPassword(row.passwordHash, current))) throw new AccountError('invalid', 'Current password: is not your current password', 'currentPassword');
    if (next === current) throw new AccountError('invalid', 'newPassword: must differ from the current password');
    const passwordHash = await hashPassword(next);
    const updated = await this.db.transaction(async (tx) => {
      const [changed] = await tx
        .update(users)
        .set({ passwordHash, tokenVersion: sql`${users.tokenVersion} + 1` })
        .where(and(eq(users.id, id), eq(users.passwordHash, row.passwordHash)))
        .returning();
      if (!changed) throw new AccountError('conflict', 'the password was changed meanwhile; sign in again');
      await appendAudit(tx, { actor: row.email, action: 'user.password-change', subject: `user:${row.email}`, reason: 'changed by the account holder' });
      await announceAccountChange(tx, id);
      return changed;
    });
    this.events.changed(id);
    return updated;
  }
}
