import { describe, expect, it } from 'vitest';
import { AlarmBook } from './alarm-book.js';
import { DEMO_ALARM_LIMITS } from './demo-alarm-limits.js';
import { AlarmRequestError } from './alarm-request-error.js';
import type { ChannelValues } from './channels.js';

const T0 = Date.UTC(2026, 2, 12, 9, 0, 0);
const OPERATOR = 'operator@tiltwatch.example';

/** A book of the demo limits driven by a fake clock. */
function demoBook() {
  const clock = { now: T0 };
  const book = new AlarmBook(DEMO_ALARM_LIMITS, { clock: () => clock.now });
  const at = (ms: number, values: ChannelValues, rampProgrammed = false) => {
    clock.now = T0 + ms;
    return book.evaluate(values, clock.now, { rampProgrammed });
  };
  return { book, clock, at };
}

const calm: ChannelValues = { 'flow.x': 3.2, 'temperature.x': 38, 'current.x': 8 };

function requestError(fn: () => unknown): AlarmRequestError {
  try {
    fn();
  } catch (err) {
    if (err instanceof AlarmRequestError) return err;
    throw err;
  }
  throw new Error('expected the request to be refused');
}

describe('AlarmBook', () => {
  it('changes its revision on transitions and operator actions, not on new values alone', () => {
    const { book, at } = demoBook();
    at(0, calm);
    const quiet = book.revision();
    at(100, { ...calm, 'current.x': 8.5 });
    expect(book.revision()).toBe(quiet);
    at(300, { ...calm, 'current.x': 18.5 });
    at(500, { ...calm, 'current.x': 18.6 });
    const raised = book.revision();
    expect(raised).not.toBe(quiet);
    at(600, { ...calm, 'current.x': 18.7 });
    expect(book.revision()).toBe(raised);
    book.acknowledge('current.x.H', OPERATOR);
    expect(book.revision()).not.toBe(raised);
  });

  it('evaluates each alarm against the value of its own channel', () => {
    const { at } = demoBook();
    at(0, calm);
    at(300, { ...calm, 'current.x': 18.5 });
    const events = at(500, { ...calm, 'current.x': 18.5 });
    expect(events.map((e) => e.alarmId)).toEqual(['current.x.H']);
  });

  it('lists active alarms with id, channel, priority, state, raise time, value and limit', () => {
    const { book, at } = demoBook();
    at(0, { ...calm, 'current.x': 19 });
    at(200, { ...calm, 'current.x': 19 });
    expect(book.active()).toEqual([
      {
        id: 'current.x.H',
        channel: 'current.x',
        priority: 'medium',
        state: 'unacknowledged',
        raisedAt: T0 + 200,
        conditionSince: T0,
        value: 19,
        valueAtRaise: 19,
        limit: 18,
        firstOut: false,
      },
    ]);
  });

  it('lists high-priority alarms before lower ones', () => {
    const { book, at } = demoBook();
    at(0, { 'current.y': 19 });
    at(200, { 'current.y': 19, stale: 800 });
    expect(book.active().map((a) => a.id)).toEqual(['stale.H', 'current.y.H']);
  });

  it('leaves shelved alarms out of the active list but keeps them in the full list', () => {
    const { book, clock, at } = demoBook();
    at(0, { stale: 900 });
    book.shelve('stale.H', OPERATOR, 15, 'controller firmware update');
    expect(book.active()).toEqual([]);
    expect(book.list().find((a) => a.id === 'stale.H')).toMatchObject({
      state: 'shelved',
      shelf: { by: OPERATOR, reason: 'controller firmware update', since: clock.now, until: clock.now + 15 * 60_000 },
    });
  });

  it('acknowledges through the injected clock', () => {
    const { book, clock, at } = demoBook();
    at(0, { stale: 900 });
    clock.now = T0 + 4000;
    expect(book.acknowledge('stale.H', OPERATOR)).toMatchObject({ at: T0 + 4000, to: 'acknowledged', actor: OPERATOR });
  });

  it('refuses an unknown alarm id with not-found', () => {
    const { book } = demoBook();
    const err = requestError(() => book.acknowledge('nope', OPERATOR));
    expect(err.code).toBe('not-found');
    expect(err.message).toContain('"nope"');
  });

  it('refuses shelving without a reason and says a reason is required', () => {
    const { book } = demoBook();
    for (const reason of [undefined, '', '   ', 42]) {
      const err = requestError(() => book.shelve('stale.H', OPERATOR, 10, reason));
      expect(err.code).toBe('invalid');
      expect(err.message).toMatch(/Reason: is required/);
    }
  });

  it('refuses shelving times outside 0 < minutes ≤ 8 h and names the range', () => {
    const { book } = demoBook();
    for (const minutes of [0, -5, 481, Number.NaN, '10', undefined]) {
      const err = requestError(() => book.shelve('stale.H', OPERATOR, minutes, 'noisy'));
      expect(err.code).toBe('invalid');
      expect(err.message).toMatch(/at most 480/);
    }
    expect(book.shelve('stale.H', OPERATOR, 480, 'whole shift of maintenance')).toMatchObject({ to: 'shelved' });
  });

  it('requires a reason to take an alarm out of service and to reset a latched alarm', () => {
    const { book } = demoBook();
    expect(requestError(() => book.setOutOfService('flow.x.LL', 'lead', '', true)).code).toBe('invalid');
    expect(requestError(() => book.resetLatched('flow.x.LL', 'lead', undefined)).code).toBe('invalid');
  });

  it('suppresses the current-deviation alarms while a ramp is programmed', () => {
    const { book, at } = demoBook();
    at(0, { 'currentDeviation.x': 2 }, true);
    at(400, { 'currentDeviation.x': 2 }, true);
    expect(book.active()).toEqual([]);
    expect(book.list().find((a) => a.id === 'currentDeviation.x.H')?.state).toBe('suppressed');
    at(500, { 'currentDeviation.x': 2 }, false);
    expect(book.active().map((a) => a.id)).toEqual(['currentDeviation.x.H']);
  });

  it('applies a changed limit on the next evaluation, keeps the state and returns the old limit', () => {
    const { book, at } = demoBook();
    const old = DEMO_ALARM_LIMITS.find((l) => l.id === 'current.x.H')!;
    expect(book.updateLimit({ ...old, limit: 15 })).toEqual(old);
    at(0, { 'current.x': 16 });
    at(200, { 'current.x': 16 });
    expect(book.active()).toMatchObject([{ id: 'current.x.H', limit: 15 }]);
  });

  it('refuses a limit change that puts H above HH on the same channel', () => {
    const { book } = demoBook();
    const h = DEMO_ALARM_LIMITS.find((l) => l.id === 'temperature.x.H')!;
    const err = requestError(() => book.updateLimit({ ...h, limit: 61 }));
    expect(err.code).toBe('invalid');
    expect(err.message).toMatch(/the high alarm \(H\) at 61 °C must lie below the high-high alarm \(HH\) at 60 °C/);
  });

  it('refuses a limit change that moves an alarm to another channel', () => {
    const { book } = demoBook();
    const h = DEMO_ALARM_LIMITS.find((l) => l.id === 'temperature.x.H')!;
    expect(requestError(() => book.updateLimit({ ...h, channel: 'temperature.y' })).message).toMatch(/needs a new id/);
  });
});

