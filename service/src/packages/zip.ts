/**
 * Deterministic zip writing and defensive zip reading for review packages.
 *
 * Writing: entries sorted by path, one fixed DOS timestamp, fixed mode, fixed deflate level, no
 * extra fields — the same files give the same bytes. Reading: refuses paths that could escape the
 * folder they are unpacked into (absolute, `..`, backslashes, drive letters), symlinks, and
 * archives over the entry-count or size limits (zip bombs), before and while inflating.
 */
import yauzl from 'yauzl';
import yazl from 'yazl';

/**
 * 2000-01-01 00:00 built from *local* fields: yazl converts the date to DOS fields with local-time
 * getters, so a local constructor gives the same DOS bytes in every time zone. The UTC extended
 * timestamp field is switched off (forceDosTimestamp) for the same reason.
 */
const FIXED_MTIME = new Date(2000, 0, 1, 0, 0, 0);
/** regular file, rw-r--r-- (common practice, no source) */
const FILE_MODE = 0o100644;
/** zlib level 9; the bytes also depend on Node's bundled zlib, recorded in the manifest */
const DEFLATE_LEVEL = 9;

export const ZIP_SETTINGS = {
  mtime: '2000-01-01T00:00:00 (DOS, local fields)',
  mode: '0644',
  deflateLevel: DEFLATE_LEVEL,
} as const;

export class ZipSafetyError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'ZipSafetyError';
  }
}

/** Why a path may not be written to or read from a package, or null when it is safe. */
export function unsafePathReason(path: string): string | null {
  if (path.length === 0) return 'it is empty';
  if (path.length > 400) return 'it is longer than 400 characters';
  if (path.includes('\\')) return 'it contains a backslash';
  if (path.startsWith('/')) return 'it is an absolute path';
  if (/^[A-Za-z]:/.test(path)) return 'it starts with a drive letter';
  // eslint-disable-next-line no-control-regex
  if (/[\u0000-\u001f]/.test(path)) return 'it contains control characters';
  const parts = path.split('/');
  if (parts.some((p) => p === '..')) return 'it climbs out of its folder with ".."';
  if (parts.some((p) => p === '.' || (p === '' && path.endsWith('/') === false)))
    return 'it has empty or "." segments';
  return null;
}

/** Deterministic zip of the given files (path → bytes). Paths are checked and sorted. */
export async function writeZip(files: Map<string, Buffer>): Promise<Buffer> {
  const zip = new yazl.ZipFile();
  const paths = [...files.keys()].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
  for (const p of paths) {
    const why = unsafePathReason(p);
    if (why) throw new ZipSafetyError(`Refusing to write the entry "${p}": ${why}.`);
    zip.addBuffer(files.get(p)!, p, {
      mtime: FIXED_MTIME,
      mode: FILE_MODE,
      compressionLevel: DEFLATE_LEVEL,
      forceDosTimestamp: true,
    });
  }
  zip.end();
  return new Promise<Buffer>((resolve, reject) => {
    const chunks: Buffer[] = [];
    zip.outputStream.on('data', (c: Buffer) => chunks.push(c));
    zip.outputStream.on('end', () => resolve(Buffer.concat(chunks)));
    zip.outputStream.on('error', reject);
  });
}

export interface ReadLimits {
  maxEntries: number;
  /** largest single entry, uncompressed */
  maxEntryBytes: number;
  /** all entries together, uncompressed */
  maxTotalBytes: number;
}

/** Generous for a package (a few hundred files, figures with embedded fonts), small for a bomb. */
export const DEFAULT_READ_LIMITS: ReadLimits = {
  maxEntries: 5000,
  maxEntryBytes: 512 * 1024 * 1024,
  maxTotalBytes: 1024 * 1024 * 1024,
};

const S_IFMT = 0o170000;
const S_IFLNK = 0o120000;

/** Reads every file entry of a zip into memory, refusing anything unsafe with a sentence. */
export function readZip(
  bytes: Buffer,
  limits: ReadLimits = DEFAULT_READ_LIMITS,
): Promise<Map<string, Buffer>> {
  return new Promise((resolve, reject) => {
    // validateEntrySizes: yauzl stops an entry whose inflated size exceeds its declared size
    yauzl.fromBuffer(
      bytes,
      { lazyEntries: true, validateEntrySizes: true, strictFileNames: false, decodeStrings: true },
      (err, zip) => {
        if (err || !zip) {
          reject(
            new ZipSafetyError(
              `This is not a readable zip archive (${err?.message ?? 'unknown error'}); upload the package .zip exactly as it was downloaded.`,
            ),
          );
          return;
        }
        if (zip.entryCount > limits.maxEntries) {
          zip.close();
          reject(
            new ZipSafetyError(
              `The archive has ${zip.entryCount} entries, more than the ${limits.maxEntries} a package may have; it is not a Foldfolio package.`,
            ),
          );
          return;
        }
        const out = new Map<string, Buffer>();
        let total = 0;
        const fail = (message: string) => {
          zip.close();
          reject(new ZipSafetyError(message));
        };
        zip.on('error', (e: Error) => {
          // yauzl's own name check fires before our entry handler sees the name
          const m = /^(absolute path|invalid relative path): (.*)$/.exec(e.message);
          if (m)
            fail(
              `The entry "${m[2]}" is refused: it ${m[1] === 'absolute path' ? 'is an absolute path' : 'climbs out of its folder with ".."'}. Packages never contain such paths.`,
            );
          else fail(`The archive is damaged (${e.message}); download the package again.`);
        });
        zip.on('end', () => resolve(out));
        zip.on('entry', (entry: yauzl.Entry) => {
          const name = entry.fileName;
          if (name.endsWith('/')) {
            const why = unsafePathReason(name.slice(0, -1));
            if (why)
              return fail(
                `The entry "${name}" is refused: ${why}. Packages never contain such paths.`,
              );
            zip.readEntry();
            return;
          }
          const why = unsafePathReason(name);
          if (why)
            return fail(
              `The entry "${name}" is refused: ${why}. Packages never contain such paths.`,
            );
          const mode = (entry.externalFileAttributes >>> 16) & S_IFMT;
          if (mode === S_IFLNK)
            return fail(`The entry "${name}" is a symbolic link; packages never contain links.`);
          if (out.has(name))
            return fail(`The entry "${name}" appears twice; the archive was altered.`);
          if (entry.uncompressedSize > limits.maxEntryBytes)
            return fail(
              `The entry "${name}" would unpack to ${entry.uncompressedSize} bytes, more than the ${limits.maxEntryBytes} allowed.`,
            );
          total += entry.uncompressedSize;
          if (total > limits.maxTotalBytes)
            return fail(
              `The archive would unpack to more than ${limits.maxTotalBytes} bytes; it is not a Foldfolio package.`,
            );
          zip.openReadStream(entry, (e2, stream) => {
            if (e2 || !stream) return fail(`The entry "${name}" cannot be read (${e2?.message}).`);
            const chunks: Buffer[] = [];
            stream.on('data', (c: Buffer) => chunks.push(c));
            stream.on('error', (e3: Error) =>
              fail(`The entry "${name}" is damaged (${e3.message}); download the package again.`),
            );
            stream.on('end', () => {
              out.set(name, Buffer.concat(chunks));
              zip.readEntry();
            });
          });
        });
        zip.readEntry();
      },
    );
  });
}
