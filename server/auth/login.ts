import type { Role } from '../../shared/auth/roles.js';
import type { Db } from '../db/database.js';
import { HttpError } from '../http/http-error.js';
import { hashPassword, verifyPassword } from './password.js';
import type { TokenIssuer } from './tokens.js';
import { findUserByEmail } from './users-repository.js';

export interface LoginResult {
  token: string;
  user: { email: string; role: Role };
}

const WRONG_CREDENTIALS = 'Wrong e-mail or password';

/**
 * Signs a person in. Unknown e-mail and wrong password give the same 401 and take about the
 * same time (a hash is verified either way), so the answer does not reveal who has an account.
 */
export class LoginUseCase {
  private decoyHash: Promise<string> | null = null;

  constructor(
    private readonly db: Db,
    private readonly tokens: TokenIssuer,
  ) {}

  async login(email: string, password: string): Promise<LoginResult> {
    const user = await findUserByEmail(this.db, email);
    if (!user) {
      this.decoyHash ??= hashPassword('decoy password that matches no account');
      await verifyPassword(await this.decoyHash, password);
      throw new HttpError(401, WRONG_CREDENTIALS);
    }
    if (!(await verifyPassword(user.passwordHash, password))) throw new HttpError(401, WRONG_CREDENTIALS);
    return {
      token: this.tokens.sign({ userId: user.id, email: user.email, role: user.role }),
      user: { email: user.email, role: user.role },
    };
  }
}
