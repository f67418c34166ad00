import { describe, expect, it } from 'vitest';
import { DEMO_PARAMETERS } from '../../shared/apparatus/coil-data.js';
import { DEMO_CALIBRATION } from '../../shared/field/demo-calibration.js';
import type { PlannedPoint } from '../../shared/steering/steering-api.js';
import { targetVector } from '../../shared/steering/target.js';
import { plannedPoints } from './planner.js';
import { drivableRate, preflight, type ApparatusNow, type PreflightLimits } from './preflight.js';

const LIMITS: PreflightLimits = { currentAlarmA: 18, temperatureAlarmC: 55, temperatureTripC: 65, maxFieldG: 20, collapseRatioLimit: 0.8 };
const NOW: ApparatusNow = { controllerOnline: true, reporting: true, interlockTripped: false, hardwareTripped: false, waterSupplyC: 18, flowLpm: null };

function plan(from: { magnitudeG: number; thetaDeg: number; phiDeg: number }, to: { magnitudeG: number; thetaDeg: number; phiDeg: number }, rampMs: number, ratio = 0.1): PlannedPoint[] {
  return plannedPoints(DEMO_CALIBRATION, [{ startMs: 0, from: targetVector(from), to: targetVector(to), rampMs }]).map((p) => ({ ...p, collapseRatio: ratio, fermiSurfaceAspect: 1.02 }));
}

/** A plan holding constant currents (one point each side of a hold). */
function constant(currents: { x: number; y: number; z: number }): PlannedPoint[] {
  return [0, 1000].map((tMs) => ({ tMs, magnitudeG: 5, thetaDeg: 10, phiDeg: 0, currentsA: currents, mapThetaDeg: 10, mapPhiDeg: 0, collapseRatio: 0.1, fermiSurfaceAspect: 1 }));
}

const byName = (checks: ReturnType<typeof preflight>, name: string) => checks.find((c) => c.name === name)!;

