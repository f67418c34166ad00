/**
 * Why a database write failed, in one line for an answer to the person who asked: the
 * database's own message (drizzle wraps it with the whole statement, which stays in the log).
 */
export function writeFailureText(error: unknown): string {
  let inner: unknown = error;
  while (inner instanceof Error && inner.cause instanceof Error) inner = inner.cause;
  const text = inner instanceof Error ? inner.message : String(inner);
  const line = text.split('\n')[0].trim();
  return line.length > 200 ? `${line.slice(0, 199)}…` : line;
}
