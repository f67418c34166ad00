import * as z from 'zod/mini';
import { PhysicsInputError } from '../physics/input-error.js';
import { sampleScales, type SampleParams } from '../physics/sample.js';
import { SPECIES } from '../physics/species.js';
import { imagingPlane } from '../physics/tof.js';

/** Most TOF times a profile lists: the live panel shows the first, the others are for records. */
export const MAX_TOF_TIMES = 4;

/**
 * |B| below which the field is taken as too weak to orient the dipoles, G, when a profile
 * does not set its own (`minOrientingFieldG`). Invented for the demo lab: the lead sets the
 * level the lab trusts for its sample (stray fields and gradients against the Zeeman energy).
 */
export const DEFAULT_MIN_ORIENTING_FIELD_G = 0.5;
/** Largest `minOrientingFieldG` accepted, G: above it no field the coils give would count. */
export const MAX_MIN_ORIENTING_FIELD_G = 20;

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
    name: z.string({ error: 'name must be text' }).check(
      z.trim(),
      z.minLength(1, { error: 'name must not be empty' }),
      z.maxLength(120, { error: 'name must be at most 120 characters' }),
    ),
    species: z.union(
      [
        z.string(),
        z.strictObject({ massU: z.number(), magneticMomentMuB: z.number(), name: z.optional(z.string()) }),
        z.strictObject({ massU: z.number(), dipoleDebye: z.number(), name: z.optional(z.string()) }),
      ],
      {
        error: `species must be one of ${Object.keys(SPECIES).join(', ')}, {"massU", "magneticMomentMuB"} or {"massU", "dipoleDebye"} (numbers)`,
      },
    ),
    /** Molecules only: lab-frame fraction (0…1) of the body-frame dipole. */
    polarization: z.optional(numberOf('polarization (0…1)')),
    atomNumber: numberOf('atomNumber'),
    /** Trap frequencies along the trap axes x, y, z, Hz. */
    trapHz: vector3('trapHz (trap frequencies along the trap axes x, y, z in Hz)'),
    /**
     * Orientation of the trap axes in the coil frame: z-y-z Euler angles (α, β, γ) in degrees,
     * trapToCoil = Rz(α)·Ry(β)·Rz(γ). Omitted: the trap axes are the coil axes.
     */
    trapToCoilEulerDeg: z.optional(vector3('trapToCoilEulerDeg (z-y-z Euler angles α, β, γ in degrees)')),
    /** Ballistic expansion times, ms; the first one is shown live. */
    tofMs: z.array(numberOf('each tofMs entry').check(z.nonnegative({ error: 'each tofMs entry must be a time ≥ 0 in ms' })), {
      error: 'tofMs must be a list of times in ms',
    }).check(
      z.minLength(1, { error: 'tofMs must list at least one time in ms' }),
      z.maxLength(MAX_TOF_TIMES, { error: `tofMs must list at most ${MAX_TOF_TIMES} times` }),
    ),
    /**
     * |B| below which the prediction is shown as not applying (field too weak to orient the
     * dipoles), G; default `DEFAULT_MIN_ORIENTING_FIELD_G`.
     */
    minOrientingFieldG: z.optional(
      numberOf('minOrientingFieldG (G)').check(
        z.positive({ error: 'minOrientingFieldG must be a field above 0 G' }),
        z.lte(MAX_MIN_ORIENTING_FIELD_G, { error: `minOrientingFieldG must be at most ${MAX_MIN_ORIENTING_FIELD_G} G` }),
      ),
    ),
    /** Camera line of sight "x", "y", "z" or in-plane vectors u (horizontal) and v (vertical), trap frame. */
    imaging: z.union([z.enum(['x', 'y', 'z']), z.strictObject({ u: vector3('imaging.u'), v: vector3('imaging.v') })], {
      error: 'imaging must be "x", "y", "z" or {"u": [3 numbers], "v": [3 numbers]}',
    }),
  }, { error: 'a sample profile must be an object with name, species, atomNumber, trapHz, tofMs and imaging' })
  .check(
    z.superRefine((profile, ctx) => {
      for (const check of [() => sampleScales(sampleParamsOf(profile)), () => imagingPlane(profile.imaging)]) {
        try {
          check();
        } catch (err) {
          if (!(err instanceof PhysicsInputError)) throw err;
          ctx.addIssue({ code: 'custom', message: err.message, input: profile });
        }
      }
    }),
  );
export type SampleProfile = z.infer<typeof SampleProfile>;

/** The sample part of a profile, as the model takes it. */
export function sampleParamsOf(profile: SampleProfile): SampleParams {
  return { species: profile.species, atomNumber: profile.atomNumber, trapHz: profile.trapHz, polarization: profile.polarization };
}

/** Bad profile input; the message lists each problem as `key: what to fix`. */
export class SampleProfileError extends Error {
  override readonly name = 'SampleProfileError';
}

/** Validates untrusted input as a sample profile; throws SampleProfileError naming each key to fix. */
export function parseSampleProfile(value: unknown): SampleProfile {
  const result = SampleProfile.safeParse(value);
  if (result.success) return result.data;
  const problems = result.error.issues.map((issue) => {
    const text = issue.code === 'unrecognized_keys' ? `unknown key(s) ${issue.keys.join(', ')}` : issue.message;
    return issue.path.length > 0 ? `${issue.path.join('.')}: ${text}` : text;
  });
  throw new SampleProfileError(`sample profile: ${problems.join('; ')}`);
}
