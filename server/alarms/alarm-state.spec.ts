import { describe, expect, it } from 'vitest';
import { AlarmStateMachine } from './alarm-state.js';
import { parseAlarmLimit, type AlarmLimit } from './alarm-limit.js';
import { AlarmRequestError } from './alarm-request-error.js';

const T0 = Date.UTC(2026, 2, 12, 9, 0, 0);

function limit(overrides: Partial<AlarmLimit> = {}): AlarmLimit {
  return parseAlarmLimit({
    id: 'temperature.x.H',
    channel: 'temperature.x',
    level: 'H',
    limit: 55,
    deadband: 2,
    onDelayMs: 0,
    offDelayMs: 0,
    priority: 'medium',
    latching: false,
    rationale: { cause: 'warm coil', consequence: 'trip later', action: 'check the flow', respondWithinMin: 10 },
    ...overrides,
  });
}

/** An alarm driven by a fake clock: `at(ms, value)` evaluates `ms` after T0. */
function alarmWith(overrides: Partial<AlarmLimit> = {}) {
  const alarm = new AlarmStateMachine(limit(overrides));
  const at = (ms: number, value: number | undefined, ramp = false) => alarm.evaluate(value, T0 + ms, ramp);
  return { alarm, at };
}

describe('AlarmStateMachine: annunciated states', () => {
  it('goes from normal to unacknowledged when a high value passes the limit', () => {
    const { alarm, at } = alarmWith();
    expect(at(0, 50)).toEqual([]);
    const events = at(100, 56);
    expect(events).toEqual([
      {
        alarmId: 'temperature.x.H',
        channel: 'temperature.x',
        priority: 'medium',
        kind: 'raise',
        at: T0 + 100,
        from: 'normal',
        to: 'unacknowledged',
        value: 56,
        limit: 55,
        conditionSince: T0 + 100,
      },
    ]);
    expect(alarm.state).toBe('unacknowledged');
    expect(alarm.raisedAt).toBe(T0 + 100);
  });

  it('keeps the value at the raise apart from the present value, and when the condition began', () => {
    const { alarm, at } = alarmWith({ onDelayMs: 500 });
    at(0, 50);
    at(100, 56);
    expect(at(600, 57)).toMatchObject([{ kind: 'raise', at: T0 + 600, value: 57, conditionSince: T0 + 100 }]);
    at(900, 61.5);
    expect(alarm.valueAtRaise).toBe(57);
    expect(alarm.value).toBe(61.5);
    expect(alarm.conditionSince).toBe(T0 + 100);
  });

  it('remembers its state across a restart: a new machine that adopts the memory behaves the same', () => {
    const { alarm, at } = alarmWith();
    at(0, 56);
    alarm.acknowledge('operator@tiltwatch.example', T0 + 1000);
    const revived = new AlarmStateMachine(alarm.limit);
    revived.adopt(structuredClone(alarm.memory()));
    expect(revived.state).toBe('acknowledged');
    expect(revived.raisedAt).toBe(T0);
    expect(revived.valueAtRaise).toBe(56);
    expect(revived.evaluate(50, T0 + 2000, false)).toMatchObject([{ kind: 'clear', from: 'acknowledged', to: 'normal' }]);
  });

  it('raises a low-level alarm when the value falls below the limit', () => {
    const { alarm, at } = alarmWith({ id: 'flow.x.L', channel: 'flow.x', level: 'L', limit: 1.5, deadband: 0.2 });
    at(0, 1.6);
    expect(alarm.state).toBe('normal');
    expect(at(10, 1.4).map((e) => e.to)).toEqual(['unacknowledged']);
  });

  it('does not raise at exactly the limit', () => {
    const { alarm, at } = alarmWith();
    at(0, 55);
    expect(alarm.state).toBe('normal');
  });

  it('goes from unacknowledged to acknowledged and records who acknowledged', () => {
    const { alarm, at } = alarmWith();
    at(0, 56);
    const event = alarm.acknowledge('operator@tiltwatch.example', T0 + 500);
    expect(event).toMatchObject({ kind: 'acknowledge', from: 'unacknowledged', to: 'acknowledged', actor: 'operator@tiltwatch.example', at: T0 + 500 });
  });

  it('returns from acknowledged to normal when the condition clears', () => {
    const { alarm, at } = alarmWith();
    at(0, 56);
    alarm.acknowledge('op', T0 + 1);
    expect(at(10, 40)).toMatchObject([{ kind: 'clear', from: 'acknowledged', to: 'normal' }]);
    expect(alarm.raisedAt).toBeNull();
  });

  it('goes from unacknowledged to returned-unacknowledged when the condition clears before acknowledgement', () => {
    const { alarm, at } = alarmWith();
    at(0, 56);
    expect(at(10, 40)).toMatchObject([{ kind: 'clear', from: 'unacknowledged', to: 'returned-unacknowledged' }]);
  });

  it('goes from returned-unacknowledged to normal on acknowledgement', () => {
    const { alarm, at } = alarmWith();
    at(0, 56);
    at(10, 40);
    expect(alarm.acknowledge('op', T0 + 20)).toMatchObject({ from: 'returned-unacknowledged', to: 'normal' });
  });

  it('goes from returned-unacknowledged back to unacknowledged when the condition returns', () => {
    const { alarm, at } = alarmWith();
    at(0, 56);
    at(10, 40);
    expect(at(20, 57)).toMatchObject([{ kind: 'raise', from: 'returned-unacknowledged', to: 'unacknowledged' }]);
  });

  it('has nothing to acknowledge in normal or acknowledged', () => {
    const { alarm, at } = alarmWith();
    expect(alarm.acknowledge('op', T0)).toBeNull();
    at(0, 56);
    alarm.acknowledge('op', T0 + 1);
    expect(alarm.acknowledge('op', T0 + 2)).toBeNull();
  });

  it('keeps its condition when a value is missing', () => {
    const { alarm, at } = alarmWith();
    at(0, 56);
    expect(at(10, undefined)).toEqual([]);
    expect(at(20, Number.NaN)).toEqual([]);
    expect(alarm.state).toBe('unacknowledged');
    expect(alarm.value).toBe(56);
  });
});

