import { describe, expect, it } from 'vitest';
import { DEFAULT_THROTTLE_RULES, SignInThrottle, type ThrottleEvent } from './sign-in-throttle.js';

function throttle(rules = DEFAULT_THROTTLE_RULES) {
  let t = 1_000_000;
  const events: ThrottleEvent[] = [];
  const th = new SignInThrottle(rules, (e) => events.push(e), () => t);
  return { th, events, advance: (ms: number) => (t += ms) };
}

describe('sign-in throttle', () => {
  it('lets the first failures of an account through, then makes each next attempt wait a doubling, capped delay', () => {
    const { th, events, advance } = throttle();
    const delays: number[] = [];
    for (let i = 0; i < 10; i++) {
      const verdict = th.check('lead@x.example', 'a1');
      expect(verdict.allowed).toBe(true);
      th.failed('lead@x.example', `a${i}`); // different addresses: only the account throttle acts
      const next = th.check('lead@x.example', 'a1');
      const wait = next.allowed ? 0 : next.retryAfterMs;
      delays.push(wait);
      advance(wait);
    }
    expect(delays).toEqual([0, 0, 0, 1000, 2000, 4000, 8000, 16000, 30000, 30000]);
    expect(events.filter((e) => e.kind === 'sign-in.account-delayed')).toHaveLength(7);
    expect(events[0]).toMatchObject({ kind: 'sign-in.account-delayed', email: 'lead@x.example', failures: 4, delayMs: 1000 });
  });

  it('never delays another account, and a success clears the account', () => {
    const { th } = throttle();
    for (let i = 0; i < 4; i++) th.failed('lead@x.example', `a${i}`);
    expect(th.check('lead@x.example', 'b').allowed).toBe(false);
    expect(th.check('viewer@x.example', 'b').allowed).toBe(true);
    th.succeeded('lead@x.example');
    expect(th.check('lead@x.example', 'b').allowed).toBe(true);
  });

  it('forgets an account’s failures after the quiet period', () => {
    const { th, advance } = throttle();
    for (let i = 0; i < 4; i++) th.failed('lead@x.example', `a${i}`);
    advance(DEFAULT_THROTTLE_RULES.forgetAfterMs + 1);
    th.failed('lead@x.example', 'z');
    expect(th.check('lead@x.example', 'z').allowed).toBe(true);
  });

  it('throttles one address failing across many accounts (spraying) for the rest of the window, and reports it once', () => {
    const { th, events, advance } = throttle({ ...DEFAULT_THROTTLE_RULES, addressFailures: 5 });
    for (let i = 0; i < 5; i++) {
      expect(th.check(`user${i}@x.example`, '10.0.0.9').allowed).toBe(true);
      th.failed(`user${i}@x.example`, '10.0.0.9');
      advance(1000);
    }
    const refused = th.check('someone-else@x.example', '10.0.0.9');
    expect(refused).toEqual({ allowed: false, scope: 'address', retryAfterMs: 55_000 });
    expect(th.check('someone-else@x.example', '10.0.0.10').allowed).toBe(true);
    expect(events.filter((e) => e.kind === 'sign-in.address-throttled')).toEqual([
      { kind: 'sign-in.address-throttled', address: '10.0.0.9', failures: 5, windowMs: 60_000 },
    ]);
    advance(55_000);
    expect(th.check('someone-else@x.example', '10.0.0.9').allowed).toBe(true);
  });

  it('lists the throttles in force and lets an admin lift them', () => {
    const { th } = throttle({ ...DEFAULT_THROTTLE_RULES, addressFailures: 4 });
    for (let i = 0; i < 4; i++) th.failed('lead@x.example', '10.0.0.9');
    expect(th.status()).toEqual([
      { scope: 'account', key: 'lead@x.example', failures: 4, blockedUntil: expect.any(String) },
      { scope: 'address', key: '10.0.0.9', failures: 4, blockedUntil: expect.any(String) },
    ]);
    expect(th.lift({ email: 'lead@x.example' })).toBe(true);
    expect(th.lift({ address: '10.0.0.9' })).toBe(true);
    expect(th.lift({ email: 'lead@x.example' })).toBe(false);
    expect(th.check('lead@x.example', '10.0.0.9').allowed).toBe(true);
    expect(th.status()).toEqual([]);
  });
});
