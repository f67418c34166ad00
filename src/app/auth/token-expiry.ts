/**
 * Expiry of a JSON Web Token as Unix epoch ms, read from its `exp` claim (RFC 7519 §4.1.4,
 * seconds since the epoch). Returns null when the token has no readable `exp`. The signature is
 * not checked here: the server does that on every call; the browser only needs to know when to
 * stop trusting its copy.
 */
export function tokenExpiry(token: string): number | null {
  const payload = token.split('.')[1];
  if (!payload) return null;
  try {
    const base64 = payload.replace(/-/g, '+').replace(/_/g, '/');
    const claims: unknown = JSON.parse(atob(base64.padEnd(Math.ceil(base64.length / 4) * 4, '=')));
    const exp = (claims as { exp?: unknown } | null)?.exp;
    return typeof exp === 'number' && Number.isFinite(exp) ? exp * 1000 : null;
  } catch {
    return null;
  }
}