describe('AlarmStateMachine: deadband and delays', () => {
  it('stays active inside the deadband and clears only at limit minus deadband', () => {
    const { alarm, at } = alarmWith({ limit: 55, deadband: 2 });
    at(0, 56);
    expect(at(10, 54)).toEqual([]);
    expect(at(20, 53.01)).toEqual([]);
    expect(alarm.state).toBe('unacknowledged');
    expect(at(30, 53).map((e) => e.kind)).toEqual(['clear']);
  });

  it('clears a low-level alarm only at limit plus deadband', () => {
    const { alarm, at } = alarmWith({ id: 'flow.x.L', channel: 'flow.x', level: 'L', limit: 1.5, deadband: 0.2 });
    at(0, 1.4);
    expect(at(10, 1.6)).toEqual([]);
    expect(alarm.state).toBe('unacknowledged');
    expect(at(20, 1.7).map((e) => e.kind)).toEqual(['clear']);
  });

  it('raises only after the condition held for the whole on-delay', () => {
    const { alarm, at } = alarmWith({ onDelayMs: 300 });
    expect(at(0, 56)).toEqual([]);
    expect(at(299, 56)).toEqual([]);
    expect(at(300, 56).map((e) => e.kind)).toEqual(['raise']);
    expect(alarm.raisedAt).toBe(T0 + 300);
  });

  it('restarts the on-delay when the condition breaks before it elapses', () => {
    const { alarm, at } = alarmWith({ onDelayMs: 300 });
    at(0, 56);
    at(200, 50);
    at(250, 56);
    expect(at(500, 56)).toEqual([]);
    expect(at(550, 56).map((e) => e.kind)).toEqual(['raise']);
    expect(alarm.state).toBe('unacknowledged');
  });

  it('returns to normal only after the condition stayed clear for the whole off-delay', () => {
    const { alarm, at } = alarmWith({ offDelayMs: 1000 });
    at(0, 56);
    alarm.acknowledge('op', T0 + 1);
    expect(at(100, 40)).toEqual([]);
    expect(at(600, 56)).toEqual([]);
    expect(at(700, 40)).toEqual([]);
    expect(at(1699, 40)).toEqual([]);
    expect(at(1700, 40)).toMatchObject([{ kind: 'clear', to: 'normal' }]);
  });
});

