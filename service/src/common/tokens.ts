import { createHash, randomBytes, randomUUID } from 'node:crypto';

/** A URL-safe random token (256 bits) for links and cookies; only its hash is stored. */
export function newToken(): string {
  return randomBytes(32).toString('base64url');
}

/** SHA-256 hex of a token: what the database keeps instead of the token itself. */
export function hashToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex');
}

export function newId(): string {
  return randomUUID();
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
export function isUuid(value: string): boolean {
  return UUID.test(value);
}
