import { describe, expect, it } from 'vitest';
import { COPPER_ALPHA_PER_K, coilCurrentAfter, resistanceAt } from './coil-model.js';

describe('copper winding resistance', () => {
  it('uses the IEC 60028 temperature coefficient of annealed copper', () => {
    expect(COPPER_ALPHA_PER_K).toBe(0.00393); // IEC 60028
  });

  it('rises by the factor 1.1965 from 20 °C to 70 °C', () => {
    // 1 + 0.00393 K⁻¹ · 50 K = 1.1965 (IEC 60028)
    expect(resistanceAt(0.4, 70) / resistanceAt(0.4, 20)).toBeCloseTo(1.1965, 12);
  });

  it('falls by the factor 0.9214 from 20 °C to 0 °C', () => {
    // 1 − 0.00393 K⁻¹ · 20 K = 0.9214 (IEC 60028)
    expect(resistanceAt(0.4, 0) / 0.4).toBeCloseTo(0.9214, 12);
  });
});

describe('first-order current response', () => {
  const r = 0.4;
  const l = 0.02;
  const tauS = l / r; // 50 ms
  const dtS = 0.001;

  it('reaches 1 − e⁻¹ = 63.2 % of the final current after one time constant τ = L/R under a voltage step', () => {
    let i = 0;
    for (let k = 0; k < Math.round(tauS / dtS); k++) i = coilCurrentAfter(i, 4, r, l, dtS);
    // Solution of L·dI/dt = V − R·I (textbook first-order system): I(τ) = (V/R)(1 − e⁻¹)
    expect(i / (4 / r)).toBeCloseTo(1 - Math.exp(-1), 9); // 0.63212 (1 − e⁻¹)
  });

  it('settles on V/R', () => {
    let i = 0;
    for (let k = 0; k < 2000; k++) i = coilCurrentAfter(i, 4, r, l, dtS);
    expect(i).toBeCloseTo(10, 9);
  });
});
