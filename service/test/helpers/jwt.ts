import { createHmac } from 'node:crypto';

const b64 = (o: unknown) => Buffer.from(JSON.stringify(o)).toString('base64url');

/** Builds an HS256 JWT by hand (RFC 7519), independent of the service's own signing code. */
export function signHs256(payload: Record<string, unknown>, secret: string): string {
  const head = `${b64({ alg: 'HS256', typ: 'JWT' })}.${b64(payload)}`;
  return `${head}.${createHmac('sha256', secret).update(head).digest('base64url')}`;
}

export function decodePayload(token: string): Record<string, unknown> {
  return JSON.parse(Buffer.from(token.split('.')[1], 'base64url').toString('utf8'));
}
