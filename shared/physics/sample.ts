import { BOLTZMANN, HBAR } from './constants.js';
import { PhysicsInputError } from './input-error.js';
import { resolveSpecies, type ResolvedSpecies, type SpeciesInput } from './species.js';

/** The gas sample: species, atom number and trap. */
export interface SampleParams {
  species: SpeciesInput;
  /** Number of atoms or molecules (single component). */
  atomNumber: number;
  /** Trap frequencies along the trap axes x, y, z, Hz (not rad/s). */
  trapHz: [number, number, number];
  /** Molecules only: lab-frame fraction (0…1) of the body-frame dipole. */
  polarization?: number;
}

/** Natural scales of a sample (docs/physics.md §3.2); SI units unless the name says otherwise. */
export interface SampleScales {
  species: ResolvedSpecies;
  atomNumber: number;
  /** Geometric mean trap frequency ω̄, rad/s. */
  omegaBar: number;
  /** λ_a = ω_a/ω̄ (product 1). */
  lambda: [number, number, number];
  /** Oscillator length a_ho = √(ħ/(mω̄)), m. */
  aHo: number;
  /** Ideal-gas Fermi energy E_F0 = ħω̄(6N)^(1/3), J. */
  fermiEnergy: number;
  /** Ideal-gas mean radius R̄0 = √2 (6N)^(1/6) a_ho, m. */
  rbar0: number;
  /** Ideal-gas Fermi wave number K_F0 = √2 (6N)^(1/6)/a_ho, m⁻¹. */
  kF0: number;
  /** Dipolar strength ε_dd = C_dd N^(1/6)/(4π ħω̄ a_ho³) (dimensionless). */
  epsDd: number;
}

/**
 * Validates a sample and derives its scales (docs/physics.md §3.2). Throws PhysicsInputError for
 * N ≤ 0, a non-positive or non-finite trap frequency, an unknown species or a polarisation
 * outside 0…1.
 */
export function sampleScales(params: SampleParams): SampleScales {
  const { atomNumber, trapHz } = params;
  if (typeof atomNumber !== 'number' || !Number.isFinite(atomNumber) || atomNumber <= 0) {
    throw new PhysicsInputError(`atomNumber must be a positive finite number (got ${atomNumber})`);
  }
  if (!Array.isArray(trapHz) || trapHz.length !== 3) throw new PhysicsInputError('trapHz must list three trap frequencies (x, y, z) in Hz');
  trapHz.forEach((f, a) => {
    if (typeof f !== 'number' || !Number.isFinite(f) || f <= 0) {
      throw new PhysicsInputError(`trapHz[${a}] (trap frequency along ${'xyz'[a]}) must be a positive finite number of Hz (got ${f})`);
    }
  });
  const species = resolveSpecies(params.species, params.polarization);
  const omega = trapHz.map((f) => 2 * Math.PI * f);
  const omegaBar = Math.cbrt(omega[0] * omega[1] * omega[2]);
  const m = species.massKg;
  const aHo = Math.sqrt(HBAR / (m * omegaBar));
  const root6N = Math.pow(6 * atomNumber, 1 / 6);
  return {
    species,
    atomNumber,
    omegaBar,
    lambda: [omega[0] / omegaBar, omega[1] / omegaBar, omega[2] / omegaBar],
    aHo,
    fermiEnergy: HBAR * omegaBar * root6N * root6N,
    rbar0: Math.SQRT2 * root6N * aHo,
    kF0: (Math.SQRT2 * root6N) / aHo,
    epsDd: (species.cdd * Math.pow(atomNumber, 1 / 6)) / (4 * Math.PI * HBAR * omegaBar * aHo ** 3),
  };
}

/** E_F0 in nK, the unit dashboards quote. */
export function fermiEnergyNanoKelvin(scales: SampleScales): number {
  return (scales.fermiEnergy / BOLTZMANN) * 1e9;
}
