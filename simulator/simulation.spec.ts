import { describe, expect, it } from 'vitest';
import * as z from 'zod/mini';
import { DEMO_CALIBRATION } from '../shared/field/demo-calibration.js';
import { fieldFromCurrents } from '../shared/field/field-vector.js';
import { ControllerStatus, FastFrame, SlowFrame } from '../shared/telemetry/messages.js';
import { DEMO_FIELD_GAUSS, demoSetpoints } from './demo-program.js';
import { DEMO_PARAMETERS } from '../shared/apparatus/coil-data.js';
import { Simulation } from './simulation.js';

const START = 1.7e12;
const simulation = (demo = true) =>
  new Simulation({ params: DEMO_PARAMETERS, startMs: START, sampleRateHz: 1000, frameMs: 20, seed: 1, thermalSpeedup: 1, demo, demoIdleMs: 30_000 });
const command = (x: number, y: number, z: number) => ({ tMs: START, setpointA: { x, y, z } });

describe('simulation frames', () => {
  it('emits 20-sample fast frames with consecutive seq and contiguous t0Ms that pass the wire schema', () => {
    const sim = simulation();
    const frames = Array.from({ length: 50 }, () => sim.nextFrame().fast);
    for (const [i, f] of frames.entries()) {
      expect(z.safeParse(FastFrame, f).success).toBe(true);
      expect(f.seq).toBe(i);
      expect(f.t0Ms).toBe(START + 20 * i);
      expect(f.currentA.x).toHaveLength(20);
    }
  });

  it('emits slow frames at 10 Hz that pass the wire schema', () => {
    const sim = simulation();
    const slow = Array.from({ length: 50 }, () => sim.nextFrame().slow).flat();
    expect(slow).toHaveLength(10);
    expect(slow.map((f) => f.seq)).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9]);
    for (const f of slow) expect(z.safeParse(SlowFrame, f).success).toBe(true);
  });

  it('reports a status that passes the wire schema', () => {
    expect(z.safeParse(ControllerStatus, simulation().status(true, START)).success).toBe(true);
  });

  it('leaves a gap in seq when it skips a stall', () => {
    const sim = simulation();
    sim.nextFrame();
    sim.skipFrames(100);
    const next = sim.nextFrame().fast;
    expect(next.seq).toBe(101);
    expect(next.t0Ms).toBe(START + 20 * 101);
  });

  it('refuses a frame length that does not hold a whole number of samples', () => {
    expect(
      () => new Simulation({ params: DEMO_PARAMETERS, startMs: START, sampleRateHz: 1000, frameMs: 0.5, seed: 1, thermalSpeedup: 1, demo: true, demoIdleMs: 1 }),
    ).toThrow(/whole number of samples/);
  });
});

describe('setpoints in force', () => {
  it('runs the demo program at start in demo mode, a field of the demo magnitude', () => {
    const sim = simulation();
    const f = sim.nextFrame().fast;
    expect(sim.status(true, START).mode).toBe('demo');
    expect(fieldFromCurrents(DEMO_CALIBRATION, f.setpointA).magnitude).toBeCloseTo(DEMO_FIELD_GAUSS, 9);
  });

  it('turns the demo field slowly through θ between 10° and 90° at constant magnitude', () => {
    const thetas = Array.from({ length: 60 }, (_, k) => fieldFromCurrents(DEMO_CALIBRATION, demoSetpoints(k * 5)));
    for (const f of thetas) expect(f.magnitude).toBeCloseTo(8, 9);
    const t = thetas.map((f) => f.thetaDeg ?? NaN);
    expect(Math.min(...t)).toBeGreaterThanOrEqual(10 - 1e-9);
    expect(Math.max(...t)).toBeLessThanOrEqual(90 + 1e-9);
    expect(Math.max(...t) - Math.min(...t)).toBeGreaterThan(60);
  });

  it('follows a setpoint command in remote mode and returns to the demo after the idle time', () => {
    const sim = simulation();
    sim.setpoints.command(command(1, 2, 3), START);
    expect(sim.setpoints.mode(START + 29_999)).toBe('remote');
    expect(sim.setpoints.setpointAt(START + 1000)).toEqual({ x: 1, y: 2, z: 3 });
    expect(sim.setpoints.mode(START + 30_000)).toBe('demo');
  });

  it('holds zero after a software trip, ignores setpoints while held, and stays at zero after release until a new command', () => {
    const sim = simulation(false);
    sim.setpoints.command(command(4, 4, 4), START);
    sim.setpoints.trip();
    expect(sim.status(true, START).softwareHold).toBe(true);
    expect(sim.setpoints.command(command(5, 5, 5), START)).toBe(false);
    expect(sim.setpoints.setpointAt(START)).toEqual({ x: 0, y: 0, z: 0 });
    sim.setpoints.release();
    expect(sim.setpoints.setpointAt(START)).toEqual({ x: 0, y: 0, z: 0 });
    expect(sim.setpoints.command(command(6, 6, 6), START)).toBe(true);
    expect(sim.setpoints.setpointAt(START)).toEqual({ x: 6, y: 6, z: 6 });
  });

  it('stays in remote mode without the demo and holds zero until commanded', () => {
    const sim = simulation(false);
    expect(sim.status(true, START).mode).toBe('remote');
    expect(sim.nextFrame().fast.setpointA).toEqual({ x: 0, y: 0, z: 0 });
  });
});
