/**
 * Request bodies of the steering, sequence and run routes, checked at the edge. Messages name
 * each field the way the screens label it.
 */
import { z } from 'zod';
import { MAX_RAMP_MS, MAX_TARGET_GAUSS } from '../../shared/steering/target.js';
import { textProblem } from '../../shared/validation/edge-rules.js';
import { labelled } from '../http/field-labels.js';
import { reasonText } from '../http/fields.js';

/** Trimmed text of 1…`max` characters, with the shared edge rules (no NUL, control characters or lone surrogates). */
export function text(label: string, max: number) {
  return z
    .string({ error: `${label} must be text` })
    .superRefine((s, ctx) => {
      const problem = textProblem(s);
      if (problem) ctx.addIssue({ code: 'custom', message: `${label} ${problem}`, abort: true });
    })
    .trim()
    .min(1, `${label} must not be empty`)
    .max(max, `${label} must be at most ${max} characters`);
}

const number = (label: string, unit: string, min: number, max: number, maxExclusive = false) => {
  const base = z.number({ error: `${label} must be a number${unit ? ` in ${unit}` : ''}` }).min(min, `${label} must be at least ${min}${unit ? ` ${unit}` : ''}`);
  return maxExclusive
    ? base.lt(max, `${label} must be below ${max}${unit ? ` ${unit}` : ''}`)
    : base.max(max, `${label} must be at most ${max}${unit ? ` ${unit}` : ''}`);
};

export const reason = reasonText();

/** A number field whose messages name it by `label`, as the screen that sends it does. */
const labelledNumber = (label: string, unit: string, min: number, max: number, maxExclusive = false) => labelled(number(label, unit, min, max, maxExclusive), label);

/** The inputs of a ramp step, as the sequence editor names them ("θ of step 3"). */
export const magnitudeG = labelledNumber('|B|', 'G', 0, MAX_TARGET_GAUSS);
export const thetaDeg = labelledNumber('θ', '°', 0, 180);
export const phiDeg = labelledNumber('φ', '°', 0, 360, true);

/** The ramp time: ms in the request, seconds on the form and in its messages. */
const rampMs = labelled(
  z
    .number({ error: 'Ramp time must be a number of seconds' })
    .min(0, 'Ramp time must be at least 0 s')
    .max(MAX_RAMP_MS, `Ramp time must be at most ${MAX_RAMP_MS / 1000} s`),
  'Ramp time',
);

/** Labels as the Steer page's New target form shows them. */
export const SteerRequestBody = z.strictObject({
  magnitudeG,
  thetaDeg: labelledNumber('θ (from trap z)', '°', 0, 180),
  phiDeg: labelledNumber('φ (from trap x to y)', '°', 0, 360, true),
  rampMs,
  reason: labelled(reason, 'Reason (goes into the audit trail)'),
});

export const ReasonBody = z.strictObject({ reason: labelled(reason, 'Reason for abort or release') });

