import { constants, gunzipSync } from 'node:zlib';
import type { InputFormat } from '@foldfolio/shared';

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

// Record names that may open a PDB file (wwPDB PDB format 3.3, section headings; common practice).
const PDB_RECORDS = new Set([
  'HEADER',
  'OBSLTE',
  'TITLE',
  'SPLIT',
  'CAVEAT',
  'COMPND',
  'SOURCE',
  'KEYWDS',
  'EXPDTA',
  'NUMMDL',
  'MDLTYP',
  'AUTHOR',
  'REVDAT',
  'SPRSDE',
  'JRNL',
  'REMARK',
  'DBREF',
  'DBREF1',
  'SEQADV',
  'SEQRES',
  'MODRES',
  'HET',
  'HETNAM',
  'HETSYN',
  'FORMUL',
  'HELIX',
  'SHEET',
  'SSBOND',
  'LINK',
  'CISPEP',
  'SITE',
  'CRYST1',
  'ORIGX1',
  'SCALE1',
  'MTRIX1',
  'MODEL',
  'ATOM',
  'HETATM',
  'ANISOU',
  'TER',
  'END',
  'ENDMDL',
  'CONECT',
  'MASTER',
]);

function isText(bytes: Buffer): boolean {
  const n = Math.min(bytes.length, 4096);
  if (n === 0) return false;
  let control = 0;
  for (let i = 0; i < n; i++) {
    const c = bytes[i];
    if (c === 0) return false;
    if (c < 9 || (c > 13 && c < 32)) control++;
  }
  // a few stray control bytes are tolerated, 1 % is common practice for text detection, no source
  return control <= n / 100;
}

function firstMeaningfulLine(text: string, skipHash: boolean): string | null {
  for (const raw of text.split('\n')) {
    const line = raw.replace(/\r$/, '');
    if (line.trim() === '') continue;
    if (skipHash && line.trim().startsWith('#')) continue;
    return line;
  }
  return null;
}

function sniffPlain(bytes: Buffer): InputFormat | null {
  const b0 = bytes[0];
  // BinaryCIF is a MessagePack map (fixmap 0x80–0x8f, map16 0xde, map32 0xdf) whose keys include
  // "encoder", "version" and "dataBlocks" (BinaryCIF specification, molstar/BinaryCIF on GitHub).
  if ((b0 >= 0x80 && b0 <= 0x8f) || b0 === 0xde || b0 === 0xdf) {
    const head = bytes.subarray(0, 512).toString('latin1');
    if (head.includes('dataBlocks') || head.includes('encoder')) return 'bcif';
    return null;
  }
  if (!isText(bytes)) return null;
  const text = bytes.subarray(0, 16384).toString('latin1');
  const cifLine = firstMeaningfulLine(text, true);
  // A CIF file starts with a data block header (CIF 1.1 syntax); comments may precede it.
  if (cifLine !== null && cifLine.trim().toLowerCase().startsWith('data_')) return 'mmcif';
  const pdbLine = firstMeaningfulLine(text, false);
  if (pdbLine !== null) {
    const record = pdbLine.slice(0, 6).trim().toUpperCase();
    if (PDB_RECORDS.has(record)) return 'pdb';
  }
  return null;
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
