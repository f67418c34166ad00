import type { z } from 'zod';
import { HttpError } from './http-error.js';

/**
 * Validates request input against a zod schema and returns the typed value; otherwise throws
 * a 400 HttpError listing each problem by field name, e.g. `email: must be an e-mail address`.
 */
export function parseInput<T extends z.ZodType>(schema: T, value: unknown, where: 'body' | 'query' | 'path'): z.infer<T> {
  const parsed = schema.safeParse(value ?? {});
  if (parsed.success) return parsed.data;
  const problems = parsed.error.issues.map((issue) => `${issue.path.length > 0 ? issue.path.join('.') : where}: ${issue.message}`);
  throw new HttpError(400, `Invalid request ${where}: ${problems.join('; ')}`);
}
