/**
 * zod building blocks for the fields of API requests. Every route builds its schema from
 * these, so text is always trimmed, bounded and free of NUL, control characters and lone
 * surrogates, and numbers are always finite and inside a range that makes physical sense for
 * the field. (`refuseHostileInput` applies the generic part to every request as well; these
 * blocks give the field's own message and range.) Messages leave out the field name: the
 * 400 puts the path in front (`reason: must not be empty`).
 */
import { z } from 'zod';
import { numberProblem, textProblem } from '../../shared/validation/edge-rules.js';

export interface TextOptions {
  /** Most characters after trimming. */
  max: number;
  /** Fewest characters after trimming; default 1 (required, not blank). */
  min?: number;
  /** What to write, for the message when the text is missing or blank, e.g. "say why (it goes into the audit trail)". */
  hint?: string;
}

/** Trimmed text of `min`…`max` characters without NUL, control characters (tab and line breaks allowed) or lone surrogates. */
export function safeText(opts: TextOptions) {
  const min = opts.min ?? 1;
  const hint = opts.hint ? `: ${opts.hint}` : '';
  return z
    .string({ error: `must be text${hint}` })
    .superRefine((s, ctx) => {
      const problem = textProblem(s);
      if (problem) ctx.addIssue({ code: 'custom', message: problem, abort: true });
    })
    .trim()
    .min(min, min === 1 ? `must not be empty${hint}` : `must be at least ${min} characters`)
    .max(opts.max, `must be at most ${opts.max} characters`);
}

/** A password or other secret: taken as typed (not trimmed), `min`…`max` characters of safe text. */
export function secretText(opts: { min: number; max: number }) {
  return z
    .string({ error: 'must be text' })
    .min(opts.min, opts.min === 1 ? 'must not be empty' : `must be at least ${opts.min} characters`)
    .max(opts.max, `must be at most ${opts.max} characters`)
    .superRefine((s, ctx) => {
      const problem = textProblem(s);
      if (problem) ctx.addIssue({ code: 'custom', message: problem });
    });
}

/** An e-mail address (a sign-in name): trimmed, lower-cased, at most 320 characters. */
export function emailAddress() {
  return safeText({ max: 320 }).pipe(z.email({ error: 'must be an e-mail address' })).transform((s) => s.toLowerCase());
}

/** A reason for the audit trail: 1…500 characters of safe text. */
export function reasonText() {
  return safeText({ max: 500, hint: 'say why (it goes into the audit trail)' });
}

export interface NumberOptions {
  min: number;
  max: number;
  /** Unit shown in the message, e.g. "min", "°C". */
  unit?: string;
  integer?: boolean;
}

function rangeMessage(opts: NumberOptions): string {
  const unit = opts.unit ? ` ${opts.unit}` : '';
  return `must be a ${opts.integer ? 'whole number' : 'number'} from ${opts.min} to ${opts.max}${unit}`;
}

function inRange(n: number, opts: NumberOptions): boolean {
  return numberProblem(n) === null && n >= opts.min && n <= opts.max && (!opts.integer || Number.isInteger(n));
}

/** A finite JSON number within `min`…`max` (a physically sensible range for the field). */
export function boundedNumber(opts: NumberOptions) {
  const message = rangeMessage(opts);
  return z.number({ error: message }).refine((n) => inRange(n, opts), message);
}

/** Like `boundedNumber`, for a query-string or path value (text converted to a number). */
export function queryNumber(opts: NumberOptions) {
  const message = rangeMessage(opts);
  return z.coerce.number({ error: message }).refine((n) => inRange(n, opts), message);
}

/** A date and time in ISO 8601 (query-string or body text), as a Date. */
export function isoTime() {
  const message = 'must be a date and time such as 2026-12-02T06:00:00Z';
  return z
    .string({ error: message })
    .refine((v) => /^\d{4}-\d{2}-\d{2}T/.test(v) && !Number.isNaN(new Date(v).getTime()), message)
    .transform((v) => new Date(v));
}