describe('AlarmStateMachine: latching', () => {
  it('stays latched after the condition clears, whether or not it was acknowledged', () => {
    const unacked = alarmWith({ latching: true });
    unacked.at(0, 56);
    expect(unacked.at(10, 40)).toMatchObject([{ kind: 'clear', from: 'unacknowledged', to: 'latched' }]);

    const acked = alarmWith({ latching: true });
    acked.at(0, 56);
    acked.alarm.acknowledge('op', T0 + 5);
    expect(acked.at(10, 40)).toMatchObject([{ kind: 'clear', from: 'acknowledged', to: 'latched' }]);
  });

  it('refuses an acknowledgement of a latched alarm and says a reset is needed', () => {
    const { alarm, at } = alarmWith({ latching: true });
    at(0, 56);
    at(10, 40);
    expect(() => alarm.acknowledge('op', T0 + 20)).toThrow(/reset/);
  });

  it('refuses a reset while the condition still holds', () => {
    const { alarm, at } = alarmWith({ latching: true });
    at(0, 56);
    alarm.acknowledge('op', T0 + 5);
    expect(() => alarm.resetLatched('lead', 'flow restored', T0 + 10)).toThrow(/condition still holds/);
  });

  it('refuses a reset of an alarm that does not latch', () => {
    const { alarm, at } = alarmWith({ latching: false });
    at(0, 56);
    expect(() => alarm.resetLatched('lead', 'why not', T0 + 10)).toThrow(/not latched/);
  });

  it('returns to normal on reset once cleared, recording actor and reason', () => {
    const { alarm, at } = alarmWith({ latching: true });
    at(0, 56);
    at(10, 40);
    expect(alarm.resetLatched('lead@tiltwatch.example', 'valve reopened', T0 + 20)).toMatchObject({
      kind: 'reset',
      from: 'latched',
      to: 'normal',
      actor: 'lead@tiltwatch.example',
      reason: 'valve reopened',
    });
  });

  it('raises again from latched when the condition returns', () => {
    const { at } = alarmWith({ latching: true });
    at(0, 56);
    at(10, 40);
    expect(at(20, 58)).toMatchObject([{ kind: 'raise', from: 'latched', to: 'unacknowledged' }]);
  });
});

