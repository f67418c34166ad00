import { sql } from 'drizzle-orm';
import type { Db } from '../db/database.js';

/** PostgreSQL notification channel on which account changes are announced to other processes. */
export const ACCOUNT_CHANGES_CHANNEL = 'tiltwatch_account_changes';

type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

/**
 * Tells whoever holds sessions (the WebSocket fan-out) that an account changed: disabled,
 * enabled, role or password changed. Listeners re-check the sessions of that account, or of
 * every account when the id is null (changes may have been missed, e.g. while the connection
 * that hears other processes was down).
 */
export class AccountEvents {
  private readonly listeners = new Set<(userId: number | null) => void>();

  /** Registers `listener`; returns a function that removes it. */
  onChange(listener: (userId: number | null) => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  changed(userId: number | null): void {
    for (const listener of this.listeners) listener(userId);
  }
}

/**
 * Announces a change of account `userId` to other processes on the same PostgreSQL server
 * (a server hears what the `users` command changed); sent when `tx` commits.
 */
export async function announceAccountChange(tx: Tx, userId: number): Promise<void> {
  await tx.execute(sql`select pg_notify(${ACCOUNT_CHANGES_CHANNEL}, ${String(userId)})`);
}
