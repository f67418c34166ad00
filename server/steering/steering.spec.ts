import { describe, expect, it } from 'vitest';
import type { Calibration } from '../../shared/field/calibration.js';
import { DEMO_CALIBRATION } from '../../shared/field/demo-calibration.js';
import { fieldFromCurrents } from '../../shared/field/field-vector.js';
import { centralAngleDeg } from '../../shared/steering/great-circle.js';
import { targetVector } from '../../shared/steering/target.js';
import type { SetpointCommand } from '../../shared/telemetry/messages.js';
import { TOPICS } from '../../shared/telemetry/topics.js';
import { HOLD_PERIOD_MS, RAMP_PERIOD_MS, SETTLE_MS, Steering } from './steering.js';

const CAL: Calibration = { ...DEMO_CALIBRATION, id: 1, version: 1, label: 'demo' };

function rig() {
  let now = 1.8e12;
  let tripped = false;
  const sent: SetpointCommand[] = [];
  const stops: unknown[] = [];
  const steering = new Steering({
    link: { publish: (topic, payload) => topic === TOPICS.setpoints && sent.push(JSON.parse(payload) as SetpointCommand) },
    tripped: () => tripped,
    now: () => now,
  });
  steering.onTripStop((p) => stops.push(p));
  const advance = (ms: number, stepMs = 5) => {
    for (let t = 0; t < ms; t += stepMs) {
      now += stepMs;
      steering.tick();
    }
  };
  return { steering, sent, stops, advance, trip: () => (tripped = true), now: () => now };
}

const from = targetVector({ magnitudeG: 4, thetaDeg: 20, phiDeg: 0 });
const to = targetVector({ magnitudeG: 8, thetaDeg: 80, phiDeg: 90 });
const program = { from, to, rampMs: 2000, calibration: CAL, target: { magnitudeG: 8, thetaDeg: 80, phiDeg: 90, rampMs: 2000 }, actor: 'operator@tiltwatch.example', reason: 'test', runId: null, path: [] };

describe('steering the setpoints along the path', () => {
  it('sends setpoints at the ramp rate along the great circle, then at the hold rate at the target', () => {
    const { steering, sent, advance } = rig();
    steering.run(program);
    expect(steering.status().mode).toBe('ramping');
    advance(1000);
    const midway = sent.at(-1)!;
    const f = fieldFromCurrents(CAL, midway.setpointA);
    // Half the ramp: magnitude half-way, direction half the central angle from the start.
    expect(f.magnitude).toBeCloseTo(6, 1);
    expect(centralAngleDeg(from, f.vector) / centralAngleDeg(from, to)).toBeCloseTo(0.5, 1);
    const duringRamp = sent.length;
    expect(duringRamp).toBeGreaterThanOrEqual(1000 / RAMP_PERIOD_MS);
    advance(1000);
    expect(steering.status().mode).toBe('holding');
    const last = fieldFromCurrents(CAL, sent.at(-1)!.setpointA);
    expect(last.magnitude).toBeCloseTo(8, 9);
    expect(last.thetaDeg).toBeCloseTo(80, 6);
    const atEnd = sent.length;
    advance(5000);
    expect(sent.length - atEnd).toBeGreaterThanOrEqual(5000 / HOLD_PERIOD_MS - 1);
    expect(sent.length - atEnd).toBeLessThanOrEqual(5000 / HOLD_PERIOD_MS + 1);
  });

  it('tells the alarms the target direction and suppresses ramp alarms until the currents settled', () => {
    const { steering, advance } = rig();
    expect(steering.alarmContext()).toEqual({ targetDirection: null, rampProgrammed: false });
    steering.run(program);
    expect(steering.alarmContext().rampProgrammed).toBe(true);
    advance(2000 + SETTLE_MS - 10);
    expect(steering.alarmContext().rampProgrammed).toBe(true);
    advance(20);
    const context = steering.alarmContext();
    expect(context.rampProgrammed).toBe(false);
    expect(centralAngleDeg(context.targetDirection!, to)).toBeLessThan(1e-9);
  });

  it('holds the present field on abort and stops sending on a trip', () => {
    const { steering, sent, stops, advance, trip } = rig();
    steering.run(program);
    advance(500);
    const held = steering.holdHere('operator@tiltwatch.example', 'looks wrong')!;
    expect(steering.status().mode).toBe('holding');
    advance(600);
    const f = fieldFromCurrents(CAL, sent.at(-1)!.setpointA);
    expect(centralAngleDeg(f.vector, held)).toBeLessThan(1e-9);
    trip();
    const count = sent.length;
    advance(2000);
    expect(sent.length).toBe(count);
    expect(steering.status().mode).toBe('idle');
    expect(steering.status().lastStop?.why).toMatch(/tripped/);
    expect(stops).toHaveLength(1);
  });

describe('the steering state across a restart', () => {
  it('stores each change, and restores a reached target for the alarms without sending anything', () => {
    const before = rig();
    const states: unknown[] = [];
    before.steering.onChange((state) => states.push(state));
    before.steering.run(program);
    expect(states).toHaveLength(1);
    expect(before.steering.stored().program).toMatchObject({ target: program.target, reached: false });
    before.advance(2100);
    expect(states).toHaveLength(2);
    const stored = before.steering.stored();
    expect(stored.program).toMatchObject({ reached: true, actor: 'operator@tiltwatch.example', reason: 'test' });

    const after = rig();
    after.steering.restore(JSON.parse(JSON.stringify(stored)));
    after.steering.start();
    after.advance(3000);
    after.steering.close();
    expect(after.sent).toEqual([]);
    expect(after.steering.status()).toMatchObject({ mode: 'restored', target: program.target });
    expect(after.steering.fieldNow()).toBeNull();
    const context = after.steering.alarmContext();
    expect(context.rampProgrammed).toBe(false);
    expect(centralAngleDeg(context.targetDirection!, to)).toBeLessThan(1e-9);
  });

  it('restores a ramp under way as interrupted: no target for the alarms, no setpoints, and a trip clears it', () => {
    const before = rig();
    before.steering.run(program);
    before.advance(500);
    const after = rig();
    after.steering.restore(before.steering.stored());
    after.advance(3000);
    expect(after.sent).toEqual([]);
    expect(after.steering.status().mode).toBe('interrupted');
    expect(after.steering.alarmContext()).toEqual({ targetDirection: null, rampProgrammed: false });
    after.trip();
    after.advance(10);
    expect(after.steering.status()).toMatchObject({ mode: 'idle', lastStop: { why: expect.stringMatching(/tripped/) } });
    expect(after.stops).toEqual([]);
  });
});
});
