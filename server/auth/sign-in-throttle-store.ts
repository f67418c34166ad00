/**
 * Keeps the sign-in throttles over a restart (`sign_in_throttles`): each change the throttle
 * hands over is written in order without making a sign-in wait (a failed write is logged; the
 * throttle in memory holds meanwhile), and at start the entries still in force are read back
 * and the rest deleted.
 */
import { and, eq } from 'drizzle-orm';
import type { Logger } from 'pino';
import type { Db } from '../db/database.js';
import { signInThrottles } from '../db/schema.js';
import type { AccountState, ThrottleChange, ThrottleRules } from './sign-in-throttle.js';

export class SignInThrottleStore {
  private writing: Promise<void> = Promise.resolve();

  constructor(
    private readonly db: Db,
    private readonly log: Logger,
  ) {}

  /** Queues the write of `change` (copied now: the throttle goes on changing its entries). */
  save(change: ThrottleChange): void {
    const copy = JSON.parse(JSON.stringify(change)) as ThrottleChange;
    this.writing = this.writing
      .then(() => this.write(copy))
      .catch((error: unknown) => this.log.error({ err: error, scope: copy.scope }, 'storing a sign-in throttle failed; it holds in memory until a restart'));
  }

  /** Resolves once every queued write is done. */
  drain(): Promise<void> {
    return this.writing;
  }

  /** The entries still in force at `nowMs` under `rules`; older ones are deleted. */
  async load(rules: ThrottleRules, nowMs: number): Promise<ThrottleChange[]> {
    const entries: ThrottleChange[] = [];
    for (const row of await this.db.select().from(signInThrottles)) {
      const entry = { scope: row.scope, key: row.key, state: row.state } as ThrottleChange;
      const newest = entry.scope === 'account' ? (entry.state as AccountState).lastFailureAt : Math.max(...(entry.state as number[]));
      const keepMs = entry.scope === 'account' ? rules.forgetAfterMs : rules.addressWindowMs;
      if (nowMs - newest <= keepMs) entries.push(entry);
      else await this.delete(entry.scope, entry.key);
    }
    return entries;
  }

  private async write(change: ThrottleChange): Promise<void> {
    if (change.state === null) return this.delete(change.scope, change.key);
    await this.db
      .insert(signInThrottles)
      .values({ scope: change.scope, key: change.key, state: change.state })
      .onConflictDoUpdate({ target: [signInThrottles.scope, signInThrottles.key], set: { state: change.state } });
  }

  private async delete(scope: ThrottleChange['scope'], key: string): Promise<void> {
    await this.db.delete(signInThrottles).where(and(eq(signInThrottles.scope, scope), eq(signInThrottles.key, key)));
  }
}
