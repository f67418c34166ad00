/**
 * The generic rules every value crossing an edge (HTTP body, query and path; WebSocket and
 * MQTT text) must pass before any schema looks at it: text is well-formed Unicode without NUL
 * or other control characters, numbers are finite and of a size some quantity in the product
 * can have. Routes add the physical ranges of their own fields on top (see server/http/fields.ts).
 * Plain TypeScript without dependencies, so the browser and the server share it.
 */

/**
 * Largest magnitude any number may have at the edge: above every epoch time in ms (≈ 1.8e12),
 * atom number or frequency the product handles, below 2^53 so integers stay exact.
 */
export const MAX_EDGE_MAGNITUDE = 1e15;
/** Deepest nesting of objects and arrays a request may carry. */
export const MAX_EDGE_DEPTH = 32;

// C0 controls other than tab, line feed and carriage return, and DEL.
// eslint-disable-next-line no-control-regex
const CONTROL = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F]/;
/** A high surrogate not followed by a low one, or a low surrogate not preceded by a high one. */
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?:^|[^\uD800-\uDBFF])[\uDC00-\uDFFF]/;

/** Why `text` may not be stored, or null when it is fine. */
export function textProblem(text: string): string | null {
  if (text.includes('\u0000')) return 'must not contain a NUL character';
  if (CONTROL.test(text)) return 'must not contain control characters (only tab and line breaks are allowed)';
  if (LONE_SURROGATE.test(text)) return 'must be well-formed Unicode text (it contains a lone surrogate)';
  return null;
}

/** Why `n` is not a sensible number, or null when it is fine. */
export function numberProblem(n: number): string | null {
  if (!Number.isFinite(n)) return 'must be a finite number';
  if (Math.abs(n) > MAX_EDGE_MAGNITUDE) return `must lie between -${MAX_EDGE_MAGNITUDE} and ${MAX_EDGE_MAGNITUDE}`;
  return null;
}

/** Where in a value a problem sits (`profile.name`, `tofMs.2`; empty for the value itself) and what it is. */
export interface EdgeProblem {
  path: string;
  problem: string;
}

/**
 * The first problem found anywhere in a parsed JSON value (field names included), or null when
 * every string and number passes. Walks iteratively, so a deeply nested value cannot overflow
 * the stack.
 */
export function hostileValueProblem(value: unknown): EdgeProblem | null {
  const stack: { value: unknown; path: string; depth: number }[] = [{ value, path: '', depth: 0 }];
  while (stack.length > 0) {
    const { value: v, path, depth } = stack.pop()!;
    if (typeof v === 'string') {
      const problem = textProblem(v);
      if (problem) return { path, problem };
    } else if (typeof v === 'number') {
      const problem = numberProblem(v);
      if (problem) return { path, problem };
    } else if (typeof v === 'object' && v !== null) {
      if (depth >= MAX_EDGE_DEPTH) return { path, problem: `must not be nested more than ${MAX_EDGE_DEPTH} levels deep` };
      const entries = Array.isArray(v) ? v.map((x, i) => [String(i), x] as const) : Object.entries(v);
      for (const [key, child] of entries.reverse()) {
        const keyProblem = textProblem(key);
        if (keyProblem) return { path, problem: `has a field name that ${keyProblem}` };
        stack.push({ value: child, path: path === '' ? key : `${path}.${key}`, depth: depth + 1 });
      }
    }
  }
  return null;
}
