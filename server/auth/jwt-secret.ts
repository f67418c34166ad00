import { randomBytes } from 'node:crypto';
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';

export const JWT_SECRET_FILE = 'jwt-secret';
const SECRET_BYTES = 64;

/**
 * The HMAC key that signs sign-in tokens: read from `${dataDir}/jwt-secret`, or generated
 * (64 random bytes) and written there with mode 0600 on first start. Deleting the file signs
 * everybody out at the next start.
 */
export function loadOrCreateJwtSecret(dataDir: string): Buffer {
  mkdirSync(dataDir, { recursive: true });
  const file = path.join(dataDir, JWT_SECRET_FILE);
  try {
    writeFileSync(file, randomBytes(SECRET_BYTES).toString('base64'), { flag: 'wx', mode: 0o600 });
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code !== 'EEXIST') throw error;
  }
  const secret = Buffer.from(readFileSync(file, 'utf8').trim(), 'base64');
  if (secret.length < 32) {
    throw new Error(`${file} holds a key shorter than 32 bytes; delete the file to generate a new one (signs everybody out)`);
  }
  return secret;
}
