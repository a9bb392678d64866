/** Gzip decompression with a ceiling on the uncompressed size (guards against gzip bombs). */
import { Gunzip } from 'fflate';
import { StructureReadError } from './errors';

/** Default ceiling: 2 GiB uncompressed (far above the largest archive entries, bounded memory). */
export const DEFAULT_MAX_UNCOMPRESSED_BYTES = 2 * 1024 * 1024 * 1024;

export function isGzip(bytes: Uint8Array): boolean {
  return bytes.length >= 2 && bytes[0] === 0x1f && bytes[1] === 0x8b;
}

class TooLarge extends Error {}

/**
 * A platform gunzip the caller may inject (e.g. Node's zlib at the service/CLI edge, several
 * times faster than pure JS). It must stop past `maxBytes` by throwing `GunzipTooLarge`, and
 * throw anything else for damaged data.
 */
export type GunzipFunction = (bytes: Uint8Array, maxBytes: number) => Uint8Array;

export class GunzipTooLarge extends Error {}

function tooLarge(maxBytes: number): StructureReadError {
  return new StructureReadError(
    `The gzip file expands to more than ${maxBytes} bytes, the limit for one structure; upload the uncompressed structure or a smaller file.`,
    { item: 'gzip' },
  );
}

function damaged(e: unknown): StructureReadError {
  return new StructureReadError(
    `The gzip data is damaged or incomplete (${e instanceof Error ? e.message : String(e)}); compress the file again or upload it uncompressed.`,
    { item: 'gzip' },
  );
}

export function gunzipLimited(
  bytes: Uint8Array,
  maxBytes: number,
  inflate?: GunzipFunction,
): Uint8Array {
  if (inflate !== undefined) {
    let out: Uint8Array;
    try {
      out = inflate(bytes, maxBytes);
    } catch (e) {
      if (e instanceof GunzipTooLarge) throw tooLarge(maxBytes);
      throw damaged(e);
    }
    if (out.length > maxBytes) throw tooLarge(maxBytes);
    return out;
  }
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
    if (e instanceof TooLarge) throw tooLarge(maxBytes);
    throw damaged(e);
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
