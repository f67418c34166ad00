/**
 * `npm run users -- COMMAND`: manage accounts from the command line, e.g. to create the first
 * admin. Uses the server's database settings (`TILTWATCH_DATA_DIR` or `DATABASE_URL`). With the
 * embedded database it takes the data folder's lock, so it refuses while a server runs on that
 * folder; with `DATABASE_URL` it works next to a running server (PostgreSQL serialises the
 * writes; the server re-reads accounts on every request).
 *
 *   add EMAIL --role ROLE               add an account; the password is prompted on a terminal,
 *                                       otherwise read as the first line of standard input
 *   set-password EMAIL                  set a new password the same way (revokes the account's tokens)
 *   set-role EMAIL ROLE --reason TEXT   give the account another role (its sessions keep going with it)
 *   disable EMAIL --reason TEXT         disable the account (revokes its tokens; it cannot sign in)
 *   enable EMAIL --reason TEXT          let a disabled account sign in again
 *   list                                list the accounts
 *
 * Role changes, disabling and enabling go through `UserAccounts.update`, as on the Users page:
 * audited with the reason, and at least one enabled admin always remains.
 */
import { userInfo } from 'node:os';
import { ROLES, type Role } from '../../shared/auth/roles.js';
import { PASSWORD_MAX_LENGTH, PASSWORD_MIN_LENGTH } from '../../shared/auth/user-api.js';
import { textProblem } from '../../shared/validation/edge-rules.js';
import { findUserByEmail } from '../auth/users-repository.js';
import { ConfigError, loadConfig } from '../config.js';
import { DataFolderLockedError, lockDataFolder, type DataFolderLock } from '../data-folder/data-folder-lock.js';
import { openDatabase, type Db } from '../db/database.js';
import { emailAddress, reasonText } from '../http/fields.js';
import { readPassword } from './read-password.js';
import { AccountError, UserAccounts, type AccountChange } from './user-accounts.js';

const USAGE = `usage: npm run users -- add EMAIL --role ${ROLES.join('|')}
       npm run users -- set-password EMAIL
       npm run users -- set-role EMAIL ${ROLES.join('|')} --reason TEXT
       npm run users -- disable EMAIL --reason TEXT
       npm run users -- enable EMAIL --reason TEXT
       npm run users -- list
(the password is prompted on a terminal, otherwise read as the first line of standard input;
the reason goes into the audit trail)`;

const REASON_EXAMPLES = { 'set-role': 'runs the night shift from May', disable: 'left the group', enable: 'back for the summer campaign' };

/** A mistake in the command line or its input: exit 2 with the message. */
class UsageError extends Error {}

type Command =
  | { command: 'add'; email: string; role: Role }
  | { command: 'set-password'; email: string }
  | { command: 'set-role'; email: string; role: Role; reason: string }
  | { command: 'disable' | 'enable'; email: string; reason: string }
  | { command: 'list' };

function parseArgs(args: string[]): Command {
  const [command, ...rest] = args;
  const email = () => {
    const parsed = emailAddress().safeParse(rest[0] ?? '');
    if (!parsed.success) throw new UsageError(`EMAIL must be an e-mail address, e.g. first.admin@lindqvist-hall.example (got ${JSON.stringify(rest[0] ?? '')})`);
    return parsed.data;
  };
  const role = (name: string, text: string) => {
    if (!ROLES.includes(text as Role)) throw new UsageError(`${name} must be one of ${ROLES.join(', ')} (got ${JSON.stringify(text)})`);
    return text as Role;
  };
  /** `--reason TEXT` as the last two arguments, after `positional` others. */
  const reason = (positional: number) => {
    if (rest.length !== positional + 2 || rest[positional] !== '--reason') {
      throw new UsageError(`${command} needs --reason TEXT, e.g. --reason "${REASON_EXAMPLES[command as keyof typeof REASON_EXAMPLES]}": say why (it goes into the audit trail)\n${USAGE}`);
    }
    const parsed = reasonText().safeParse(rest[positional + 1]);
    if (!parsed.success) throw new UsageError(`--reason ${parsed.error.issues[0].message}`);
    return parsed.data;
  };
  if (command === 'list' && rest.length === 0) return { command };
  if (command === 'set-password' && rest.length === 1) return { command, email: email() };
  if (command === 'add' && rest.length === 3 && rest[1] === '--role') return { command, email: email(), role: role('--role', rest[2]) };
  if (command === 'set-role' && rest.length >= 2) return { command, email: email(), role: role('ROLE', rest[1]), reason: reason(2) };
  if ((command === 'disable' || command === 'enable') && rest.length >= 1) return { command, email: email(), reason: reason(1) };
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

/** Role changes, disabling and enabling, through the same rules as the Users page; returns what to print. */
async function changeAccount(db: Db, command: Extract<Command, { reason: string }>, actor: string): Promise<string> {
  const account = await findUserByEmail(db, command.email);
  if (!account) throw new AccountError('not-found', `no account for ${command.email}; see the accounts with: npm run users -- list`);
  const change: AccountChange = command.command === 'set-role' ? { role: command.role } : { disabled: command.command === 'disable' };
  // The command line cannot know whether the server runs with --demo: a demo admin never counts as the remaining admin here.
  const { user, changed } = await new UserAccounts(db, undefined, false).update(account.id, change, actor, command.reason).catch((error: unknown) => {
    // The one refusal of an existing account: it is the last enabled admin.
    if (!(error instanceof AccountError && error.kind === 'conflict')) throw error;
    throw new AccountError('conflict', `${error.message} (npm run users -- set-role OTHER-EMAIL admin --reason TEXT, or add one with npm run users -- add EMAIL --role admin); nothing was changed`);
  });
  const state = user.disabled ? 'disabled' : 'enabled';
  if (!changed) return `${user.email} is already ${command.command === 'set-role' ? user.role : state}; nothing was changed.`;
  if (command.command === 'set-role') return `${user.email} is now ${user.role} (was ${account.role}); its open sessions continue with the new role.`;
  if (user.disabled) return `Disabled ${user.email}: its earlier sign-ins are revoked and it cannot sign in until enabled again.`;
  return `Enabled ${user.email}; it can sign in again with its password.`;
}

async function main(): Promise<number> {
  const command = parseArgs(process.argv.slice(2));
  const config = loadConfig();
  let lock: DataFolderLock | null = null;
  if (config.databaseUrl === null) lock = lockDataFolder(config.dataDir);
  try {
    const password = command.command === 'add' || command.command === 'set-password' ? await newPassword() : '';
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
      } else if (command.command === 'list') {
        const users = await accounts.list();
        if (users.length === 0) console.log('No accounts yet. Add the first admin: npm run users -- add EMAIL --role admin');
        for (const u of users) console.log(`${u.email}\t${u.role}${u.disabled ? '\tdisabled' : ''}`);
      } else {
        console.log(await changeAccount(database.db, command, actor));
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
