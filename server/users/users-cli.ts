/**
 * `npm run users -- COMMAND`: manage accounts from the command line, e.g. to create the first
 * admin. Uses the server's database settings (`TILTWATCH_DATA_DIR` or `DATABASE_URL`). With the
 * embedded database it takes the data folder's lock, so it refuses while a server runs on that
 * folder; with `DATABASE_URL` it works next to a running server (PostgreSQL serialises the
 * writes; the server re-reads accounts on every request).
 *
 *   add EMAIL --role ROLE      add an account; the password is prompted on a terminal,
 *                              otherwise read as the first line of standard input
 *   set-password EMAIL         set a new password the same way (revokes the account's tokens)
 *   list                       list the accounts
 */
import { userInfo } from 'node:os';
import { ROLES, type Role } from '../../shared/auth/roles.js';
import { PASSWORD_MAX_LENGTH, PASSWORD_MIN_LENGTH } from '../../shared/auth/user-api.js';
import { textProblem } from '../../shared/validation/edge-rules.js';
import { ConfigError, loadConfig } from '../config.js';
import { DataFolderLockedError, lockDataFolder, type DataFolderLock } from '../data-folder/data-folder-lock.js';
import { openDatabase } from '../db/database.js';
import { emailAddress } from '../http/fields.js';
import { readPassword } from './read-password.js';
import { AccountError, UserAccounts } from './user-accounts.js';

const USAGE = `usage: npm run users -- add EMAIL --role ${ROLES.join('|')}
       npm run users -- set-password EMAIL
       npm run users -- list
(the password is prompted on a terminal, otherwise read as the first line of standard input)`;

/** A mistake in the command line or its input: exit 2 with the message. */
class UsageError extends Error {}

function parseArgs(args: string[]): { command: 'add'; email: string; role: Role } | { command: 'set-password'; email: string } | { command: 'list' } {
  const [command, ...rest] = args;
  const email = () => {
    const parsed = emailAddress().safeParse(rest[0] ?? '');
    if (!parsed.success) throw new UsageError(`EMAIL must be an e-mail address, e.g. first.admin@lindqvist-hall.example (got ${JSON.stringify(rest[0] ?? '')})`);
    return parsed.data;
  };
  if (command === 'list' && rest.length === 0) return { command };
  if (command === 'set-password' && rest.length === 1) return { command, email: email() };
  if (command === 'add' && rest.length === 3 && rest[1] === '--role') {
    const role = rest[2] as Role;
    if (!ROLES.includes(role)) throw new UsageError(`--role must be one of ${ROLES.join(', ')} (got ${JSON.stringify(rest[2])})`);
    return { command, email: email(), role };
  }
  throw new UsageError(USAGE);
}

async function newPassword(): Promise<string> {
  const password = await readPassword('Password for the account: ', 'Repeat the password: ');
  if (password.length < PASSWORD_MIN_LENGTH) throw new UsageError(`the password must be at least ${PASSWORD_MIN_LENGTH} characters`);
  if (password.length > PASSWORD_MAX_LENGTH) throw new UsageError(`the password must be at most ${PASSWORD_MAX_LENGTH} characters`);
  const problem = textProblem(password);
  if (problem) throw new UsageError(`the password ${problem}`);
  return password;
}

async function main(): Promise<number> {
  const command = parseArgs(process.argv.slice(2));
  const config = loadConfig();
  let lock: DataFolderLock | null = null;
  if (config.databaseUrl === null) lock = lockDataFolder(config.dataDir);
  try {
    const password = command.command === 'list' ? '' : await newPassword();
    const database = await openDatabase({ dataDir: config.dataDir, databaseUrl: config.databaseUrl });
    try {
      const accounts = new UserAccounts(database.db);
      const actor = `cli:${userInfo().username}`;
      if (command.command === 'add') {
        const user = await accounts.create({ email: command.email, role: command.role, password }, actor, 'added from the command line');
        console.log(`Added ${user.email} (${user.role}). Sign in at the Tiltwatch address with this e-mail and password.`);
      } else if (command.command === 'set-password') {
        const user = await accounts.setPassword(command.email, password, actor);
        console.log(`New password set for ${user.email}; its earlier sign-ins are revoked.`);
      } else {
        const users = await accounts.list();
        if (users.length === 0) console.log('No accounts yet. Add the first admin: npm run users -- add EMAIL --role admin');
        for (const u of users) console.log(`${u.email}\t${u.role}${u.disabled ? '\tdisabled' : ''}`);
      }
      return 0;
    } finally {
      await database.close();
    }
  } finally {
    lock?.release();
  }
}

main().then(
  (code) => process.exit(code),
  (error: unknown) => {
    if (error instanceof DataFolderLockedError) {
      console.error(`tiltwatch users: ${error.message}\nAccounts of a running server are managed on its Admin → Users page; stop the server to use this command on its data folder.`);
      process.exit(2);
    }
    if (error instanceof UsageError || error instanceof ConfigError) {
      console.error(`tiltwatch users: ${error.message}`);
      process.exit(2);
    }
    if (error instanceof AccountError) {
      console.error(`tiltwatch users: ${error.message}`);
      process.exit(1);
    }
    console.error(`tiltwatch users: failed: ${(error as Error).message}`);
    process.exit(1);
  },
);
