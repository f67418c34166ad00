import * as z from 'zod/mini';
import { PhysicsInputError } from '../physics/input-error.js';
import { sampleScales, type SampleParams } from '../physics/sample.js';
import { SPECIES } from '../physics/species.js';
import { imagingPlane } from '../physics/tof.js';
import { normaliseZyzEuler } from './euler-angles.js';

/** Most TOF times a profile lists: the live panel shows the first, the others are for records. */
export const MAX_TOF_TIMES = 4;

/**
 * Physically sensible ranges of the inputs, said in the form and enforced here and on the
 * server. They are wide bounds around what dipolar quantum-gas experiments use (common
 * practice; see docs/physics.md), meant to catch typos such as 2.5 atoms or 10¹² atoms.
 */
export const PROFILE_RANGES = {
  atomNumber: { min: 100, max: 1e8 },
  trapHz: { min: 1, max: 10_000 },
  /** Euler angles are accepted within ±360° and stored normalised (euler-angles.ts). */
  eulerDeg: { min: -360, max: 360 },
  tofMs: { min: 0, max: 200 },
  massU: { min: 1, max: 500 },
  magneticMomentMuB: { min: 0, max: 20 },
  dipoleDebye: { min: 0, max: 20 },
} as const;

/** How the profile form labels each input; messages name inputs by these labels. */
export const PROFILE_LABELS = {
  name: 'Name',
  species: 'Species',
  massU: 'Mass (u)',
  magneticMomentMuB: 'Magnetic moment (μB)',
  dipoleDebye: 'Electric dipole (D)',
  polarization: 'Polarisation',
  atomNumber: 'Atom number',
  trapHz: ['Frequency along x', 'Frequency along y', 'Frequency along z'],
  trapToCoilEulerDeg: ['1st turn, about coil z', '2nd turn, about the new y', '3rd turn, about the new z'],
  tofMs: 'TOF times',
  imaging: 'Camera line of sight',
} as const;

const R = PROFILE_RANGES;
const L = PROFILE_LABELS;
const inRange = (label: string, range: { min: number; max: number }, unit: string) =>
  z.number({ error: `${label} must be a number` }).check(
    z.refine((n) => Number.isFinite(n) && n >= range.min && n <= range.max, { error: `${label} must lie between ${range.min} and ${range.max}${unit}`, abort: true }),
  );
const triple = (labels: readonly [string, string, string], range: { min: number; max: number }, unit: string, what: string) =>
  z.tuple([inRange(labels[0], range, unit), inRange(labels[1], range, unit), inRange(labels[2], range, unit)], { error: `${what} must be three numbers` });

const numberOf = (what: string) => z.number({ error: `${what} must be a finite number` });
const vector3 = (what: string) => {
  const error = `${what} must be three finite numbers`;
  return z.tuple([z.number({ error }), z.number({ error }), z.number({ error })], { error });
};

/**
 * A sample profile: what the prediction needs to know about the gas in the trap (issue 3,
 * "Sample profiles"). Stored and versioned by the server; exactly one is active.
 *
 * Orientation — one source of truth. The prediction works in the trap frame of the profile,
 * and `trapToCoilEulerDeg` is what defines that frame: the coil-frame field
 * B_coil = K·I + B0 (the calibration's K and B0) is turned into the trap frame with this
 * profile's coilToTrap (trap-orientation.ts), never with the calibration's. The trap belongs
 * to the sample (rebuilding the optical trap makes a new profile version), the calibration to
 * the coils. The calibration's own coilToTrap only frames the displayed field angles; keep the
 * two equal (the demo data do), and read the prediction's own θ, φ where they may differ.
 *
 * Physical ranges (N > 0, positive trap frequencies, masses and moments, polarisation 0…1
 * and only for electric dipoles, perpendicular imaging vectors) are checked by the model
 * itself, so one rule lives in one place; its message names the key to fix.
 */
