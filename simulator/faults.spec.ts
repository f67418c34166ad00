import { describe, expect, it } from 'vitest';
import { DEMO_CALIBRATION } from '../shared/field/demo-calibration.js';
import type { Axis } from '../shared/telemetry/messages.js';
import { FaultBook } from './faults.js';
import { DEMO_PARAMETERS } from '../shared/apparatus/coil-data.js';
import { Plant, type PerAxis } from './plant.js';

function plant(thermalSpeedup = 1, seed = 3): Plant {
  return new Plant({ params: DEMO_PARAMETERS, startMs: 1.7e12, sampleRateHz: 1000, seed, thermalSpeedup });
}
const on = (axis: Axis, amps: number): PerAxis => ({ x: 0, y: 0, z: 0, [axis]: amps });
function run(p: Plant, setpoint: PerAxis, seconds: number, each?: () => void): void {
  for (let k = 0; k < seconds * 1000; k++) {
    p.advance(setpoint);
    each?.();
  }
}

describe('fault injection', () => {
  it('cooling-loss: the flow of the axis falls, the hardware chain trips on low flow and refuses reset until the flow is back', () => {
    const p = plant();
    run(p, on('x', 10), 2);
    p.faults.add({ kind: 'cooling-loss', axis: 'x', residualLpm: 0 });
    run(p, on('x', 10), 10);
    const t = p.truth();
    expect(t.flowLpm.x).toBeLessThan(0.05);
    expect(t.flowLpm.y).toBeCloseTo(DEMO_PARAMETERS.coils.y.nominalFlowLpm, 6);
    expect(t.hardwareTrip).toMatchObject({ cause: 'low-flow', axis: 'x' });
    expect(Math.abs(t.currentA.x)).toBeLessThan(0.01);
    const refused = p.resetHardwareTrip();
    expect(!refused.reset && refused.reason).toMatch(/low-flow on axis x/);
    p.faults.clear();
    run(p, on('x', 10), 10);
    expect(p.resetHardwareTrip()).toEqual({ reset: true });
  });

  it('supply-runaway: the current climbs past the setpoint and the supply limit until the over-current trip ends it', () => {
    const p = plant();
    run(p, on('y', 10), 2);
    p.faults.add({ kind: 'supply-runaway', axis: 'y', voltsPerSecond: 2 });
    let peak = 0;
    run(p, on('y', 10), 10, () => (peak = Math.max(peak, p.truth().currentA.y)));
    expect(peak).toBeGreaterThan(DEMO_PARAMETERS.trips.overCurrentA);
    expect(p.hardwareTrip).toMatchObject({ cause: 'over-current', axis: 'y' });
    expect(Math.abs(p.truth().currentA.y)).toBeLessThan(0.01);
  });

  it('ramps every current to zero at the slew limit after a hardware trip', () => {
    const p = plant();
    run(p, { x: 8, y: -8, z: 8 }, 2);
    p.faults.add({ kind: 'supply-runaway', axis: 'z', voltsPerSecond: 20 });
    while (!p.hardwareTrip) p.advance({ x: 8, y: -8, z: 8 });
    const before = p.truth().referenceA.x;
    run(p, { x: 8, y: -8, z: 8 }, 0.1);
    expect(before - p.truth().referenceA.x).toBeCloseTo(DEMO_PARAMETERS.supply.slewLimitAPerS * 0.1, 6); // 2 A in 0.1 s
  });

  it('frozen-sensor: a frozen temperature reading stops changing while the winding heats', () => {
    const p = plant(50);
    run(p, on('x', 15), 0.5);
    p.measureSlow();
    p.faults.add({ kind: 'frozen-sensor', axis: 'x', channel: 'temperature' });
    const frozen = p.measureSlow().coilTempC.x;
    run(p, on('x', 15), 1);
    expect(p.truth().coilTempC.x - frozen).toBeGreaterThan(5);
    expect(p.measureSlow().coilTempC.x).toBe(frozen);
    expect(p.measureSlow().coilTempC.y).not.toBe(p.measureSlow().coilTempC.y);
  });

  it('frozen-sensor: a frozen current reading stops changing while the current moves', () => {
    const p = plant();
    p.faults.add({ kind: 'frozen-sensor', axis: 'z', channel: 'current' });
    const frozen = p.measureFast().currentA.z;
    run(p, on('z', 5), 1);
    expect(p.truth().currentA.z).toBeGreaterThan(4);
    expect(p.measureFast().currentA.z).toBe(frozen);
  });

  it('sign-swap: the current of the axis flows opposite to its setpoint', () => {
    const p = plant();
    p.faults.add({ kind: 'sign-swap', axis: 'z' });
    run(p, { x: 5, y: 5, z: 5 }, 1);
    expect(p.truth().currentA.z).toBeCloseTo(-5, 2);
    expect(p.measureFast().currentA.z).toBeCloseTo(-5, 1);
    expect(p.truth().currentA.x).toBeCloseTo(5, 2);
  });

  it('field-offset-step: the reported currents are unchanged while the true field moves by R·ΔB0', () => {
    const clean = plant(1, 9);
    const stepped = plant(1, 9);
    const offset = { x: 0.1, y: -0.2, z: 0.5 };
    stepped.faults.add({ kind: 'field-offset-step', offsetGauss: offset });
    run(clean, { x: 3, y: 2, z: 1 }, 0.5);
    run(stepped, { x: 3, y: 2, z: 1 }, 0.5);
    expect(stepped.measureFast()).toEqual(clean.measureFast());
    const d = {
      x: stepped.truth().trueField.vector.x - clean.truth().trueField.vector.x,
      y: stepped.truth().trueField.vector.y - clean.truth().trueField.vector.y,
      z: stepped.truth().trueField.vector.z - clean.truth().trueField.vector.z,
    };
    const r = DEMO_CALIBRATION.coilToTrap;
    expect(d.x).toBeCloseTo(r[0][0] * offset.x + r[0][1] * offset.y + r[0][2] * offset.z, 12);
    expect(d.y).toBeCloseTo(r[1][0] * offset.x + r[1][1] * offset.y + r[1][2] * offset.z, 12);
    expect(d.z).toBeCloseTo(offset.z, 12);
  });

  it('sensor-dropout: marks the chosen telemetry streams as not published', () => {
    const book = new FaultBook();
    book.add({ kind: 'sensor-dropout', stream: 'slow' });
    expect([book.droppedOut('fast'), book.droppedOut('slow')]).toEqual([false, true]);
    book.add({ kind: 'sensor-dropout', stream: 'all' });
    expect([book.droppedOut('fast'), book.droppedOut('slow')]).toEqual([true, true]);
    book.clear();
    expect([book.droppedOut('fast'), book.droppedOut('slow')]).toEqual([false, false]);
  });

  it('coolant-warm: the supply water warms and the hardware chain trips on over-temperature', () => {
    const p = plant(100);
    p.faults.add({ kind: 'coolant-warm', supplyC: 80 });
    run(p, on('x', 10), 5);
    expect(p.truth().waterSupplyC).toBeGreaterThan(70);
    expect(p.hardwareTrip).toMatchObject({ cause: 'over-temperature' });
  });

  it('replaces a fault injected again for the same axis instead of stacking it', () => {
    const book = new FaultBook();
    book.add({ kind: 'cooling-loss', axis: 'x', residualLpm: 0 });
    book.add({ kind: 'cooling-loss', axis: 'x', residualLpm: 0.8 });
    book.add({ kind: 'cooling-loss', axis: 'y', residualLpm: 0 });
    expect(book.list()).toHaveLength(2);
    expect(book.coolingLossResidual('x')).toBe(0.8);
  });
});
