import { createHash } from 'node:crypto';
import bcrypt from 'bcryptjs';

/**
 * bcrypt reads only the first 72 bytes of its input, so long passphrases would be silently
 * truncated; we hash the password with SHA-256 first (base64, 44 bytes) and bcrypt that.
 */
function prehash(password: string): string {
  return createHash('sha256').update(password.normalize('NFC'), 'utf8').digest('base64');
}

export function hashPassword(password: string, cost: number): Promise<string> {
  return bcrypt.hash(prehash(password), cost);
}

export function verifyPassword(password: string, hash: string): Promise<boolean> {
  return bcrypt.compare(prehash(password), hash);
}