describe('AlarmBook: first-out grouping of a cooling loss', () => {
  /** Flow of pair x collapses at 1 s; the coil then heats up through H and HH. */
  function coolingLoss() {
    const demo = demoBook();
    const { at } = demo;
    const raised: { id: string; firstOutOf?: string }[] = [];
    const step = (ms: number, flow: number, temperature: number) => {
      for (const e of at(ms, { 'flow.x': flow, 'temperature.x': temperature })) {
        if (e.kind === 'raise') raised.push({ id: e.alarmId, ...(e.firstOutOf ? { firstOutOf: e.firstOutOf } : {}) });
      }
    };
    step(0, 3.2, 38);
    step(1000, 0.9, 40);
    step(1500, 0.9, 44);
    step(2000, 0.9, 49);
    step(3000, 0.9, 56);
    step(4000, 0.9, 58);
    step(5000, 0.9, 61);
    step(6000, 0.9, 63);
    return { ...demo, raised };
  }

  it('marks the first raise as first out and groups the cascade under it', () => {
    const { raised } = coolingLoss();
    expect(raised).toEqual([
      { id: 'flow.x.LL' },
      { id: 'flow.x.L', firstOutOf: 'flow.x.LL' },
      { id: 'temperature.x.H', firstOutOf: 'flow.x.LL' },
      { id: 'temperature.x.HH', firstOutOf: 'flow.x.LL' },
    ]);
  });

  it('shows the grouping in the active list', () => {
    const { book } = coolingLoss();
    const active = book.active();
    expect(active.find((a) => a.id === 'flow.x.LL')).toMatchObject({ firstOut: true });
    expect(active.find((a) => a.id === 'flow.x.LL')?.firstOutOf).toBeUndefined();
    expect(active.filter((a) => a.firstOutOf === 'flow.x.LL').map((a) => a.id).sort()).toEqual(['flow.x.L', 'temperature.x.H', 'temperature.x.HH']);
  });

  it('starts a new group for a raise after the first-out window', () => {
    const { at } = coolingLoss();
    const later = at(20_000, { 'flow.x': 0.9, 'temperature.x': 63, 'current.y': 19 });
    at(20_200, { 'flow.x': 0.9, 'temperature.x': 63, 'current.y': 19 }).forEach((e) => later.push(e));
    const raise = later.find((e) => e.alarmId === 'current.y.H');
    expect(raise?.kind).toBe('raise');
    expect(raise?.firstOutOf).toBeUndefined();
  });
});

