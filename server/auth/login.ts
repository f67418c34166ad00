import type { Role } from '../../shared/auth/roles.js';
import type { Db } from '../db/database.js';
import { HttpError } from '../http/http-error.js';
import { hashPassword, verifyPassword } from './password.js';
import type { SecurityLog } from './security-log.js';
import type { SignInThrottle } from './sign-in-throttle.js';
import type { TokenIssuer } from './tokens.js';
import { findUserByEmail, isDemoAccount, normaliseEmail } from './users-repository.js';

export interface LoginResult {
  token: string;
  user: { email: string; role: Role };
}

/** A sign-in refused by the throttle before the password was checked. */
export class SignInThrottledError extends HttpError {
  constructor(
    readonly scope: 'account' | 'address',
    readonly retryAfterS: number,
  ) {
    super(
      429,
      scope === 'account'
        ? `Too many failed sign-ins for this account: wait ${retryAfterS} s and try again (an admin can lift the delay)`
        : `Too many failed sign-ins from this computer: wait ${retryAfterS} s and try again (an admin can lift the limit)`,
    );
  }
}

const WRONG_CREDENTIALS = 'Wrong e-mail or password';

/**
 * Signs a person in. Unknown e-mail and wrong password give the same 401 and take about the
 * same time (a hash is verified either way), so the answer does not reveal who has an account.
 * The throttle is asked first (an unknown e-mail is throttled like a known one); a disabled
 * account is told so only after its correct password.
 */
export class LoginUseCase {
  private decoyHash: Promise<string> | null = null;

  constructor(
    private readonly db: Db,
    private readonly tokens: TokenIssuer,
    private readonly throttle: SignInThrottle,
    private readonly security: SecurityLog,
    /** Whether the demo accounts may sign in (`--demo`); otherwise they count as unknown. */
    private readonly demoAccounts = false,
  ) {}

  async login(rawEmail: string, password: string, address: string): Promise<LoginResult> {
    const email = normaliseEmail(rawEmail);
    const verdict = this.throttle.check(email, address);
    if (!verdict.allowed) throw new SignInThrottledError(verdict.scope, Math.max(1, Math.ceil(verdict.retryAfterMs / 1000)));
    const found = await findUserByEmail(this.db, email);
    const user = found && (this.demoAccounts || !isDemoAccount(found.email)) ? found : null;
    if (!user) {
      this.decoyHash ??= hashPassword('decoy password that matches no account');
      await verifyPassword(await this.decoyHash, password);
      this.throttle.failed(email, address);
      throw new HttpError(401, WRONG_CREDENTIALS);
    }
    if (!(await verifyPassword(user.passwordHash, password))) {
      this.throttle.failed(email, address);
      throw new HttpError(401, WRONG_CREDENTIALS);
    }
    this.throttle.succeeded(email);
    if (user.disabled) {
      this.security.record({ kind: 'sign-in.disabled-account', email, address });
      throw new HttpError(403, 'This account is disabled; ask an admin to enable it');
    }
    return {
      token: this.tokens.sign({ userId: user.id, email: user.email, role: user.role, tokenVersion: user.tokenVersion }),
      user: { email: user.email, role: user.role },
    };
  }
}