describe('pre-flight checks', () => {
  it('passes an ordinary target and lists every check with value, limit and a sentence', () => {
    const checks = preflight({ points: plan({ magnitudeG: 8, thetaDeg: 30, phiDeg: 0 }, { magnitudeG: 8, thetaDeg: 70, phiDeg: 90 }, 5000), coils: DEMO_PARAMETERS, limits: LIMITS, now: NOW });
    expect(checks.map((c) => c.name)).toEqual(['controller', 'interlock', 'field-magnitude', 'currents', 'ramp-rate', 'coil-temperature', 'collapse-ratio']);
    for (const c of checks) {
      expect(c.ok, c.message).toBe(true);
      expect(c.message.length).toBeGreaterThan(20);
    }
  });

  it('predicts the steady coil temperature as the hand calculation from the coil data', () => {
    // Pair x at 10 A, water 18 °C, nominal flow 3.2 L/min, G = 5 W/K, R20 = 0.41 Ω (coil data):
    // ṁc_p = 222.33 W/K, k = 4.944 W/K, T = (4.944·18 + 41·0.9214)/(4.944 − 41·0.00393) = 26.5 °C.
    const c = byName(preflight({ points: constant({ x: 10, y: 0, z: 0 }), coils: DEMO_PARAMETERS, limits: LIMITS, now: NOW }), 'coil-temperature');
    expect(c.value).toBeCloseTo(26.5, 1);
    expect(c.ok).toBe(true);
    // At 20 A the same pair would settle far above the 55 °C alarm level:
    // I²R20 = 164 W, T = (88.99 + 151.1)/(4.944 − 0.6445) = 55.8 °C.
    const hot = byName(preflight({ points: constant({ x: 20, y: 0, z: 0 }), coils: DEMO_PARAMETERS, limits: LIMITS, now: NOW }), 'coil-temperature');
    expect(hot.value).toBeCloseTo(55.8, 1);
    expect(hot.ok).toBe(false);
    expect(hot.limit).toBe(55);
  });

  it('uses a measured low coolant flow, and reports runaway without flow', () => {
    const low = byName(preflight({ points: constant({ x: 10, y: 0, z: 0 }), coils: DEMO_PARAMETERS, limits: LIMITS, now: { ...NOW, flowLpm: { x: 0, y: 3, z: 3 } } }), 'coil-temperature');
    expect(low.ok).toBe(false);
    expect(low.value).toBeNull();
  });

  it('refuses a current beyond the alarm level and a field beyond the apparatus range', () => {
    const checks = preflight({ points: plan({ magnitudeG: 8, thetaDeg: 0, phiDeg: 0 }, { magnitudeG: 30, thetaDeg: 0, phiDeg: 0 }, 60_000), coils: DEMO_PARAMETERS, limits: LIMITS, now: NOW });
    expect(byName(checks, 'field-magnitude')).toMatchObject({ ok: false, limit: 20 });
    expect(byName(checks, 'currents')).toMatchObject({ ok: false, limit: 18 });
  });

  it('limits dI/dt to the slew limit and to what the compliance voltage drives through L and R', () => {
    // At 10 A and 55 °C: R = 0.41·(1 + 0.00393·35) = 0.4664 Ω, headroom 14 − 4.664 = 9.336 V,
    // dI/dt = 9.336 V / 0.02 H = 467 A/s, so the 20 A/s slew limit is the binding one.
    expect(drivableRate(DEMO_PARAMETERS, 'x', 10, 55)).toBe(20);
    // At 29 A the winding alone needs 13.5 V: only (14 − 13.53)/0.02 = 23.6 A/s remain; at 31 A nothing.
    expect(drivableRate(DEMO_PARAMETERS, 'x', 29, 55)).toBe(20);
    expect(drivableRate(DEMO_PARAMETERS, 'x', 31, 55)).toBe(0);
    const fast = byName(preflight({ points: plan({ magnitudeG: 2, thetaDeg: 0, phiDeg: 0 }, { magnitudeG: 12, thetaDeg: 0, phiDeg: 0 }, 200), coils: DEMO_PARAMETERS, limits: LIMITS, now: NOW }), 'ramp-rate');
    // ≈ 10 G / 1.25 G/A = 8 A in 0.2 s = 40 A/s.
    expect(fast.ok).toBe(false);
    expect(fast.value).toBeGreaterThan(35);
    expect(fast.limit).toBe(20);
    const step = byName(preflight({ points: plan({ magnitudeG: 2, thetaDeg: 0, phiDeg: 0 }, { magnitudeG: 3, thetaDeg: 0, phiDeg: 0 }, 0), coils: DEMO_PARAMETERS, limits: LIMITS, now: NOW }), 'ramp-rate');
    expect(step).toMatchObject({ ok: false, value: null });
  });

  it('holds the collapse ratio under the lead\'s limit and fails when it is unknown or no profile is active', () => {
    const points = plan({ magnitudeG: 8, thetaDeg: 0, phiDeg: 0 }, { magnitudeG: 8, thetaDeg: 90, phiDeg: 0 }, 10_000, 0.85);
    expect(byName(preflight({ points, coils: DEMO_PARAMETERS, limits: LIMITS, now: NOW }), 'collapse-ratio')).toMatchObject({ ok: false, value: 0.85, limit: 0.8 });
    const unknown = points.map((p, i) => (i === 3 ? { ...p, collapseRatio: null } : { ...p, collapseRatio: 0.1 }));
    expect(byName(preflight({ points: unknown, coils: DEMO_PARAMETERS, limits: LIMITS, now: NOW }), 'collapse-ratio').ok).toBe(false);
    expect(byName(preflight({ points, noProfile: true, coils: DEMO_PARAMETERS, limits: LIMITS, now: NOW }), 'collapse-ratio').ok).toBe(false);
  });

  it('fails while the interlock or the hardware chain is tripped, or the controller is silent', () => {
    const points = plan({ magnitudeG: 8, thetaDeg: 0, phiDeg: 0 }, { magnitudeG: 8, thetaDeg: 10, phiDeg: 0 }, 5000);
    expect(byName(preflight({ points, coils: DEMO_PARAMETERS, limits: LIMITS, now: { ...NOW, interlockTripped: true } }), 'interlock').ok).toBe(false);
    expect(byName(preflight({ points, coils: DEMO_PARAMETERS, limits: LIMITS, now: { ...NOW, hardwareTripped: true } }), 'interlock').ok).toBe(false);
    expect(byName(preflight({ points, coils: DEMO_PARAMETERS, limits: LIMITS, now: { ...NOW, reporting: false } }), 'controller').ok).toBe(false);
  });
});
