import jwt from 'jsonwebtoken';
import { ROLES, type Role } from '../../shared/auth/roles.js';

/** A sign-in lasts one shift. */
export const TOKEN_LIFETIME_S = 12 * 3600;
const ALGORITHM = 'HS256';
const ISSUER = 'tiltwatch';

/** What a token asserts. The role is re-read from the database on every use. */
export interface TokenClaims {
  userId: number;
  email: string;
  role: Role;
  /** The account's token version when the token was issued (`tv`); a raised version revokes it. */
  tokenVersion: number;
}

/** Claims of a verified token, with its expiry. */
export interface VerifiedClaims extends TokenClaims {
  /** Expiry, ms since the epoch. */
  expiresAt: number;
}

/** Signs and verifies the Bearer tokens of the HTTP API and the WebSocket. */
export class TokenIssuer {
  constructor(private readonly secret: Buffer) {}

  /** A signed token valid for `TOKEN_LIFETIME_S`. */
  sign(user: TokenClaims): string {
    return jwt.sign({ email: user.email, role: user.role, tv: user.tokenVersion }, this.secret, {
      algorithm: ALGORITHM,
      issuer: ISSUER,
      subject: String(user.userId),
      expiresIn: TOKEN_LIFETIME_S,
    });
  }

  /** Options for passport-jwt, so both paths verify the same way. */
  get verifyOptions() {
    return { secretOrKey: this.secret, algorithms: [ALGORITHM] as jwt.Algorithm[], issuer: ISSUER };
  }

  /** The claims of a valid token; null for a bad signature, an expired or malformed token. */
  verify(token: string): VerifiedClaims | null {
    try {
      const payload = jwt.verify(token, this.secret, { algorithms: [ALGORITHM], issuer: ISSUER });
      return typeof payload === 'string' ? null : claimsOf(payload);
    } catch {
      return null;
    }
  }
}

/** Claims of a verified payload; null when its shape is not ours. */
export function claimsOf(payload: jwt.JwtPayload): VerifiedClaims | null {
  const userId = Number(payload.sub);
  const role = payload['role'];
  const email = payload['email'];
  const tokenVersion = payload['tv'];
  if (!Number.isInteger(userId) || typeof email !== 'string' || !ROLES.includes(role)) return null;
  if (!Number.isInteger(tokenVersion) || typeof payload.exp !== 'number') return null;
  return { userId, email, role: role as Role, tokenVersion: tokenVersion as number, expiresAt: payload.exp * 1000 };
}
