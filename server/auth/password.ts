import { hash, verify } from '@node-rs/argon2';

/** argon2id hash (PHC string) with the library's defaults (19 MiB, 2 passes). */
export function hashPassword(password: string): Promise<string> {
  return hash(password);
}

/** True when `password` matches the PHC string `passwordHash`; false for a malformed hash. */
export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
  try {
    return await verify(passwordHash, password);
  } catch {
    return false;
  }
}
