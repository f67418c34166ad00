import { describe, expect, it } from 'vitest';
import { resistanceAt } from '../apparatus/coil-model.js';
import { windingTemperatureC } from './winding-temperature.js';

describe('windingTemperatureC', () => {
  it('inverts R(T) = R20·(1 + α(T − 20 °C)) with α = 0.00393/K (IEC 60028, annealed copper)', () => {
    // Worked example: R20 = 0.41 Ω at 45 °C gives R = 0.41·(1 + 0.00393·25) = 0.4502825 Ω; at 10 A, V = 4.502825 V.
    expect(windingTemperatureC(4.502825, 10, 10, 0.41)).toBeCloseTo(45, 9);
    expect(windingTemperatureC(-4.502825, -10, -10, 0.41)).toBeCloseTo(45, 9);
  });

  it('agrees with the simulator’s own winding model at any temperature', () => {
    for (const t of [15, 20, 37.5, 64]) expect(windingTemperatureC(12 * resistanceAt(0.39, t), 12, null, 0.39)).toBeCloseTo(t, 9);
  });

  it('derives nothing from too little current, during a ramp, or without data', () => {
    expect(windingTemperatureC(0.2, 0.5, 0.5, 0.41)).toBeNull();
    expect(windingTemperatureC(4.5, 10, 12, 0.41)).toBeNull();
    expect(windingTemperatureC(null, 10, 10, 0.41)).toBeNull();
  });
});
