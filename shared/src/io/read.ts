/**
 * `readStructure`: one entry point for every coordinate format. The format is sniffed from the
 * content (gzip magic, BinaryCIF MessagePack map, CIF `data_`, PDB records); the filename only
 * breaks ties and shapes error messages.
 */
import type { InputFormat } from '../report/types';
import type { Structure } from '../model/types';
import {
  blockToStructure,
  emptyCifBlock,
  parseBinaryCif,
  parseCifText,
  parseCifTextBlocks,
  scannedCifToStructure,
} from './cif';
import { scanAtomSite } from './cif-atom-site';
import { StructureReadError } from './errors';
import { DEFAULT_MAX_UNCOMPRESSED_BYTES, gunzipLimited, isGzip } from './gzip';
import type { GunzipFunction } from './gzip';
import { readPdb } from './pdb';

export interface ReadOptions {
  /** ceiling on the decompressed size of gzip input (default 2 GiB) */
  maxUncompressedBytes?: number;
  /** platform gunzip to use instead of the built-in pure-JS one (see GunzipFunction) */
  gunzip?: GunzipFunction;
  /** false: read mmCIF `_atom_site` through Mol* too (the fast byte scanner is the default) */
  cifFastPath?: boolean;
}

export interface SniffResult {
  format: InputFormat;
  gzip: boolean;
  /** the decompressed bytes */
  bytes: Uint8Array;
}

// Record names of the wwPDB PDB format 3.3 (plus USER, written by hydrogen-adding programs)
const PDB_RECORDS = new Set([
  'HEADER',
  'OBSLTE',
  'TITLE ',
  'SPLIT ',
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
  'JRNL  ',
  'REMARK',
  'DBREF ',
  'DBREF1',
  'DBREF2',
  'SEQADV',
  'SEQRES',
  'MODRES',
  'HET   ',
  'HETNAM',
  'HETSYN',
  'FORMUL',
  'HELIX ',
  'SHEET ',
  'SSBOND',
  'LINK  ',
  'CISPEP',
  'SITE  ',
  'CRYST1',
  'ORIGX1',
  'SCALE1',
  'MTRIX1',
  'MODEL ',
  'ATOM  ',
  'ANISOU',
  'HETATM',
  'TER   ',
  'ENDMDL',
  'CONECT',
  'MASTER',
  'END   ',
  'USER  ',
]);

/** True when the first bytes look like text (no NUL, few control characters). */
function looksLikeText(bytes: Uint8Array): boolean {
  const n = Math.min(bytes.length, 4096);
  let bad = 0;
  for (let i = 0; i < n; i++) {
    const c = bytes[i];
    if (c === 0) return false;
    if (c < 9 || (c > 13 && c < 32)) bad++;
  }
  return bad <= n / 100;
}

const LATIN1 = new TextDecoder('latin1');

/** The first n bytes as single-byte text (enough to recognise a format). */
function headText(bytes: Uint8Array, n: number): string {
  return LATIN1.decode(bytes.subarray(0, Math.min(bytes.length, n)));
}

function isCifText(head: string): boolean {
  for (const raw of head.split('\n')) {
    const l = raw.trim();
    if (l === '' || l.startsWith('#')) continue;
    return l.toLowerCase().startsWith('data_');
  }
  return false;
}

function isPdbText(head: string): boolean {
  for (const raw of head.split('\n')) {
    if (raw.trim() === '') continue;
    const rec = (raw.replace('\r', '') + '      ').slice(0, 6);
    return PDB_RECORDS.has(rec) || rec.startsWith('TER') || rec.startsWith('END');
  }
  return false;
}

/**
 * The format of uncompressed coordinate bytes from their first few kB (BinaryCIF, mmCIF or PDB),
 * or null when they are none of these. Only the head is read, so a leading slice of a file is
 * enough; a PDB/ENT filename only rescues PDB text whose first record we do not know.
 */
export function sniffPlainFormat(bytes: Uint8Array, filenameHint = ''): InputFormat | null {
  if (bytes.length === 0) return null;
  const b0 = bytes[0];
  // BinaryCIF is a MessagePack map (fixmap 0x80–0x8f, map16 0xde, map32 0xdf) holding "encoder"/"dataBlocks"
  if ((b0 >= 0x80 && b0 <= 0x8f) || b0 === 0xde || b0 === 0xdf) {
    const head = headText(bytes, 256);
    if (head.includes('dataBlocks') || head.includes('encoder')) return 'bcif';
  }
  if (looksLikeText(bytes)) {
    const head = headText(bytes, 4096);
    if (isCifText(head)) return 'mmcif';
    if (isPdbText(head)) return 'pdb';
    const hint = filenameHint.toLowerCase();
    if (/\.(pdb|ent)(\.gz)?$/.test(hint) && head.includes('ATOM  ')) return 'pdb';
  }
  return null;
}

/**
 * The last gzip sniff of each input buffer: a report reads the same upload twice (coordinates,
 * then the experiment records), and inflating it once is enough. Keyed weakly on the caller's
 * buffer, so an entry lives no longer than the upload; the limit, the inflater and the filename
 * hint are compared too, so a call with other options decompresses afresh.
 */
