import bcrypt from 'bcryptjs';
import { createHash, randomBytes } from 'node:crypto';

/** bcrypt cost 10: about 60 ms per hash on this machine, the library's default. */
const BCRYPT_COST = 10;

export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, BCRYPT_COST);
}

export function verifyPassword(password: string, hash: string): Promise<boolean> {
  return bcrypt.compare(password, hash);
}

/** A random URL-safe token and the SHA-256 hash that is stored in its place. */
export function newToken(): { token: string; tokenHash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, tokenHash: hashToken(token) };
}

export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

/** Spends the same time as a real check so an unknown e-mail cannot be told from a wrong password. */
const DUMMY_HASH = bcrypt.hashSync('brackline-dummy-password', BCRYPT_COST);
export async function spendPasswordCheckTime(password: string): Promise<void> {
  await bcrypt.compare(password, DUMMY_HASH);
}