describe('AlarmBook: first-out by the time the condition began', () => {
  it('puts the alarm whose condition began first at the head, although its longer on-delay annunciates it last', () => {
    const { book, at } = demoBook();
    // Flow of pair x sinks below its L level (1.0 s on-delay) at t = 0; at t = 0.1 s the current
    // of pair x leaves its setpoint (0.3 s on-delay), so the deviation is annunciated first.
    at(0, { 'flow.x': 1.4, 'currentDeviation.x': 0 });
    at(100, { 'flow.x': 1.4, 'currentDeviation.x': 0.8 });
    const early = at(400, { 'flow.x': 1.4, 'currentDeviation.x': 0.8 });
    expect(early).toMatchObject([{ alarmId: 'currentDeviation.x.H', kind: 'raise', conditionSince: T0 + 100 }]);
    const late = at(1000, { 'flow.x': 1.4, 'currentDeviation.x': 0.8 });
    expect(late).toMatchObject([{ alarmId: 'flow.x.L', kind: 'raise', conditionSince: T0 }]);
    expect(late[0].firstOutOf).toBeUndefined();

    const active = book.active();
    expect(active.find((a) => a.id === 'flow.x.L')).toMatchObject({ firstOut: true, conditionSince: T0 });
    expect(active.find((a) => a.id === 'currentDeviation.x.H')).toMatchObject({ firstOut: false, firstOutOf: 'flow.x.L' });
    // Same priority: listed by the time the condition began, not by annunciation.
    expect(active.map((a) => a.id)).toEqual(['flow.x.L', 'currentDeviation.x.H']);
  });

  it('moves alarms already grouped under the former head to the new head', () => {
    const { book, at } = demoBook();
    at(0, { 'flow.x': 1.4, 'currentDeviation.x': 0, 'currentDeviation.y': 0 });
    at(100, { 'flow.x': 1.4, 'currentDeviation.x': 0.8, 'currentDeviation.y': 0 });
    at(200, { 'flow.x': 1.4, 'currentDeviation.x': 0.8, 'currentDeviation.y': 0.8 });
    at(400, { 'flow.x': 1.4, 'currentDeviation.x': 0.8, 'currentDeviation.y': 0.8 });
    at(500, { 'flow.x': 1.4, 'currentDeviation.x': 0.8, 'currentDeviation.y': 0.8 });
    expect(book.active().find((a) => a.id === 'currentDeviation.y.H')?.firstOutOf).toBe('currentDeviation.x.H');
    at(1000, { 'flow.x': 1.4, 'currentDeviation.x': 0.8, 'currentDeviation.y': 0.8 });
    const grouped = book.active().filter((a) => a.firstOutOf === 'flow.x.L').map((a) => a.id);
    expect(grouped.sort()).toEqual(['currentDeviation.x.H', 'currentDeviation.y.H']);
  });
});

