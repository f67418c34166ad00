import { describe, expect, it } from 'vitest';
import { angleBetweenDeg, channelValues } from './channel-values.js';
import type { LiveState } from '../../shared/live/live-state.js';
import { directionFromAngles } from '../../shared/field/field-vector.js';

const NOW = Date.UTC(2026, 2, 12, 9, 0, 0);

function live(overrides: Partial<LiveState> = {}): LiveState {
  return {
    time: new Date(NOW - 40).toISOString(),
    currents: { x: -12.5, y: 3, z: 7 },
    setpoints: { x: -12, y: 3, z: 7.25 },
    voltageV: { x: -6, y: 1.5, z: 3.5 },
    temperatureC: { x: 41, y: 30, z: 35 },
    flowLpm: { x: 3.1, y: 3.3, z: 2.9 },
    waterSupplyC: 18,
    waterReturnC: { x: 24, y: 21, z: 23 },
    field: { vector: { x: 0, y: 0, z: 10 }, magnitude: 10, thetaDeg: 0, phiDeg: 0 },
    fieldUncertainty: null,
    calibration: { id: 1, version: 1, label: 'demo' },
    controller: {
      online: true,
      tripped: false,
      hardwareTripped: false,
      hardwareTripCause: null,
      softwareHold: false,
      mode: 'demo',
      lastFrameAt: new Date(NOW - 40).toISOString(),
    },
    prediction: null,
    predictionStatus: { state: 'applies', fieldG: 10, minFieldG: 0.5, reason: null },
    ...overrides,
  };
}

describe('channelValues', () => {
  it('takes absolute currents and their deviation from the setpoint', () => {
    const v = channelValues(live(), NOW);
    expect(v['current.x']).toBe(12.5);
    expect(v['currentDeviation.x']).toBeCloseTo(0.5, 12);
    expect(v['currentDeviation.z']).toBeCloseTo(0.25, 12);
  });

  it('copies temperatures, flows, water temperatures and field magnitude', () => {
    const v = channelValues(live(), NOW);
    expect(v).toMatchObject({ 'temperature.x': 41, 'flow.z': 2.9, waterSupply: 18, 'waterReturn.y': 21, fieldMagnitude: 10 });
  });

  it('measures staleness as the time since the newest frame was heard', () => {
    expect(channelValues(live(), NOW, { lastFrameAtMs: NOW - 40 }).stale).toBe(40);
  });

  it('leaves out everything the live state does not have yet, including staleness before the first frame', () => {
    const empty = live({
      time: null,
      currents: null,
      setpoints: null,
      temperatureC: null,
      flowLpm: null,
      waterSupplyC: null,
      waterReturnC: null,
      field: null,
      prediction: null,
    });
    empty.controller = { ...empty.controller, online: false, lastFrameAt: null };
    expect(channelValues(empty, NOW)).toEqual({});
  });

  it('gives the field-angle deviation only while a target direction is set', () => {
    expect(channelValues(live(), NOW).fieldAngleDeviation).toBeUndefined();
    const target = directionFromAngles(3, 0);
    expect(channelValues(live(), NOW, { targetDirection: target }).fieldAngleDeviation).toBeCloseTo(3, 9);
  });

  it('takes the collapse ratio from the prediction when there is one', () => {
    expect(channelValues(live(), NOW).collapseRatio).toBeUndefined();
    const prediction = { collapseRatio: 0.42 } as NonNullable<LiveState['prediction']>;
    expect(channelValues(live({ prediction }), NOW).collapseRatio).toBe(0.42);
  });
});

describe('angleBetweenDeg', () => {
  it('is exact at 0°, 90° and 180° and ignores vector length', () => {
    expect(angleBetweenDeg({ x: 0, y: 0, z: 2 }, { x: 0, y: 0, z: 7 })).toBe(0);
    expect(angleBetweenDeg({ x: 1, y: 0, z: 0 }, { x: 0, y: 3, z: 0 })).toBe(90);
    expect(angleBetweenDeg({ x: 1, y: 0, z: 0 }, { x: -1, y: 0, z: 0 })).toBe(180);
  });

  it('resolves small angles that acos of the dot product would lose', () => {
    const tiny = 1e-7; // rad
    expect(angleBetweenDeg({ x: 0, y: 0, z: 1 }, { x: Math.sin(tiny), y: 0, z: Math.cos(tiny) })).toBeCloseTo((tiny * 180) / Math.PI, 15);
  });

  it('is NaN when a vector is zero', () => {
    expect(angleBetweenDeg({ x: 0, y: 0, z: 0 }, { x: 0, y: 0, z: 1 })).toBeNaN();
  });
});
