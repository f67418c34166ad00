import { Writable } from 'node:stream';
import type { Worker } from 'node:worker_threads';
import { pino } from 'pino';
import { afterEach, describe, expect, it } from 'vitest';
import type { LivePrediction } from '../../shared/live/live-state.js';
import { predict } from '../../shared/physics/predict.js';
import { DEMO_PROFILE } from '../../shared/profiles/demo-profile.js';
import { sampleParamsOf, type SampleProfile } from '../../shared/profiles/sample-profile.js';
import { directionBucket, fieldDirectionOf } from './field-direction.js';
import { PredictionEngine, type PredictionEngineOptions } from './prediction-engine.js';

const engines: PredictionEngine[] = [];

afterEach(async () => {
  await Promise.all(engines.splice(0).map((e) => e.close()));
});

function engine(options: PredictionEngineOptions = {}): PredictionEngine {
  const e = new PredictionEngine(options);
  engines.push(e);
  return e;
}

/** Resolves with the first prediction (the latest one included) that satisfies `accept`. */
function predictionWhere(e: PredictionEngine, accept: (p: LivePrediction) => boolean): Promise<LivePrediction> {
  return new Promise((resolve) => {
    const now = e.latest();
    if (now && accept(now)) return resolve(now);
    const stop = e.onPrediction((p) => {
      if (!accept(p)) return;
      stop();
      resolve(p);
    });
  });
}

const withRatio = (p: LivePrediction) => p.collapseRatio !== null;