describe('AlarmBook: actions stored before they take effect', () => {
  it('leaves the alarm as it was until the prepared action is committed, and unchanged when it is cancelled', () => {
    const { book, at } = demoBook();
    at(0, { stale: 900 });
    const prepared = book.prepare('stale.H', OPERATOR, { kind: 'acknowledge' });
    expect(prepared?.event).toMatchObject({ kind: 'acknowledge', to: 'acknowledged', actor: OPERATOR });
    expect(prepared?.memory.process).toBe('acknowledged');
    expect(book.active()[0].state).toBe('unacknowledged');
    expect(requestError(() => book.prepare('stale.H', OPERATOR, { kind: 'acknowledge' })).code).toBe('conflict');
    prepared!.cancel();
    expect(book.active()[0].state).toBe('unacknowledged');
    book.prepare('stale.H', OPERATOR, { kind: 'acknowledge' })!.commit();
    expect(book.active()[0].state).toBe('acknowledged');
  });

  it('keeps taking the present value while an action is being stored, and evaluates again afterwards', () => {
    const { book, at } = demoBook();
    at(0, { stale: 900 });
    const prepared = book.prepare('stale.H', OPERATOR, { kind: 'acknowledge' })!;
    expect(at(100, { stale: 0 })).toEqual([]);
    expect(book.active()[0]).toMatchObject({ value: 0, valueAtRaise: 900 });
    prepared.commit();
    at(200, { stale: 0 });
    expect(at(1300, { stale: 0 })).toMatchObject([{ alarmId: 'stale.H', kind: 'clear', from: 'acknowledged', to: 'normal' }]);
  });

  it('restores remembered states into a new book (a restart)', () => {
    const { book, at } = demoBook();
    at(0, { stale: 900, 'current.y': 19 });
    at(200, { stale: 900, 'current.y': 19 });
    book.acknowledge('stale.H', OPERATOR);
    book.shelve('current.y.H', OPERATOR, 30, 'supply under repair');
    book.setOutOfService('flow.z.L', OPERATOR, 'flow meter replaced', true);
    const revived = new AlarmBook(DEMO_ALARM_LIMITS, { clock: () => T0 + 300 });
    revived.restore(structuredClone(book.memories()));
    const states = Object.fromEntries(revived.list().map((a) => [a.id, a.state]));
    expect(states).toMatchObject({ 'stale.H': 'acknowledged', 'current.y.H': 'shelved', 'flow.z.L': 'out-of-service' });
    expect(revived.list().find((a) => a.id === 'current.y.H')?.shelf).toMatchObject({ by: OPERATOR, reason: 'supply under repair' });
  });
});

describe('AlarmBook: a finished group is not reopened', () => {
  it('files a new fault under its own first-out once every condition of the earlier group has cleared', () => {
    const { book, at } = demoBook();
    // A ramp raises the deviation alarms for a moment; they clear (off-delay 1 s) before the flow falls.
    at(0, { 'currentDeviation.x': 0.8, 'flow.x': 3.2 });
    at(300, { 'currentDeviation.x': 0.8, 'flow.x': 3.2 });
    at(400, { 'currentDeviation.x': 0, 'flow.x': 3.2 });
    at(1400, { 'currentDeviation.x': 0, 'flow.x': 3.2 });
    at(2000, { 'currentDeviation.x': 0, 'flow.x': 1.4 });
    const raise = at(3000, { 'currentDeviation.x': 0, 'flow.x': 1.4 });
    expect(raise).toMatchObject([{ alarmId: 'flow.x.L', kind: 'raise' }]);
    expect(raise[0].firstOutOf).toBeUndefined();
    expect(book.active().find((a) => a.id === 'flow.x.L')).not.toHaveProperty('firstOutOf');
  });
});

