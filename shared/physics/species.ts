import { ATOMIC_MASS, BOHR_MAGNETON, DEBYE, EPSILON0, MU0 } from './constants.js';
import { PhysicsInputError } from './input-error.js';

/**
 * Species table (docs/physics.md §1.3). Masses: NIST "Atomic Weights and Isotopic Compositions"
 * (AME1995-based), as shipped in python3-periodictable 1.6.0. Moments are g_J·J of the
 * electronic ground state as usually quoted (from memory); molecular dipoles are body-frame
 * values from the cited experiments (from memory). Molecule masses are sums of atomic masses.
 */
export interface SpeciesEntry {
  /** Atomic mass, u. */
  massU: number;
  massSource: string;
  /** Magnetic moment of the polarised state, μB (magnetic species). */
  magneticMomentMuB?: number;
  /** Body-frame electric dipole, D (polar molecules). */
  dipoleDebye?: number;
  momentSource: string;
}

const MASS_SOURCE = 'NIST Atomic Weights and Isotopic Compositions (python3-periodictable 1.6.0)';
const MASS_K40 = 39.96399867;

export const SPECIES: Readonly<Record<string, SpeciesEntry>> = {
  '167Er': { massU: 166.932045, massSource: MASS_SOURCE, magneticMomentMuB: 6.98, momentSource: 'g_J·J of ³H₆, J = 6 (from memory)' },
  '161Dy': { massU: 160.92693, massSource: MASS_SOURCE, magneticMomentMuB: 9.93, momentSource: 'g_J·J of ⁵I₈, J = 8 (from memory)' },
  '163Dy': { massU: 162.928728, massSource: MASS_SOURCE, magneticMomentMuB: 9.93, momentSource: 'g_J·J of ⁵I₈, J = 8 (from memory)' },
  '53Cr': { massU: 52.9406538, massSource: MASS_SOURCE, magneticMomentMuB: 6.0, momentSource: 'g_J·J of ⁷S₃ (from memory)' },
  '40K': { massU: MASS_K40, massSource: MASS_SOURCE, magneticMomentMuB: 1.0, momentSource: 'F = 9/2 stretched state at low field (from memory)' },
  '40K87Rb': {
    massU: MASS_K40 + 86.9091835,
    massSource: `sum of atomic masses, ${MASS_SOURCE}`,
    dipoleDebye: 0.566,
    momentSource: 'body-frame dipole, Science 322, 231 (2008) (from memory)',
  },
  '23Na40K': {
    massU: 22.98976967 + MASS_K40,
    massSource: `sum of atomic masses, ${MASS_SOURCE}`,
    dipoleDebye: 2.72,
    momentSource: 'body-frame dipole, PRL 114, 205302 (2015) (from memory)',
  },
};

/** A table key, or a custom species by mass and magnetic moment or by mass and electric dipole. */
export type SpeciesInput =
  | string
  | { massU: number; magneticMomentMuB: number; name?: string }
  | { massU: number; dipoleDebye: number; name?: string };

export interface ResolvedSpecies {
  name: string;
  /** Mass, kg. */
  massKg: number;
  /** Dipolar coupling constant C_dd, J m³ (μ0μ² or d²/ε0 with the lab-frame dipole). */
  cdd: number;
  kind: 'magnetic' | 'electric';
}

function requirePositive(value: number, what: string): void {
  if (!Number.isFinite(value) || value <= 0) throw new PhysicsInputError(`${what} must be a positive finite number (got ${value})`);
}

/**
 * Mass and C_dd of a species. `polarization` (0…1) is the lab-frame fraction of a molecule's
 * body-frame dipole; it does not apply to magnetic species. Throws PhysicsInputError naming the bad input.
 */
export function resolveSpecies(input: SpeciesInput, polarization?: number): ResolvedSpecies {
  let name: string;
  let massU: number;
  let moment: number | undefined;
  let dipole: number | undefined;
  if (typeof input === 'string') {
    const entry = Object.hasOwn(SPECIES, input) ? SPECIES[input] : undefined;
    if (!entry) throw new PhysicsInputError(`unknown species "${input}"; use one of ${Object.keys(SPECIES).join(', ')} or give massU with magneticMomentMuB or dipoleDebye`);
    ({ massU, magneticMomentMuB: moment, dipoleDebye: dipole } = entry);
    name = input;
  } else {
    if (typeof input !== 'object' || input === null) throw new PhysicsInputError('species must be a table key such as "167Er" or an object with massU and magneticMomentMuB or dipoleDebye');
    massU = input.massU;
    moment = 'magneticMomentMuB' in input ? input.magneticMomentMuB : undefined;
    dipole = 'dipoleDebye' in input ? input.dipoleDebye : undefined;
    name = input.name ?? 'custom';
    requirePositive(massU, 'species.massU');
    if ((moment === undefined) === (dipole === undefined)) throw new PhysicsInputError('species needs exactly one of magneticMomentMuB or dipoleDebye');
    if (moment !== undefined && (!Number.isFinite(moment) || moment < 0)) throw new PhysicsInputError(`species.magneticMomentMuB must be a finite number ≥ 0 (got ${moment})`);
    if (dipole !== undefined && (!Number.isFinite(dipole) || dipole < 0)) throw new PhysicsInputError(`species.dipoleDebye must be a finite number ≥ 0 (got ${dipole})`);
  }
  if (polarization !== undefined && !(polarization >= 0 && polarization <= 1)) {
    throw new PhysicsInputError(`polarization must lie between 0 and 1 (got ${polarization})`);
  }
  const massKg = massU * ATOMIC_MASS;
  if (moment !== undefined) {
    if (polarization !== undefined && polarization !== 1) {
      throw new PhysicsInputError(`polarization applies only to electric-dipole species; omit it for ${name}`);
    }
    const mu = moment * BOHR_MAGNETON;
    return { name, massKg, cdd: MU0 * mu * mu, kind: 'magnetic' };
  }
  const d = (dipole as number) * DEBYE * (polarization ?? 1);
  return { name, massKg, cdd: (d * d) / EPSILON0, kind: 'electric' };
}
