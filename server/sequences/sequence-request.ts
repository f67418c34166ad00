/**
 * Sequence bodies checked at the edge. A bad step is named by its number as the editor shows
 * it ("Step 3 (ramp): θ must be at most 180 °").
 */
import { z } from 'zod';
import type { SequenceStep } from '../../shared/steering/steering-api.js';
import { MAX_RAMP_MS } from '../../shared/steering/target.js';
import { HttpError } from '../http/http-error.js';
import { labelled, labelledInside } from '../http/field-labels.js';
import { magnitudeG, phiDeg, reason, text, thetaDeg } from '../steering/steer-request.js';

/** Most steps one sequence may hold. */
export const MAX_STEPS = 200;

const duration = (label: string, min: number) =>
  z.number({ error: `${label} must be a number in ms` }).int(`${label} must be a whole number of ms`).min(min, `${label} must be at least ${min} ms`).max(MAX_RAMP_MS, `${label} must be at most ${MAX_RAMP_MS} ms`);

const RampStep = z.strictObject({ kind: z.literal('ramp'), magnitudeG, thetaDeg, phiDeg, durationMs: duration('Duration', 0) });
const HoldStep = z.strictObject({ kind: z.literal('hold'), durationMs: duration('Duration', 1) });
const ShotStep = z.strictObject({ kind: z.literal('shot'), label: text('Label', 100) });
const Step = z.discriminatedUnion('kind', [RampStep, HoldStep, ShotStep], { error: 'Kind must be ramp, hold or shot' });

const StepsSchema = z.array(z.unknown(), { error: 'Steps must be a list' }).min(1, 'Steps must hold at least one step').max(MAX_STEPS, `Steps must hold at most ${MAX_STEPS} steps`);

/** Validates a list of steps; throws a 400 naming every bad step, with `field` at the first bad input (`steps.2.thetaDeg`). */
export function parseSteps(value: unknown): SequenceStep[] {
  const list = StepsSchema.safeParse(value);
  if (!list.success) throw new HttpError(400, list.error.issues[0].message, 'steps');
  const problems: string[] = [];
  let field: string | null = null;
  const steps = list.data.map((raw, i) => {
    const parsed = Step.safeParse(raw);
    if (parsed.success) return parsed.data;
    const kind = typeof raw === 'object' && raw !== null && typeof (raw as { kind?: unknown }).kind === 'string' ? ` (${(raw as { kind: string }).kind})` : '';
    problems.push(`Step ${i + 1}${kind}: ${parsed.error.issues.map((issue) => issue.message).join('; ')}`);
    field ??= ['steps', i, ...parsed.error.issues[0].path].join('.');
    return null;
  });
  if (problems.length > 0) throw new HttpError(400, problems.join('. '), field);
  return steps as SequenceStep[];
}

const STEP_INPUTS: Readonly<Record<string, string>> = { kind: 'Kind', magnitudeG: '|B|', thetaDeg: 'θ', phiDeg: 'φ', durationMs: 'Duration', label: 'Label' };

/** An input of the sequence editor by its path in the steps (`2.thetaDeg` → "θ of step 3"). */
export function stepFieldLabel(path: readonly PropertyKey[]): string | null {
  const step = Number(path[0]) + 1;
  if (!Number.isInteger(step)) return null;
  const input = path.length > 1 ? STEP_INPUTS[String(path[1])] : undefined;
  return input ? `${input} of step ${step}` : `Step ${step}`;
}

const steps = labelledInside(z.unknown(), 'Steps', stepFieldLabel);

/** Labels as the sequence editor and the run and abort forms show them. */
export const SaveSequenceBody = z.strictObject({ name: labelled(text('Name', 100), 'Name'), steps, reason: labelled(reason, 'Reason (goes into the audit trail)') });
export const PreviewBody = z.strictObject({ steps });
export const RunBody = z.strictObject({ reason: labelled(reason, 'Reason for the run') });
export const RunAbortBody = z.strictObject({ reason: labelled(reason, 'Reason for the abort') });

export const IdParam = z.object({
  id: z.coerce.number({ error: 'must be an id' }).int('must be a whole number').positive('must be an id ≥ 1').max(2_147_483_647, 'must be an id'),
});
