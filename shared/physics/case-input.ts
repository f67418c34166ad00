import * as z from 'zod/mini';
import type { FieldInput } from './field-input.js';
import { PhysicsInputError } from './input-error.js';
import type { PredictOptions } from './predict.js';
import type { SampleParams } from './sample.js';

const vector3 = (what: string) => z.tuple([z.number(), z.number(), z.number()], { error: `${what} must be three numbers` });
const numberOf = (what: string) => z.number({ error: `${what} must be a finite number` });

/**
 * A prediction case as the command line reads it (issue 3): the sample, the field direction
 * (θ, φ in degrees, or a trap-frame vector), TOF times in ms, the imaging geometry and whether to
 * compute the critical strength. Physical ranges (N > 0, positive trap frequencies, …) are
 * checked by the model itself, so one rule lives in one place. Each key carries the message
 * that tells the user what it must be.
 */
export const CaseInput = z.strictObject({
  species: z.union(
    [
      z.string(),
      z.strictObject({ massU: z.number(), magneticMomentMuB: z.number(), name: z.optional(z.string()) }),
      z.strictObject({ massU: z.number(), dipoleDebye: z.number(), name: z.optional(z.string()) }),
    ],
    { error: 'species must be a table key such as "167Er", {"massU", "magneticMomentMuB"} or {"massU", "dipoleDebye"}' },
  ),
  polarization: z.optional(numberOf('polarization (0…1)')),
  atomNumber: numberOf('atomNumber'),
  trapHz: vector3('trapHz (trap frequencies along x, y, z in Hz)'),
  thetaDeg: z.optional(numberOf('thetaDeg')),
  phiDeg: z.optional(numberOf('phiDeg')),
  field: z.optional(z.strictObject({ x: z.number(), y: z.number(), z: z.number() }, { error: 'field must be {"x", "y", "z"} with numbers' })),
  tofMs: z.optional(z.array(z.number(), { error: 'tofMs must be a list of times in ms' })),
  imaging: z.optional(
    z.union([z.enum(['x', 'y', 'z']), z.strictObject({ u: vector3('imaging.u'), v: vector3('imaging.v') })], {
      error: 'imaging must be "x", "y", "z" or {"u": [3 numbers], "v": [3 numbers]}',
    }),
  ),
  computeCritical: z.optional(z.boolean({ error: 'computeCritical must be true or false' })),
});
export type CaseInput = z.infer<typeof CaseInput>;

export interface ParsedCase {
  params: SampleParams;
  field: FieldInput;
  options: PredictOptions;
}

/**
 * Validates a parsed JSON case. Throws PhysicsInputError listing each offending key and what
 * it should be; `source` (e.g. the file name) prefixes the message.
 */
export function parseCase(json: unknown, source = 'case'): ParsedCase {
  const result = CaseInput.safeParse(json);
  if (!result.success) {
    const lines = result.error.issues.map((issue) =>
      issue.code === 'unrecognized_keys' ? `unknown key(s) ${issue.keys.join(', ')}` : issue.message,
    );
    throw new PhysicsInputError(`${source}: ${lines.join('; ')}`);
  }
  const c = result.data;
  const hasAngles = c.thetaDeg !== undefined || c.phiDeg !== undefined;
  if (hasAngles === (c.field !== undefined)) {
    throw new PhysicsInputError(`${source}: give the field direction either as thetaDeg and phiDeg or as field {x, y, z}`);
  }
  if (hasAngles && (c.thetaDeg === undefined || c.phiDeg === undefined)) {
    throw new PhysicsInputError(`${source}: thetaDeg and phiDeg must be given together`);
  }
  return {
    params: { species: c.species, atomNumber: c.atomNumber, trapHz: c.trapHz, polarization: c.polarization },
    field: c.field ?? { thetaDeg: c.thetaDeg as number, phiDeg: c.phiDeg as number },
    options: { tofMs: c.tofMs, imaging: c.imaging, computeCritical: c.computeCritical },
  };
}
