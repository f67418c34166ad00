import type { z } from 'zod';
import { fieldLabel, labelledMessage } from './field-labels.js';
import { HttpError } from './http-error.js';

/**
 * Validates request input against a zod schema and returns the typed value; otherwise throws
 * a 400 HttpError listing each problem by the field's label as the form shows it (see
 * field-labels.ts), e.g. `E-mail: must be an e-mail address`, with `field` set to the first
 * problem's path so the screen shows the message next to that input.
 */
export function parseInput<T extends z.ZodType>(schema: T, value: unknown, where: 'body' | 'query' | 'path'): z.infer<T> {
  const parsed = schema.safeParse(value ?? {});
  if (parsed.success) return parsed.data;
  const { issues } = parsed.error;
  const problems = issues.map((issue) => labelledMessage(fieldLabel(schema, issue.path), issue.path, issue.message));
  const text = problems.join('; ');
  if (where !== 'body') throw new HttpError(400, `Invalid request ${where}: ${text}`);
  const first = issues.find((issue) => issue.path.length > 0);
  throw new HttpError(400, text, first ? first.path.join('.') : null);
}
