import { describe, expect, it } from 'vitest';
import { DatabaseHealth, describeDatabaseError, isConnectionFailure, unlessDatabaseDown } from './database-health.js';

const refused = Object.assign(new Error('connect ECONNREFUSED 127.0.0.1:5432'), { code: 'ECONNREFUSED' });

describe('DatabaseHealth', () => {
  it('counts an outage once, from the first failed ping to the first good one, and keeps the reason', async () => {
    let up = true;
    let now = 1_000;
    const changes: string[] = [];
    const health = new DatabaseHealth({ ping: async () => (up ? 1 : Promise.reject(refused)), now: () => now, onChange: (r) => changes.push(r.state) });
    expect(await health.check()).toBe('up');
    up = false;
    expect(await health.check()).toBe('unreachable');
    now += 3_500;
    expect(await health.check()).toBe('unreachable');
    expect(health.outageSeconds()).toBe(3.5);
    up = true;
    expect(await health.check()).toBe('up');
    expect(health.report()).toMatchObject({ state: 'up', outages: 1, lastError: 'connect ECONNREFUSED 127.0.0.1:5432' });
    expect(health.outageSeconds()).toBe(0);
    expect(changes).toEqual(['unreachable', 'up']);
  });

  it('lets the ping decide when a connection reports an error: a stale one does not make an outage', async () => {
    const health = new DatabaseHealth({ ping: async () => 1 });
    health.noteFailure(new Error('Connection terminated unexpectedly'));
    await health.check();
    expect(health.report()).toMatchObject({ state: 'up', outages: 0, lastError: 'Connection terminated unexpectedly' });
  });
});

describe('database errors', () => {
  it('shows the real reason under an empty AggregateError (localhost on IPv6 and IPv4) and under the query wrapper', () => {
    expect(describeDatabaseError(Object.assign(new Error('password authentication failed for user "x"'), { code: '28P01' }))).toBe('password authentication failed for user "x" (28P01)');
    const both = new AggregateError([Object.assign(new Error('connect ECONNREFUSED ::1:5999'), { code: 'ECONNREFUSED' }), refused], '');
    expect(describeDatabaseError(both)).toBe('connect ECONNREFUSED ::1:5999; connect ECONNREFUSED 127.0.0.1:5432');
    const wrapped = Object.assign(new Error('Failed query: select 1\nparams: '), { cause: refused });
    expect(describeDatabaseError(wrapped)).toBe('connect ECONNREFUSED 127.0.0.1:5432');
    expect(isConnectionFailure(wrapped)).toBe(true);
  });

  it('tells connection failures (worth waiting for) from answers retrying cannot change', () => {
    // PostgreSQL SQLSTATE codes (PostgreSQL 15 manual, Appendix A): 57P01 admin shutdown, 57P03 cannot connect now, 28P01 invalid password, 3D000 invalid catalog name.
    for (const code of ['57P01', '57P03', '08006', 'ECONNRESET', 'ETIMEDOUT']) expect(isConnectionFailure(Object.assign(new Error('x'), { code }))).toBe(true);
    for (const code of ['28P01', '3D000', '42P01', '23505']) expect(isConnectionFailure(Object.assign(new Error('x'), { code }))).toBe(false);
    expect(isConnectionFailure(new Error('Connection terminated unexpectedly'))).toBe(true);
  });

  it('falls back only when the database is down', async () => {
    expect(await unlessDatabaseDown(async () => Promise.reject(refused), 'fallback')).toBe('fallback');
    await expect(unlessDatabaseDown(async () => Promise.reject(new Error('syntax error')), 'fallback')).rejects.toThrow('syntax error');
  });
});
