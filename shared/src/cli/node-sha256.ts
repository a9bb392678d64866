/** Node's crypto SHA-256 for the report's input hash at the Node edge (native speed). */
import { createHash } from 'node:crypto';

export function nodeSha256(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}
