/**
 * Physical constants in SI units, CODATA 2018 (docs/physics.md §1.1). The SI-defining constants
 * (h, kB, c) are exact; ħ is derived from h so that it carries no extra rounding.
 */

/** Planck constant h, J s (exact). */
export const PLANCK = 6.62607015e-34;
/** Reduced Planck constant ħ = h/2π, J s. */
export const HBAR = PLANCK / (2 * Math.PI);
/** Vacuum magnetic permeability μ0, N A⁻² (CODATA 2018; no longer exactly 4π×10⁻⁷). */
export const MU0 = 1.25663706212e-6;
/** Vacuum electric permittivity ε0, F m⁻¹ (CODATA 2018). */
export const EPSILON0 = 8.8541878128e-12;
/** Bohr magneton μB, J T⁻¹ (CODATA 2018). */
export const BOHR_MAGNETON = 9.2740100783e-24;
/** Atomic mass constant u, kg (CODATA 2018). */
export const ATOMIC_MASS = 1.6605390666e-27;
/** Boltzmann constant kB, J K⁻¹ (exact). */
export const BOLTZMANN = 1.380649e-23;
/** Speed of light c, m s⁻¹ (exact). */
export const SPEED_OF_LIGHT = 299792458;
/** One debye, C m (definition: 1e-21/c). */
export const DEBYE = 1e-21 / SPEED_OF_LIGHT;
