/** Gzip decompression with a ceiling on the uncompressed size (guards against gzip bombs). */
import { Gunzip } from 'fflate';
import { StructureReadError } from './errors';

/** Default ceiling: 2 GiB uncompressed (far above the largest archive entries, bounded memory). */
export const DEFAULT_MAX_UNCOMPRESSED_BYTES = 2 * 1024 * 1024 * 1024;

export function isGzip(bytes: Uint8Array): boolean {
  return bytes.length >= 2 && bytes[0] === 0x1f && bytes[1] === 0x8b;
}

class TooLarge extends Error {}

export function gunzipLimited(bytes: Uint8Array, maxBytes: number): Uint8Array {
  const chunks: Uint8Array[] = [];
  let total = 0;
  const g = new Gunzip((chunk) => {
    total += chunk.length;
    if (total > maxBytes) throw new TooLarge();
    chunks.push(chunk);
  });
  try {
    g.push(bytes, true);
  } catch (e) {
    if (e instanceof TooLarge) {
      throw new StructureReadError(
        `The gzip file expands to more than ${maxBytes} bytes, the limit for one structure; upload the uncompressed structure or a smaller file.`,
        { item: 'gzip' },
      );
    }
    throw new StructureReadError(
      `The gzip data is damaged or incomplete (${e instanceof Error ? e.message : String(e)}); compress the file again or upload it uncompressed.`,
      { item: 'gzip' },
    );
  }
  if (chunks.length === 1) return chunks[0];
  const out = new Uint8Array(total);
  let o = 0;
  for (const c of chunks) {
    out.set(c, o);
    o += c.length;
  }
  return out;
}
