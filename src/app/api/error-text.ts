import { HttpErrorResponse } from '@angular/common/http';

/**
 * A sentence for the user from a failed server call: the server's own `error` or `message`
 * text when it sent one, otherwise a description of what went wrong and what to do.
 */
export function errorText(err: unknown): string {
  if (!(err instanceof HttpErrorResponse)) return 'Something went wrong. Reload the page and try again.';
  const body: unknown = err.error;
  if (body && typeof body === 'object') {
    const { error, message } = body as { error?: unknown; message?: unknown };
    if (typeof error === 'string' && error.trim()) return error;
    if (typeof message === 'string' && message.trim()) return message;
  }
  if (typeof body === 'string' && body.trim() && body.length < 300 && !body.trimStart().startsWith('<')) return body;
  if (err.status === 0) return 'Cannot reach the Tiltwatch server. Check the network connection and try again.';
  if (err.status === 429) return 'Too many attempts. Wait a minute, then try again.';
  if (err.status >= 500) return `The server failed (HTTP ${err.status}). Try again; if it persists, tell the lab engineer.`;
  return `The server refused the request (HTTP ${err.status}).`;
}

/** The form field a refusal concerns (`field` of the server's 400 body), or null. */
export function errorField(err: unknown): string | null {
  if (!(err instanceof HttpErrorResponse)) return null;
  const body: unknown = err.error;
  const field = body && typeof body === 'object' ? (body as { field?: unknown }).field : undefined;
  return typeof field === 'string' && field !== '' ? field : null;
}
