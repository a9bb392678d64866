import { constants, gunzipSync } from 'node:zlib';
import { type InputFormat, sniffPlainFormat } from '@foldfolio/shared';

export interface SniffedFormat {
  format: InputFormat;
  gzip: boolean;
}

/** The upload is not a coordinate file (whatever its name says). */
export class NotAStructureError extends Error {
  constructor(filename: string) {
    super(
      `"${filename}" is not a coordinate file Foldfolio can read: its content is neither PDBx/mmCIF (text starting with "data_"), BinaryCIF, nor PDB records (ATOM, HETATM, HEADER…), whether or not gzip-compressed. Check that you picked the model file, not a map, log or report, and upload it again.`,
    );
    this.name = 'NotAStructureError';
  }
}

export class EmptyUploadError extends Error {
  constructor(filename: string) {
    super(`"${filename}" is empty (0 bytes). Choose the coordinate file again and upload it.`);
    this.name = 'EmptyUploadError';
  }
}

// What the bytes are is decided by the engine's own test (shared/src/io/read.ts), so an upload
// accepted here is one the analysis worker can read. Here only the head of the upload is at hand
// (the gzip stream is partly inflated) and the error sentences are the upload's own. No filename
// hint is passed: the extension is never trusted.
function sniffPlain(bytes: Buffer): InputFormat | null {
  return sniffPlainFormat(bytes);
}

/**
 * Decides the coordinate format from the first bytes of an upload (the extension is never
 * trusted). A gzip stream (magic 1f 8b, RFC 1952) is partly inflated to look inside.
 */
export function sniffFormat(head: Buffer, filename: string): SniffedFormat {
  if (head.length === 0) {
    throw new EmptyUploadError(filename);
  }
  if (head.length >= 2 && head[0] === 0x1f && head[1] === 0x8b) {
    let inner: Buffer;
    try {
      // Only the head is here: a sync flush inflates what it can without needing the end.
      inner = gunzipSync(head.subarray(0, 8192), {
        finishFlush: constants.Z_SYNC_FLUSH,
        maxOutputLength: 1 << 24,
      });
    } catch {
      throw new NotAStructureError(filename);
    }
    const format = inner.length > 0 ? sniffPlain(inner) : null;
    if (!format) throw new NotAStructureError(filename);
    return { format, gzip: true };
  }
  const format = head.length > 0 ? sniffPlain(head) : null;
  if (!format) throw new NotAStructureError(filename);
  return { format, gzip: false };
}

/**
 * Keeps the last path component of a client-supplied filename and only characters that are safe
 * everywhere we show or store it; the name is a label, never a path (blobs are stored by hash).
 */
export function sanitizeFilename(raw: string | undefined | null): string {
  const base = (raw ?? '').split(/[\\/]/).pop() ?? '';
  const cleaned = base
    .normalize('NFC')
    .replace(/[^\p{L}\p{N}._+-]+/gu, '_')
    .replace(/^[._]+/, '')
    .slice(0, 120);
  return cleaned === '' ? 'model' : cleaned;
}
