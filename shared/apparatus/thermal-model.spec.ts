import { describe, expect, it } from 'vitest';
import { DEMO_PARAMETERS } from './coil-data.js';
import { coilTemperatureAfter, cooling, conductanceAtFlow, steadyCoilTemperature, WATER_CP_J_PER_KG_K, WATER_DENSITY_KG_PER_L } from './thermal-model.js';

/** ṁ·c_p of 3 L/min of water: 3/60 L/s · 0.99705 kg/L · 4181 J/(kg·K) = 208.433 W/K. */
const CP_WATER = 4181; // J/(kg·K) at 25 °C, CRC Handbook of Chemistry and Physics (from memory)
const RHO_WATER = 0.99705; // kg/L at 25 °C (from memory)
const capacityRate3Lpm = (3 / 60) * RHO_WATER * CP_WATER;

describe('coil cooling', () => {
  it('uses handbook values for water', () => {
    expect(WATER_CP_J_PER_KG_K).toBe(CP_WATER);
    expect(WATER_DENSITY_KG_PER_L).toBe(RHO_WATER);
  });

  it('raises the return water in steady state by P/(ṁ·c_p) (energy balance)', () => {
    const powerW = 100;
    const conductance = 5;
    let coilC = 18;
    for (let k = 0; k < 100; k++) coilC = coilTemperatureAfter(coilC, powerW, 18, 3, conductance, 100, 10);
    const { returnC, heatToWaterW } = cooling(coilC, 18, 3, conductance);
    expect(heatToWaterW).toBeCloseTo(powerW, 9);
    // P/(ṁ·c_p) = 100 W / 208.433 W/K = 0.47977 K (energy balance, c_p CRC Handbook, from memory)
    expect(returnC - 18).toBeCloseTo(powerW / capacityRate3Lpm, 9);
    expect(returnC - 18).toBeCloseTo(0.47977, 4);
  });

  it('holds the winding ≈ 8 K above the water at 10 A in the demo apparatus', () => {
    const coil = DEMO_PARAMETERS.coils.y;
    let coilC = 18;
    for (let k = 0; k < 50; k++) {
      const r = coil.r20Ohm * (1 + 0.00393 * (coilC - 20)); // IEC 60028
      coilC = coilTemperatureAfter(coilC, 100 * r, 18, coil.nominalFlowLpm, coil.conductanceWPerK, coil.heatCapacityJPerK, 10);
    }
    expect(coilC - 18).toBeGreaterThan(7);
    expect(coilC - 18).toBeLessThan(9);
  });

  it('heats the winding adiabatically at P/C when the flow stops', () => {
    const afterS = coilTemperatureAfter(30, 40, 18, 0, 5, 100, 10);
    expect(afterS - 30).toBeCloseTo((40 * 10) / 100, 12); // dT = P·t/C
    expect(cooling(30, 18, 0, 5)).toEqual({ heatToWaterW: 0, returnC: 30 });
  });

  it('reaches the 65 °C software trip within one to two minutes after a cooling loss at 10 A', () => {
    const coil = DEMO_PARAMETERS.coils.x;
    let coilC = 26;
    let seconds = 0;
    while (coilC < 65 && seconds < 600) {
      const r = coil.r20Ohm * (1 + 0.00393 * (coilC - 20)); // IEC 60028
      coilC = coilTemperatureAfter(coilC, 100 * r, 18, 0, 0, coil.heatCapacityJPerK, 1);
      seconds++;
    }
    expect(seconds).toBeGreaterThanOrEqual(60);
    expect(seconds).toBeLessThanOrEqual(120);
  });

  it('weakens the coil → water conductance with the flow (flow^0.8) and loses it without flow', () => {
    expect(conductanceAtFlow(5, 3, 3)).toBe(5);
    expect(conductanceAtFlow(5, 3, 1.5)).toBeCloseTo(5 * 0.5 ** 0.8, 12); // Dittus–Boelter exponent (from memory)
    expect(conductanceAtFlow(5, 3, 0)).toBe(0);
  });
});

describe('steady coil temperature', () => {
  it('matches a hand calculation for the demo x pair at 10 A', () => {
    // By hand: ṁc_p = 3.2/60 L/s · 0.99705 kg/L · 4181 J/(kg·K) = 222.33 W/K;
    // k = (1 − e^(−5/222.33))·222.33 = 4.944 W/K; I²R20 = 100 · 0.41 = 41 W;
    // T = (k·18 + 41·(1 − 20·0.00393)) / (k − 41·0.00393) = (88.99 + 37.78) / 4.783 = 26.51 °C.
    const coil = DEMO_PARAMETERS.coils.x;
    const t = steadyCoilTemperature(10, coil.r20Ohm, 0.00393, 18, coil.nominalFlowLpm, coil.conductanceWPerK);
    expect(t).toBeCloseTo(26.5, 1);
  });

  it('is the supply temperature without current and runs away when cooling cannot keep up', () => {
    expect(steadyCoilTemperature(0, 0.41, 0.00393, 18, 3.2, 5)).toBe(18);
    expect(steadyCoilTemperature(5, 0.41, 0.00393, 18, 0, 5)).toBe(Infinity);
  });

  it('agrees with the end point of the time-stepped model', () => {
    // The transient solution of coilTemperatureAfter with R(T) updated each step settles on it.
    const coil = DEMO_PARAMETERS.coils.y;
    let t = 18;
    for (let i = 0; i < 20_000; i++) {
      const power = 15 * 15 * coil.r20Ohm * (1 + 0.00393 * (t - 20));
      t = coilTemperatureAfter(t, power, 18, coil.nominalFlowLpm, coil.conductanceWPerK, coil.heatCapacityJPerK, 1);
    }
    expect(steadyCoilTemperature(15, coil.r20Ohm, 0.00393, 18, coil.nominalFlowLpm, coil.conductanceWPerK)).toBeCloseTo(t, 6);
  });
});
