import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { createHash } from 'node:crypto';
import { Readable } from 'node:stream';
import { gzipSync } from 'node:zlib';
import { FsBlobStore } from './fs-blob-store.js';
import { UploadTooLargeError } from './blob-store.js';
import { NotAStructureError, sanitizeFilename, sniffFormat } from './sniff.js';

// jest runs in the service workspace; FOLDFOLIO_ROOT is set by scripts/lib.sh
const fixtures = join(
  process.env.FOLDFOLIO_ROOT ?? resolve(process.cwd(), '..'),
  'shared/test/fixtures',
);
const data = fixtures; // the real PDB entries copied into the repo by the engine work

describe('FsBlobStore', () => {
  let root: string;
  beforeEach(() => (root = mkdtempSync(join(tmpdir(), 'ff-store-'))));
  afterEach(() => rmSync(root, { recursive: true, force: true }));

  it('stores by SHA-256 (checked against node:crypto on the whole file) and detects duplicates', async () => {
    const bytes = readFileSync(join(fixtures, '1A8O.cif'));
    const expected = createHash('sha256').update(bytes).digest('hex');
    const store = new FsBlobStore(root);
    const chunks = [bytes.subarray(0, 1000), bytes.subarray(1000)];
    const first = await store.put(Readable.from(chunks), { maxBytes: 1 << 30 });
    expect(first).toEqual({ sha256: expected, sizeBytes: bytes.length, created: true });
    const again = await store.put(Readable.from([bytes]), { maxBytes: 1 << 30 });
    expect(again.created).toBe(false);
    expect((await store.read(expected)).equals(bytes)).toBe(true);
    expect(await store.pendingTemporaryFiles()).toEqual([]);
  });

  it('stops mid-stream past the limit and leaves no partial file', async () => {
    const store = new FsBlobStore(root);
    // An endless source: only a refusal made while streaming can settle this promise.
    let produced = 0;
    const source = Readable.from(
      (async function* () {
        for (;;) {
          produced++;
          await new Promise((r) => setImmediate(r));
          yield Buffer.alloc(65536, 65);
        }
      })(),
    );
    await expect(store.put(source, { maxBytes: 1 << 20 })).rejects.toBeInstanceOf(
      UploadTooLargeError,
    );
    source.destroy();
    // 1 MB / 64 kB = 16 chunks fit; the 17th crossed the limit
    expect(produced).toBeGreaterThanOrEqual(17);
    expect(await store.pendingTemporaryFiles()).toEqual([]);
  });

  it('aborts when the head inspector refuses the content', async () => {
    const store = new FsBlobStore(root);
    const source = Readable.from([Buffer.from('%PDF-1.7 not a model')]);
    await expect(
      store.put(source, { maxBytes: 1 << 20, inspectHead: (h) => sniffFormat(h, 'x.cif') }),
    ).rejects.toBeInstanceOf(NotAStructureError);
    expect(await store.pendingTemporaryFiles()).toEqual([]);
  });
});

describe('sniffFormat (content decides, the name never does)', () => {
  // expected formats are what the files are, as published by the PDB archive
  const cases: [string, string, boolean][] = [
    [join(fixtures, '1A8O.cif'), 'mmcif', false],
    [join(fixtures, '1A8O.pdb'), 'pdb', false],
    [join(data, '1gbt.bcif.gz'), 'bcif', true],
    [join(data, '1lzh.pdb.gz'), 'pdb', true],
    [join(data, '1pfe.cif.gz'), 'mmcif', true],
    [join(data, 'pdb1gdr.ent'), 'pdb', false],
    [join(data, '5moo_header.pdb'), 'pdb', false],
  ];
  it.each(cases)('%s is %s (gzip %s)', (file, format, gzip) => {
    expect(sniffFormat(readFileSync(file).subarray(0, 65536), 'f')).toEqual({ format, gzip });
  });

  it('refuses a renamed non-structure with a sentence', () => {
    const png = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13]);
    expect(() => sniffFormat(png, 'model.cif')).toThrow(/not a coordinate file.*upload it again/);
    expect(() => sniffFormat(gzipSync(Buffer.from('hello world\n')), 'model.cif.gz')).toThrow(
      NotAStructureError,
    );
    expect(() => sniffFormat(Buffer.alloc(0), 'a.pdb')).toThrow(/empty/);
  });
});

describe('sanitizeFilename', () => {
  it.each([
    ['../../etc/passwd', 'passwd'],
    ['C:\\Users\\x\\model v2.cif', 'model_v2.cif'],
    ['..', 'model'],
    ['.hidden.pdb', 'hidden.pdb'],
    ['<script>.cif', 'script_.cif'],
    ['ψ-model.cif', 'ψ-model.cif'],
  ])('%s → %s', (raw, clean) => expect(sanitizeFilename(raw)).toBe(clean));
});
