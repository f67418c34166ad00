import { and, count, eq } from 'drizzle-orm';
import { ROLES, type Role } from '../../shared/auth/roles.js';
import { appendAudit } from '../audit/audit-log.js';
import type { Db } from '../db/database.js';
import { users } from '../db/schema.js';
import { hashPassword } from './password.js';

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

/** True for the e-mail of a demo account; those sign in only while the server runs with `--demo`. */
export function isDemoAccount(email: string): boolean {
  return DEMO_ACCOUNTS.some((a) => a.email === normaliseEmail(email));
}

/** True when at least one enabled admin account exists (demo accounts count only with `demo`). */
export async function hasEnabledAdmin(db: Db, demo: boolean): Promise<boolean> {
  const admins = await db.select({ email: users.email }).from(users).where(and(eq(users.role, 'admin'), eq(users.disabled, false)));
  return admins.some((a) => demo || !isDemoAccount(a.email));
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