export const SampleProfile = z
  .strictObject({
    name: z.string({ error: `${L.name} must be text` }).check(
      z.trim(),
      z.minLength(1, { error: `${L.name} must not be empty` }),
      z.maxLength(120, { error: `${L.name} must be at most 120 characters` }),
    ),
    species: z.union(
      [
        z.string(),
        z.strictObject({ massU: inRange(L.massU, R.massU, ' u'), magneticMomentMuB: inRange(L.magneticMomentMuB, R.magneticMomentMuB, ' μB'), name: z.optional(z.string()) }),
        z.strictObject({ massU: inRange(L.massU, R.massU, ' u'), dipoleDebye: inRange(L.dipoleDebye, R.dipoleDebye, ' D'), name: z.optional(z.string()) }),
      ],
      {
        error: `${L.species} must be one of ${Object.keys(SPECIES).join(', ')}, or a custom species with its mass and magnetic moment or electric dipole`,
      },
    ),
    /** Molecules only: lab-frame fraction (0…1) of the body-frame dipole. */
    polarization: z.optional(numberOf(`${L.polarization} (0…1)`)),
    atomNumber: inRange(L.atomNumber, R.atomNumber, '').check(z.refine((n) => Number.isInteger(n), { error: `${L.atomNumber} must be a whole number`, abort: true })),
    /** Trap frequencies along the trap axes x, y, z, Hz. */
    trapHz: triple(L.trapHz, R.trapHz, ' Hz', 'The trap frequencies'),
    /**
     * Orientation of the trap axes in the coil frame: z-y-z Euler angles (α, β, γ) in degrees,
     * trapToCoil = Rz(α)·Ry(β)·Rz(γ). Omitted: the trap axes are the coil axes.
     */
    trapToCoilEulerDeg: z.optional(triple(L.trapToCoilEulerDeg, R.eulerDeg, '°', 'The trap orientation')),
    /** Ballistic expansion times, ms; the first one is shown live. */
    tofMs: z.array(inRange(`Each of the ${L.tofMs}`, R.tofMs, ' ms'), {
      error: `${L.tofMs} must be a list of times in ms`,
    }).check(
      z.minLength(1, { error: `${L.tofMs} must list at least one time in ms` }),
      z.maxLength(MAX_TOF_TIMES, { error: `${L.tofMs} must list at most ${MAX_TOF_TIMES} times` }),
    ),
    /** Camera line of sight "x", "y", "z" or in-plane vectors u (horizontal) and v (vertical), trap frame. */
    imaging: z.union([z.enum(['x', 'y', 'z']), z.strictObject({ u: vector3('u, camera horizontal'), v: vector3('v, camera vertical') })], {
      error: `${L.imaging} must be along x, y or z, or custom u and v vectors of three numbers each`,
    }),
  }, { error: 'a sample profile must be an object with name, species, atomNumber, trapHz, tofMs and imaging' })
  .check(
    z.superRefine((profile, ctx) => {
      for (const check of [() => sampleScales(sampleParamsOf(profile)), () => imagingPlane(profile.imaging)]) {
        try {
          check();
        } catch (err) {
          if (!(err instanceof PhysicsInputError)) throw err;
          const { path, message } = labelledModelMessage(err.message);
          ctx.addIssue({ code: 'custom', message, path, input: profile });
        }
      }
    }),
  );
export type SampleProfile = z.infer<typeof SampleProfile>;

/**
 * The physics model names its inputs by key (`polarization must lie…`, `trapHz[1] (…)`); the
 * screen and the API name them as the form labels them, at the input's path.
 */
function labelledModelMessage(message: string): { path: (string | number)[]; message: string } {
  const rules: [RegExp, (string | number)[], string][] = [
    [/^imaging\.u and imaging\.v\b/, ['imaging', 'v'], 'The camera u and v vectors'],
    [/^imaging\.u\b/, ['imaging', 'u'], 'u, camera horizontal'],
    [/^imaging\.v\b/, ['imaging', 'v'], 'v, camera vertical'],
    [/^polarization\b/, ['polarization'], L.polarization],
    [/^atomNumber\b/, ['atomNumber'], L.atomNumber],
    [/^trapHz\[0\]( \([^)]*\))?/, ['trapHz', 0], L.trapHz[0]],
    [/^trapHz\[1\]( \([^)]*\))?/, ['trapHz', 1], L.trapHz[1]],
    [/^trapHz\[2\]( \([^)]*\))?/, ['trapHz', 2], L.trapHz[2]],
    [/^species\.massU\b/, ['species', 'massU'], L.massU],
    [/^species\.magneticMomentMuB\b/, ['species', 'magneticMomentMuB'], L.magneticMomentMuB],
    [/^species\.dipoleDebye\b/, ['species', 'dipoleDebye'], L.dipoleDebye],
  ];
  for (const [pattern, path, label] of rules) {
    if (pattern.test(message)) return { path, message: message.replace(pattern, label) };
  }
  return { path: /^unknown species\b/.test(message) ? ['species'] : [], message };
}

/** The sample part of a profile, as the model takes it. */
export function sampleParamsOf(profile: SampleProfile): SampleParams {
  return { species: profile.species, atomNumber: profile.atomNumber, trapHz: profile.trapHz, polarization: profile.polarization };
}

/** Bad profile input; the message lists each problem as `key: what to fix`. */
export class SampleProfileError extends Error {
  override readonly name = 'SampleProfileError';
  constructor(
    message: string,
    /** Key path of the first problem, e.g. `trapHz.1`; empty when it concerns the whole profile. */
    readonly field = '',
  ) {
    super(message);
  }
}

/**
 * Validates untrusted input as a sample profile, with the Euler angles normalised
 * (euler-angles.ts); throws SampleProfileError whose message names each input as the form
 * labels it, and whose `field` is the key path of the first problem (for placing it).
 */
export function parseSampleProfile(value: unknown): SampleProfile {
  const result = SampleProfile.safeParse(value);
  if (result.success) {
    const euler = result.data.trapToCoilEulerDeg;
    return euler ? { ...result.data, trapToCoilEulerDeg: normaliseZyzEuler(euler) } : result.data;
  }
  const problems = result.error.issues.map((issue) => (issue.code === 'unrecognized_keys' ? `unknown key(s) ${issue.keys.join(', ')}` : issue.message));
  throw new SampleProfileError(`sample profile: ${problems.join('; ')}`, result.error.issues[0]?.path.join('.') ?? '');
}
