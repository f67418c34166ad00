/** Why `text` may not be stored (NUL, other control characters, lone surrogates), or null when it is fine. */
// eslint-disable-next-line no-control-regex
const CONTROL = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F]/;
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?:^|[^\uD800-\uDBFF])[\uDC00-\uDFFF]/;

export function textProblem(text: string): string | null {
  if (text.includes('\u0000')) return 'must not contain a NUL character';
  if (CONTROL.test(text)) return 'must not contain control characters (only tab and line breaks are allowed)';
  if (LONE_SURROGATE.test(text)) return 'must be well-formed Unicode text (it contains a lone surrogate)';
  return null;
}
