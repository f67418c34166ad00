import type { RequestHandler } from 'express';
import { Passport } from 'passport';
import { ExtractJwt, Strategy as JwtStrategy } from 'passport-jwt';
import { hasRole, type Role } from '../../shared/auth/roles.js';
import type { Db } from '../db/database.js';
import { isConnectionFailure } from '../db/database-health.js';
import { HttpError } from '../http/http-error.js';
import { claimsOf, type TokenIssuer, type VerifiedClaims } from './tokens.js';
import { findUserById, isDemoAccount } from './users-repository.js';

/** The person behind a request, as the database knows them now. */
export interface SignedInUser {
  id: number;
  email: string;
  role: Role;
}

/** A WebSocket sign-in: the user and when the token expires (ms since the epoch). */
export interface SocketSession {
  user: SignedInUser;
  expiresAt: number;
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    // passport types `req.user` as Express.User; ours carries the role.
    interface User extends SignedInUser {}
  }
}

/**
 * Who may do what: Bearer-token sign-in (passport-jwt) for the HTTP API and the same check
 * for the WebSocket. The role comes from the database, not from the token, so a changed role
 * or a removed account takes effect at the next request; a token is refused once its account is
 * disabled or removed, or its token version (`tv`) is below the account's (raised by a
 * password change and by disabling; a role change keeps the tokens and applies at once).
 */
export class AccessControl {
  private readonly passport = new Passport();
  private readonly lastRead = new Map<number, NonNullable<Awaited<ReturnType<typeof findUserById>>>>();

  constructor(
    private readonly db: Db,
    private readonly tokens: TokenIssuer,
    /** Whether the demo accounts may be used (`--demo`). */
    private readonly demoAccounts = false,
  ) {
    this.passport.use(
      'jwt',
      new JwtStrategy(
        { ...tokens.verifyOptions, jwtFromRequest: ExtractJwt.fromAuthHeaderAsBearerToken() },
        (payload: object, done: (error: unknown, user?: SignedInUser | false) => void) => {
          this.userFor(claimsOf(payload)).then((user) => done(null, user ?? false), done);
        },
      ),
    );
  }

  /** The session for a token (WebSocket sign-in and re-checks); null when the token is not good (any more). */
  async sessionForToken(token: string): Promise<SocketSession | null> {
    const claims = this.tokens.verify(token);
    const user = await this.userFor(claims);
    return user && claims ? { user, expiresAt: claims.expiresAt } : null;
  }

  /**
   * Middleware admitting signed-in users whose role is at least `role`: 401 without a valid
   * token, 403 with too little authority.
   */
  requireRole(role: Role): RequestHandler {
    return (req, res, next) => {
      const authenticate = this.passport.authenticate('jwt', { session: false }, (error: unknown, user: SignedInUser | false) => {
        if (error) return next(error);
        if (!user) {
          return next(new HttpError(401, 'Sign in first: send "Authorization: Bearer <token>" with a token from POST /api/auth/login (it is missing, invalid or expired)'));
        }
        if (!hasRole(user.role, role)) {
          return next(new HttpError(403, `This needs the ${role} role or higher; ${user.email} is ${user.role}`));
        }
        req.user = user;
        next();
      }) as RequestHandler;
      authenticate(req, res, next);
    };
  }

  private async userFor(claims: VerifiedClaims | null): Promise<SignedInUser | null> {
    if (!claims) return null;
    const user = await this.findUser(claims.userId);
    if (!user || user.email !== claims.email || user.disabled || user.tokenVersion !== claims.tokenVersion) return null;
    if (!this.demoAccounts && isDemoAccount(user.email)) return null;
    return { id: user.id, email: user.email, role: user.role };
  }

  /**
   * The account as the database has it. While the database cannot be reached, the account as it
   * was last read (nothing can change it meanwhile through this server), so people keep seeing
   * the apparatus during an outage; what needs the database still answers 503.
   */
  private async findUser(id: number): Promise<Awaited<ReturnType<typeof findUserById>>> {
    try {
      const user = await findUserById(this.db, id);
      if (user) this.lastRead.set(id, user);
      else this.lastRead.delete(id);
      return user;
    } catch (error) {
      const known = this.lastRead.get(id);
      if (known && isConnectionFailure(error)) return known;
      throw error;
    }
  }
}
