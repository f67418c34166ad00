import { describe, expect, it } from 'vitest';
import { DEMO_PARAMETERS } from '../../shared/apparatus/coil-data.js';
import type { Calibration } from '../../shared/field/calibration.js';
import { DEMO_CALIBRATION } from '../../shared/field/demo-calibration.js';
import type { LiveState } from '../../shared/live/live-state.js';
import type { AuditEntry } from '../audit/audit-log.js';
import { HttpError } from '../http/http-error.js';
import { PreflightRefusal, SteerDesk } from './steer-desk.js';
import { Steering } from './steering.js';
import type { StoredSteering } from './stored-steering.js';

const CAL: Calibration = { ...DEMO_CALIBRATION, id: 1, version: 1, label: 'demo' };
const NOW = 1.8e12;
const LIVE = {
  setpoints: { x: 2, y: 1, z: 5 },
  field: null,
  waterSupplyC: 18,
  flowLpm: null,
  controller: { online: true, tripped: false, hardwareTripped: false, hardwareTripCause: null, softwareHold: false, mode: 'demo', lastFrameAt: new Date(NOW - 20).toISOString() },
} as unknown as LiveState;

function desk(audit: (e: AuditEntry, state: StoredSteering) => Promise<void>, tripped = false) {
  const sent: string[] = [];
  const steering = new Steering({ link: { publish: (_t, payload) => sent.push(payload) }, tripped: () => false, now: () => NOW });
  const d = new SteerDesk({
    steering,
    predictor: { evaluate: async (_p, dirs) => dirs.map(() => ({ fermiSurfaceAspect: 1.02, cloudAspect: 4, tofAspect: 1.01, tofMajorAngleDeg: 90, collapseRatio: 0.05 })) },
    coils: DEMO_PARAMETERS,
    calibration: () => CAL,
    live: () => LIVE,
    profile: () => ({ id: 1, name: 'p', version: 1, active: true, createdBy: 's', createdAt: '', reason: '', profile: { name: 'p', species: '167Er', atomNumber: 5e4, trapHz: [350, 80, 400], tofMs: [20], imaging: 'y' } }),
    limits: async () => ({ currentAlarmA: 18, temperatureAlarmC: 55, temperatureTripC: 65, maxFieldG: 20, collapseRatioLimit: 0.8 }),
    interlockTripped: () => tripped,
    audit,
    runActive: () => false,
    log: { info: () => undefined, warn: () => undefined, error: () => undefined },
    now: () => NOW,
  });
  return { d, sent, steering };
}

const request = { magnitudeG: 6, thetaDeg: 40, phiDeg: 10, rampMs: 2000, reason: 'test' };

describe('steer commands', () => {
  it('records the command with the steering state it leads to before anything is sent', async () => {
    const order: string[] = [];
    const states: StoredSteering[] = [];
    const { d, sent, steering } = desk(async (e, state) => {
      order.push(`audit ${e.action} (${sent.length} sent)`);
      states.push(state);
    });
    await d.setTarget('operator@tiltwatch.example', request);
    expect(order).toEqual(['audit steering.target (0 sent)']);
    expect(sent.length).toBe(1);
    expect(steering.status().mode).toBe('ramping');
    expect(states).toEqual([steering.stored()]);
    expect(states[0].program).toMatchObject({ target: { magnitudeG: 6, thetaDeg: 40, phiDeg: 10, rampMs: 2000 }, reached: false, reason: 'test' });

    await d.release('operator@tiltwatch.example', 'done');
    expect(states[1]).toEqual({ program: null, lastStop: { at: expect.any(String), why: 'released by operator@tiltwatch.example: done' } });
  });

  it('sends nothing and answers 503 when the record cannot be written', async () => {
    const { d, sent, steering } = desk(async () => {
      throw new Error('database down');
    });
    await expect(d.setTarget('operator@tiltwatch.example', request)).rejects.toMatchObject({ status: 503 });
    expect(sent).toEqual([]);
    expect(steering.status().mode).toBe('idle');
  });

  it('answers 409 while tripped and 422 with the checks when the pre-flight fails', async () => {
    const tripped = desk(async () => undefined, true);
    await expect(tripped.d.setTarget('operator@tiltwatch.example', request)).rejects.toBeInstanceOf(HttpError);
    const { d, sent } = desk(async () => undefined);
    const refusal = await d.setTarget('operator@tiltwatch.example', { ...request, magnitudeG: 50 }).catch((e: unknown) => e);
    expect(refusal).toBeInstanceOf(PreflightRefusal);
    expect((refusal as PreflightRefusal).result.checks.find((c) => c.name === 'field-magnitude')!.ok).toBe(false);
    expect(sent).toEqual([]);
  });
});