describe('PredictionEngine (real worker thread)', () => {
  it('publishes the prediction for a direction that a direct predict() call gives, then adds the collapse ratio', async () => {
    const e = engine();
    e.setProfile(7, DEMO_PROFILE);
    e.updateDirection({ thetaDeg: 35, phiDeg: 25 }, 0);
    const first = await predictionWhere(e, () => true);
    const direct = predict(sampleParamsOf(DEMO_PROFILE), { thetaDeg: 35, phiDeg: 25 }, { tofMs: [0, 20], imaging: 'y' });

    expect(first).toMatchObject({ stable: true, reason: null, profileId: 7, thetaDeg: 35, phiDeg: 25, collapseRatio: null });
    expect(first.epsDd).toBe(direct.epsDd);
    // The first solve is cold in both, so the numbers agree exactly.
    expect(first.fermiSurfaceAspect).toBe(direct.fermiSurface?.aspectRatio);
    expect(first.cloudAspect).toBe(direct.cloud?.aspectRatios.r1OverR3);
    expect(first.tofAspect).toBe(direct.tof?.[1].aspectRatio);
    expect(first.tofMajorAngleDeg).toBe(direct.tof?.[1].majorAngleDeg);
    expect(first.camera).toMatchObject({
      imaging: 'y',
      tofMs: 20,
      inSituUm: { major: direct.tof?.[0].semiAxesUm[0], minor: direct.tof?.[0].semiAxesUm[1] },
      tofUm: { major: direct.tof?.[1].semiAxesUm[0], minor: direct.tof?.[1].semiAxesUm[1] },
    });
    expect(Number.isNaN(Date.parse(first.computedAt))).toBe(false);

    const later = await predictionWhere(e, withRatio);
    const centre = directionBucket(fieldDirectionOf(35, 25), 1).centre;
    const critical = predict(sampleParamsOf(DEMO_PROFILE), centre, { computeCritical: true });
    expect(later.collapseRatio).toBeCloseTo(direct.epsDd / (critical.epsDdCritical as number), 6);
    expect(later.fermiSurfaceAspect).toBe(first.fermiSurfaceAspect);
    expect(e.counters()).toMatchObject({ predictions: 1, criticalComputations: 1 });
  });

  it('does not recompute for changes within the threshold, and treats e and −e as one direction', async () => {
    const e = engine({ minIntervalMs: 0 });
    e.setProfile(1, DEMO_PROFILE);
    e.updateDirection({ thetaDeg: 35, phiDeg: 25 }, 0);
    await predictionWhere(e, withRatio);

    e.updateDirection({ thetaDeg: 35.1, phiDeg: 25 }, 1);
    e.updateDirection({ thetaDeg: 35, phiDeg: 25.15 }, 2);
    e.updateDirection({ thetaDeg: 180 - 35, phiDeg: 25 + 180 }, 3);
    e.updateDirection({ thetaDeg: 180 - 35.1, phiDeg: 25.1 + 180 }, 4);
    expect(e.counters()).toMatchObject({ directionUpdates: 5, belowThreshold: 4, predictions: 1 });

    e.updateDirection({ thetaDeg: 35.5, phiDeg: 25 }, 5);
    expect(e.counters().predictions).toBe(2);
    const moved = await predictionWhere(e, (p) => p.thetaDeg === 35.5);
    expect(moved.stable).toBe(true);
  });

  it('coalesces a burst of 100 direction updates into two computations, the newest direction winning', async () => {
    const e = engine();
    e.setProfile(1, DEMO_PROFILE);
    for (let i = 0; i < 100; i++) e.updateDirection({ thetaDeg: 10 + 0.5 * i, phiDeg: 20 }, i);
    const last = 10 + 0.5 * 99;
    const p = await predictionWhere(e, (q) => q.thetaDeg === last);

    expect(e.counters()).toMatchObject({ directionUpdates: 100, coalesced: 98, predictions: 2 });
    // Warm-started from the first solution, the second agrees with a cold solve to the solver's tolerance.
    const direct = predict(sampleParamsOf(DEMO_PROFILE), { thetaDeg: last, phiDeg: 20 }, { tofMs: [20], imaging: 'y' });
    expect(p.fermiSurfaceAspect).toBeCloseTo(direct.fermiSurface?.aspectRatio as number, 7);
    expect(e.latest()?.thetaDeg).toBe(last);
  });

  it('recomputes the present direction from scratch when the profile changes', async () => {
    const e = engine({ minIntervalMs: 0 });
    e.setProfile(1, DEMO_PROFILE);
    e.updateDirection({ thetaDeg: 0, phiDeg: 0 }, 0);
    await predictionWhere(e, () => true);

    const denser: SampleProfile = { ...DEMO_PROFILE, name: 'denser', atomNumber: 2e5 };
    e.setProfile(2, denser);
    expect(e.latest()).toBeNull();
    const p = await predictionWhere(e, (q) => q.profileId === 2);

    const direct = predict(sampleParamsOf(denser), { thetaDeg: 0, phiDeg: 0 }, { tofMs: [20], imaging: 'y' });
    expect(p.epsDd).toBe(direct.epsDd);
    expect(p.fermiSurfaceAspect).toBe(direct.fermiSurface?.aspectRatio);
    expect(e.counters().predictions).toBe(2);
  });

  it('computes the direction given with a new profile, not the one measured in the previous profile\'s frame', async () => {
    const e = engine({ minIntervalMs: 0 });
    e.setProfile(1, DEMO_PROFILE);
    e.updateDirection({ thetaDeg: 10, phiDeg: 0 }, 0);
    await predictionWhere(e, () => true);

    e.setProfile(2, { ...DEMO_PROFILE, name: 'tilted', trapToCoilEulerDeg: [15, 30, 0] }, { thetaDeg: 40, phiDeg: 0 });
    const p = await predictionWhere(e, (q) => q.profileId === 2);
    expect([p.thetaDeg, p.phiDeg]).toEqual([40, 0]);
    expect(e.counters().predictions).toBe(2);
  });

  it('reports a collapsed gas as not stable, with the reason, its ratio and no geometry', async () => {
    const e = engine({ minIntervalMs: 0 });
    const collapsed = (p: LivePrediction) => {
      expect(p).toMatchObject({ stable: false, fermiSurfaceAspect: null, cloudAspect: null, tofAspect: null, tofMajorAngleDeg: null, camera: null });
      expect(p.reason).toMatch(/collapsed/);
      expect(p.collapseRatio).toBeGreaterThan(1);
    };
    // 10⁸ 167Er atoms in a 10 kHz trap (the largest the profile ranges allow): ε_dd ≈ 2.9, far
    // beyond the threshold (the model's own CLI on the same case).
    e.setProfile(1, { ...DEMO_PROFILE, atomNumber: 1e8, trapHz: [10_000, 10_000, 10_000] });
    e.updateDirection({ thetaDeg: 0, phiDeg: 0 }, 0);
    collapsed(await predictionWhere(e, () => true));

    // 23Na40K with its full body-frame dipole: ε_dd far beyond the threshold.
    e.setProfile(2, { ...DEMO_PROFILE, species: '23Na40K', polarization: 1, atomNumber: 1e5, trapHz: [100, 100, 100] });
    collapsed(await predictionWhere(e, (p) => p.profileId === 2));
  });

  it('logs a stopped worker, restarts it and finishes the direction it was computing', async () => {
    const lines: string[] = [];
    const sink = new Writable({ write: (chunk, _enc, done) => (lines.push(String(chunk)), done()) });
    const e = engine({ log: pino({ level: 'info' }, sink) });
    e.setProfile(1, DEMO_PROFILE);
    e.updateDirection({ thetaDeg: 60, phiDeg: 10 }, 0);
    await (e as unknown as { worker: Worker }).worker.terminate();

    const p = await predictionWhere(e, () => true);
    expect(p).toMatchObject({ stable: true, thetaDeg: 60, phiDeg: 10 });
    expect(e.counters()).toMatchObject({ workerRestarts: 1, predictions: 2 });
    expect(lines.join('')).toMatch(/prediction worker stopped; restarting it/);
  });

  it('leaves no worker port or timer behind after close', async () => {
    const open = (type: string) => process.getActiveResourcesInfo().filter((r) => r === type).length;
    const [portsBefore, timersBefore] = [open('MessagePort'), open('Timeout')];
    const e = new PredictionEngine({ minIntervalMs: 60_000 });
    e.setProfile(1, DEMO_PROFILE);
    e.updateDirection({ thetaDeg: 20, phiDeg: 0 }, 0);
    await predictionWhere(e, withRatio);
    // The next direction waits for the interval: the worker and a timer are open.
    e.updateDirection({ thetaDeg: 40, phiDeg: 0 }, 1);
    expect(open('MessagePort')).toBe(portsBefore + 1);
    await e.close();
    await e.close();
    expect(open('MessagePort')).toBe(portsBefore);
    // Other parts of the test runner keep their own timers; ours must not add one.
    expect(open('Timeout')).toBeLessThanOrEqual(timersBefore);
    e.updateDirection({ thetaDeg: 50, phiDeg: 0 }, 2);
    expect(e.counters().predictions).toBe(1);
  });

  it('refuses a bad profile with a message naming the input as the form labels it', () => {
    const e = engine();
    expect(() => e.setProfile(1, { ...DEMO_PROFILE, trapHz: [350, -80, 400] })).toThrow(/Frequency along y must lie between/);
    expect(() => e.updateDirection({ thetaDeg: Number.NaN, phiDeg: 0 }, 0)).toThrow(/finite thetaDeg and phiDeg/);
  });
});
