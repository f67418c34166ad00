import { count, eq, inArray, sql } from 'drizzle-orm';
import { ROLES, type Role } from '../../shared/auth/roles.js';
import { appendAudit } from '../audit/audit-log.js';
import type { Db } from '../db/database.js';
import { users } from '../db/schema.js';
import { hashPassword, verifyPassword } from './password.js';

export interface UserRecord {
  id: number;
  email: string;
  role: Role;
  passwordHash: string;
  createdAt: Date;
  disabled: boolean;
  tokenVersion: number;
}

/** Sign-in names are e-mail addresses compared without case or surrounding blanks. */
export function normaliseEmail(email: string): string {
  return email.trim().toLowerCase();
}

export async function findUserByEmail(db: Db, email: string): Promise<UserRecord | null> {
  const [row] = await db.select().from(users).where(eq(users.email, normaliseEmail(email)));
  return row ?? null;
}

export async function findUserById(db: Db, id: number): Promise<UserRecord | null> {
  const [row] = await db.select().from(users).where(eq(users.id, id));
  return row ?? null;
}

/** The demo accounts: one per role, `<role>@tiltwatch.example`. */
export const DEMO_ACCOUNTS: { email: string; role: Role }[] = ROLES.map((role) => ({ email: `${role}@tiltwatch.example`, role }));

/** True when the database holds no account at all. */
export async function hasNoUsers(db: Db): Promise<boolean> {
  const [{ n }] = await db.select({ n: count() }).from(users);
  return n === 0;
}

/** True when at least one enabled admin account exists. */
export async function hasEnabledAdmin(db: Db): Promise<boolean> {
  const [{ n }] = await db.select({ n: count() }).from(users).where(sql`${users.role} = 'admin' and not ${users.disabled}`);
  return n > 0;
}

/**
 * On a database without users, creates the demo accounts with `password` and records each in
 * the audit trail. Does nothing when any user exists, so changed passwords stay changed.
 */
export async function seedDemoAccounts(db: Db, password: string): Promise<boolean> {
  if (!(await hasNoUsers(db))) return false;
  const hashes = await Promise.all(DEMO_ACCOUNTS.map(() => hashPassword(password)));
  await db.transaction(async (tx) => {
    for (const [i, account] of DEMO_ACCOUNTS.entries()) {
      await tx.insert(users).values({ email: account.email, role: account.role, passwordHash: hashes[i] });
      await appendAudit(tx, {
        actor: 'system',
        action: 'user.create',
        subject: `user:${account.email}`,
        newValue: { email: account.email, role: account.role },
        reason: 'first start: demo account seeded',
      });
    }
  });
  return true;
}

/**
 * Without `--demo` no demo account may be usable: disables (audited) every demo account still
 * accepting the demo password, e.g. one seeded by an earlier version or an earlier demo start.
 * Returns the e-mails disabled.
 */
export async function disableDemoAccounts(db: Db, password: string): Promise<string[]> {
  const rows = await db
    .select()
    .from(users)
    .where(inArray(users.email, DEMO_ACCOUNTS.map((a) => a.email)));
  const known: UserRecord[] = [];
  for (const row of rows) if (!row.disabled && (await verifyPassword(row.passwordHash, password))) known.push(row);
  if (known.length === 0) return [];
  await db.transaction(async (tx) => {
    for (const row of known) {
      await tx.update(users).set({ disabled: true, tokenVersion: sql`${users.tokenVersion} + 1` }).where(eq(users.id, row.id));
      await appendAudit(tx, {
        actor: 'system',
        action: 'user.update',
        subject: `user:${row.email}`,
        oldValue: { role: row.role, disabled: false },
        newValue: { role: row.role, disabled: true },
        reason: 'demo account with the known demo password disabled: started without --demo',
      });
    }
  });
  return known.map((r) => r.email);
}