describe('AlarmStateMachine: shelving', () => {
  it('hides the alarm while shelved but still evaluates and logs it', () => {
    const { alarm, at } = alarmWith();
    at(0, 50);
    expect(alarm.shelve('op', 30, 'sensor being recabled', T0 + 10)).toMatchObject({
      kind: 'shelve',
      from: 'normal',
      to: 'shelved',
      actor: 'op',
      reason: 'sensor being recabled',
    });
    expect(at(20, 56)).toMatchObject([{ kind: 'raise', from: 'normal', to: 'unacknowledged', hidden: 'shelved' }]);
    expect(alarm.state).toBe('shelved');
    expect(alarm.processState).toBe('unacknowledged');
  });

  it('expires at the end of the shelving time and shows the alarm if its condition holds', () => {
    const { alarm, at } = alarmWith();
    alarm.shelve('op', 1, 'noisy during bake-out', T0);
    at(1000, 56);
    expect(at(59_999, 56)).toEqual([]);
    expect(at(60_000, 56)).toMatchObject([{ kind: 'shelve-expired', from: 'shelved', to: 'unacknowledged' }]);
    expect(alarm.shelf).toBeNull();
  });

  it('returns to normal after shelving when the hidden alarm came and went unseen', () => {
    const { alarm, at } = alarmWith();
    alarm.shelve('op', 1, 'noisy during bake-out', T0);
    at(1000, 56);
    expect(at(2000, 40)).toMatchObject([{ kind: 'clear', to: 'returned-unacknowledged', hidden: 'shelved' }]);
    expect(at(60_000, 40)).toMatchObject([{ kind: 'shelve-expired', from: 'shelved', to: 'normal' }]);
  });

  it('unshelves early on request', () => {
    const { alarm, at } = alarmWith();
    at(0, 56);
    alarm.shelve('op', 60, 'known fault, engineer on the way', T0 + 10);
    expect(alarm.unshelve('op', T0 + 20)).toMatchObject({ kind: 'unshelve', from: 'shelved', to: 'unacknowledged' });
  });

  it('refuses shelving twice, unshelving an alarm that is not shelved, and acknowledging a shelved alarm', () => {
    const { alarm, at } = alarmWith();
    at(0, 56);
    alarm.shelve('op', 60, 'known fault', T0 + 10);
    expect(() => alarm.shelve('op', 60, 'again', T0 + 20)).toThrow(/already shelved/);
    expect(() => alarm.acknowledge('op', T0 + 20)).toThrow(/shelved/);
    alarm.unshelve('op', T0 + 30);
    expect(() => alarm.unshelve('op', T0 + 40)).toThrow(/not shelved/);
  });
});

describe('AlarmStateMachine: suppression by design', () => {
  const deviation: Partial<AlarmLimit> = {
    id: 'currentDeviation.x.H',
    channel: 'currentDeviation.x',
    limit: 0.5,
    deadband: 0.1,
    suppressDuringRamp: true,
  };

  it('suppresses a ramp-suppressed alarm while a ramp is programmed and logs its raises hidden', () => {
    const { alarm, at } = alarmWith(deviation);
    expect(at(0, 0.1, true)).toMatchObject([{ kind: 'suppress', from: 'normal', to: 'suppressed' }]);
    expect(at(10, 2, true)).toMatchObject([{ kind: 'raise', hidden: 'suppressed' }]);
    expect(alarm.state).toBe('suppressed');
  });

  it('shows the alarm when the ramp ends while its condition still holds', () => {
    const { at } = alarmWith(deviation);
    at(0, 2, true);
    expect(at(10, 2, false)).toMatchObject([{ kind: 'unsuppress', from: 'suppressed', to: 'unacknowledged' }]);
  });

  it('does not suppress alarms that are not marked for it', () => {
    const { alarm, at } = alarmWith();
    expect(at(0, 56, true).map((e) => e.kind)).toEqual(['raise']);
    expect(alarm.state).toBe('unacknowledged');
  });
});

describe('AlarmStateMachine: out of service', () => {
  it('stops evaluating an alarm out of service and restarts it from normal on return', () => {
    const { alarm, at } = alarmWith({ onDelayMs: 100 });
    at(0, 56);
    at(100, 56);
    expect(alarm.setOutOfService('lead', 'sensor replaced', true, T0 + 200)).toMatchObject({
      kind: 'out-of-service',
      from: 'unacknowledged',
      to: 'out-of-service',
      reason: 'sensor replaced',
    });
    expect(at(300, 80)).toEqual([]);
    expect(at(1000, 80)).toEqual([]);
    expect(alarm.setOutOfService('lead', 'sensor back', false, T0 + 2000)).toMatchObject({ from: 'out-of-service', to: 'normal' });
    expect(at(2000, 80)).toEqual([]);
    expect(at(2100, 80).map((e) => e.kind)).toEqual(['raise']);
  });

  it('refuses shelving an alarm that is out of service', () => {
    const { alarm } = alarmWith();
    alarm.setOutOfService('lead', 'sensor replaced', true, T0);
    expect(() => alarm.shelve('op', 10, 'noisy', T0 + 1)).toThrow(AlarmRequestError);
  });
});
