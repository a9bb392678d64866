/** SHA-256 of input bytes as lower-case hex (@noble/hashes: pure JS, browser-safe). */
import { sha256 } from '@noble/hashes/sha2';
import { bytesToHex } from '@noble/hashes/utils';

export function sha256Hex(bytes: Uint8Array): string {
  return bytesToHex(sha256(bytes));
}
