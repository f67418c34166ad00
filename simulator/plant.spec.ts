import { describe, expect, it } from 'vitest';
import { DEMO_PARAMETERS } from '../shared/apparatus/coil-data.js';
import { Plant } from './plant.js';

const options = { params: DEMO_PARAMETERS, startMs: 1.7e12, sampleRateHz: 1000, seed: 5, thermalSpeedup: 200 };

describe('plant', () => {
  it('settles to a return-water rise of P/(ṁ·c_p) with the winding resistance at its temperature', () => {
    const p = new Plant(options);
    for (let k = 0; k < 10_000; k++) p.advance({ x: 15, y: 0, z: 0 });
    const t = p.truth();
    // c_p = 4181 J/(kg·K), ρ = 0.99705 kg/L at 25 °C (CRC Handbook, from memory)
    const capacityRate = (DEMO_PARAMETERS.coils.x.nominalFlowLpm / 60) * 0.99705 * 4181;
    expect(t.heatToWaterW.x / t.powerW.x).toBeCloseTo(1, 6);
    expect(t.waterReturnC.x - t.waterSupplyC).toBeCloseTo(t.powerW.x / capacityRate, 6); // energy balance
    // R(T) = R20·(1 + 0.00393 K⁻¹·(T − 20 °C)) (IEC 60028)
    expect(t.resistanceOhm.x).toBeCloseTo(DEMO_PARAMETERS.coils.x.r20Ohm * (1 + 0.00393 * (t.coilTempC.x - 20)), 12);
    expect(t.currentA.x).toBeCloseTo(15, 6);
  });

  it('advances its clock by one sample period per step', () => {
    const p = new Plant(options);
    for (let k = 0; k < 20; k++) p.advance({ x: 0, y: 0, z: 0 });
    expect(p.nowMs).toBe(options.startMs + 20);
  });

  it('gives the same measurements for the same seed', () => {
    const a = new Plant(options);
    const b = new Plant(options);
    for (let k = 0; k < 100; k++) {
      a.advance({ x: 1, y: 2, z: 3 });
      b.advance({ x: 1, y: 2, z: 3 });
    }
    expect(a.measureFast()).toEqual(b.measureFast());
    expect(a.measureSlow()).toEqual(b.measureSlow());
  });
});