const gzipSniffs = new WeakMap<
  Uint8Array,
  { max: number; gunzip: ReadOptions['gunzip']; hint: string; length: number; result: SniffResult }
>();

/** Decide the format and decompress. Throws StructureReadError on anything unrecognisable. */
export function sniffStructure(
  input: Uint8Array,
  filenameHint = '',
  options: ReadOptions = {},
): SniffResult {
  const max = options.maxUncompressedBytes ?? DEFAULT_MAX_UNCOMPRESSED_BYTES;
  const cached = gzipSniffs.get(input);
  if (
    cached !== undefined &&
    cached.max === max &&
    cached.gunzip === options.gunzip &&
    cached.hint === filenameHint &&
    cached.length === input.length
  )
    return { ...cached.result };
  const result = sniffUncached(input, filenameHint, options, max);
  if (result.gzip)
    gzipSniffs.set(input, {
      max,
      gunzip: options.gunzip,
      hint: filenameHint,
      length: input.length,
      result,
    });
  return { ...result };
}

function sniffUncached(
  input: Uint8Array,
  filenameHint: string,
  options: ReadOptions,
  max: number,
): SniffResult {
  const label = filenameHint !== '' ? `"${filenameHint}"` : 'The file';
  if (input.length === 0) {
    throw new StructureReadError(
      `${label} is empty (0 bytes); choose the coordinate file again and upload it.`,
      { item: 'file' },
    );
  }
  let bytes = input;
  let gzip = false;
  if (isGzip(bytes)) {
    bytes = gunzipLimited(bytes, max, options.gunzip);
    gzip = true;
    if (bytes.length === 0) {
      throw new StructureReadError(
        `${label} is a gzip archive of an empty file; compress the coordinate file itself and upload again.`,
        { item: 'gzip' },
      );
    }
  }
  const format = sniffPlainFormat(bytes, filenameHint);
  if (format !== null) return { format, gzip, bytes };
  throw new StructureReadError(
    `${label} is not a coordinate file Foldfolio can read (expected PDBx/mmCIF text starting with "data_", BinaryCIF, or PDB records such as ATOM/HETATM, optionally gzip-compressed); check that you picked the model file and upload it again.`,
    { item: 'format' },
  );
}

/**
 * Text files written by programs end with a newline; one that stops mid-line was cut short
 * (interrupted download or copy). A cut that falls inside the last value could still parse, so
 * this is checked before parsing: never a silently partial model.
 */
function assertCompleteText(bytes: Uint8Array, format: InputFormat): void {
  let end = bytes.length;
  while (end > 0 && (bytes[end - 1] === 32 || bytes[end - 1] === 9)) end--;
  if (end === 0 || bytes[end - 1] === 10 || bytes[end - 1] === 13) return;
  let line = 1;
  for (let i = 0; i < end; i++) if (bytes[i] === 10) line++;
  const kind = format === 'pdb' ? 'PDB' : 'mmCIF';
  throw new StructureReadError(
    `The ${kind} file ends in the middle of line ${line}, so it was cut short (an interrupted download or copy); get the complete file and upload it again.`,
    { line, item: 'end of file' },
  );
}

function countNewlines(b: Uint8Array): number {
  let n = 0;
  for (let i = b.indexOf(10); i >= 0; i = b.indexOf(10, i + 1)) n++;
  return n;
}

/** Read any supported coordinate file into the typed-array hierarchy. */
export async function readStructure(
  input: Uint8Array,
  filenameHint = '',
  options: ReadOptions = {},
): Promise<Structure> {
  const { format, gzip, bytes } = sniffStructure(input, filenameHint, options);
  if (format !== 'bcif') assertCompleteText(bytes, format);
  if (format === 'pdb') return readPdb(bytes, gzip);
  if (format === 'bcif') return blockToStructure(await parseBinaryCif(bytes), 'bcif', gzip);
  const utf8 = new TextDecoder('utf-8', { fatal: false });
  const scan = options.cifFastPath === false ? null : scanAtomSite(bytes);
  if (scan !== null) {
    // Mol* parses everything but the _atom_site rows; its line numbers are mapped back
    const head = bytes.subarray(0, scan.loopStart);
    const headLines = countNewlines(head);
    const removed = countNewlines(bytes.subarray(scan.loopStart, scan.dataEnd));
    const blocks = await parseCifTextBlocks(
      utf8.decode(head) + utf8.decode(bytes.subarray(scan.dataEnd)),
      (l) => (l > headLines ? l + removed : l),
    );
    if (blocks.length === 1) return scannedCifToStructure(blocks[0], bytes, scan, gzip);
    if (blocks.length === 0) {
      // only `data_name` besides the atoms: Mol* makes no block of it
      const m = /^\s*data_(\S*)/m.exec(utf8.decode(head.subarray(0, 4096)));
      return scannedCifToStructure(emptyCifBlock(m?.[1] ?? ''), bytes, scan, gzip);
    }
  }
  const text = utf8.decode(bytes);
  return blockToStructure(await parseCifText(text), 'mmcif', gzip);
}
