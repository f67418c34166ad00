import { atomicMass, bohrMagneton, boltzmann, electricConstant, magneticConstant, planckConstant, reducedPlanckConstant, speedOfLight } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { ATOMIC_MASS, BOHR_MAGNETON, BOLTZMANN, DEBYE, EPSILON0, HBAR, MU0, PLANCK, SPEED_OF_LIGHT } from './constants.js';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('physical constants', () => {
  it('agree with the CODATA 2018 set shipped by mathjs', () => {
    // mathjs 15 carries CODATA 2018 (its values equal ours digit for digit), so the comparison
    // is at double rounding rather than at the precision of an older adjustment.
    const pairs: [number, number][] = [
      [PLANCK, planckConstant.toNumber('J s')],
      [HBAR, reducedPlanckConstant.toNumber('J s')],
      [MU0, magneticConstant.toNumber('N / A^2')],
      [EPSILON0, electricConstant.toNumber('F / m')],
      [BOHR_MAGNETON, bohrMagneton.toNumber('J / T')],
      [ATOMIC_MASS, atomicMass.toNumber('kg')],
      [BOLTZMANN, boltzmann.toNumber('J / K')],
      [SPEED_OF_LIGHT, speedOfLight.toNumber('m / s')],
    ];
    for (const [ours, theirs] of pairs) expect(rel(ours, theirs)).toBeLessThan(1e-15);
  });

  it('uses the exact SI-defining values and the CODATA 2018 μ0', () => {
    // CODATA 2018 / SI 2019: h, kB, c exact; μ0 = 1.25663706212e-6 N A⁻², no longer 4π×10⁻⁷.
    expect(PLANCK).toBe(6.62607015e-34);
    expect(BOLTZMANN).toBe(1.380649e-23);
    expect(SPEED_OF_LIGHT).toBe(299792458);
    expect(MU0).toBe(1.25663706212e-6);
    expect(rel(MU0, 4e-7 * Math.PI)).toBeGreaterThan(1e-10);
    // μ0 ε0 c² = 1 holds to the CODATA 2018 rounding of μ0 and ε0.
    expect(rel(MU0 * EPSILON0 * SPEED_OF_LIGHT ** 2, 1)).toBeLessThan(1e-10);
  });

  it('defines the debye as 1e-21/c C m', () => {
    // Definition of the debye (docs/physics.md §1.1): 3.3356409520e-30 C m.
    expect(rel(DEBYE, 3.335640952e-30)).toBeLessThan(1e-10);
  });
});
