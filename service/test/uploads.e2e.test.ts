import { existsSync, readdirSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { createHash } from 'node:crypto';
import request from 'supertest';
import type { ModelVersionDto, Report } from '@foldfolio/shared';
import * as engine from '@foldfolio/shared';
import { startAnalysisWorker, type RunningWorker } from '../src/analyses/worker-runtime.js';
import { type Account, register, startTestApp, type TestApp } from './helpers/test-app.js';
import {
  createManuscript,
  fixture,
  upload,
  useTempStorage,
  waitForAnalysis,
} from './helpers/workflow.js';

// 600 kB limit: every fixture uploaded below fits; 2BEG.cif (1.85 MB) does not.
const LIMIT = 600 * 1024;
let storageDir: string;
let t: TestApp;
let worker: RunningWorker;
let owner: Account;
let manuscriptId: string;

// the engine's ceiling on decompressed input, low here so a small gzip bomb crosses it
const UNZIP_LIMIT = 5 * 1024 * 1024;

beforeAll(async () => {
  process.env.FOLDFOLIO_MAX_UNCOMPRESSED_BYTES = String(UNZIP_LIMIT);
  storageDir = useTempStorage(LIMIT);
  t = await startTestApp();
  worker = await startAnalysisWorker(t.cfg);
  owner = await register(t, 'Owner');
  manuscriptId = await createManuscript(t, owner);
});
afterAll(async () => {
  await worker?.close();
  await t?.close();
  rmSync(storageDir, { recursive: true, force: true });
  delete process.env.FOLDFOLIO_STORAGE_DIR;
  delete process.env.FOLDFOLIO_UPLOAD_LIMIT_BYTES;
  delete process.env.FOLDFOLIO_MAX_UNCOMPRESSED_BYTES;
});

function sha256(b: Buffer): string {
  return createHash('sha256').update(b).digest('hex');
}

/** Every blob file under the storage root (content-addressed paths). */
function storedBlobs(): string[] {
  const root = join(storageDir, 'sha256');
  if (!existsSync(root)) return [];
  return readdirSync(root, { recursive: true, withFileTypes: true })
    .filter((d) => d.isFile())
    .map((d) => d.name)
    .sort();
}

// The formats are what the PDB archive publishes these entries as (file content, not name).
const FIXTURES: [string, 'mmcif' | 'pdb' | 'bcif', boolean][] = [
  ['1A8O.cif', 'mmcif', false],
  ['1A8O.pdb', 'pdb', false],
  ['1gbt.bcif.gz', 'bcif', true],
  ['1lzh.pdb.gz', 'pdb', true],
  ['1pfe.cif.gz', 'mmcif', true],
  ['3dg1_final.cif', 'mmcif', false],
  ['5cvz_final.pdb', 'pdb', false],
];

describe('uploading real structures', () => {
  const versions: ModelVersionDto[] = [];

  test('each fixture becomes the next numbered version, sniffed and hashed', async () => {
    for (const [i, [name, format, gzip]] of FIXTURES.entries()) {
      const bytes = fixture(name);
      const res = await upload(t, owner, manuscriptId, bytes, name, `note for ${name} — ψ`).expect(
        201,
      );
      const v = res.body as ModelVersionDto;
      expect(v).toMatchObject({
        n: i + 1,
        format,
        gzip,
        filename: name,
        sizeBytes: bytes.length,
        // SHA-256 computed here by node:crypto on the file itself
        sha256: sha256(bytes),
        note: `note for ${name} — ψ`,
      });
      expect(v.analysis?.status).toMatch(/queued|running|done/);
      versions.push(v);
    }
    const list = await request(t.server)
      .get(`/api/manuscripts/${manuscriptId}/models`)
      .set('Authorization', `Bearer ${owner.token}`)
      .expect(200);
    expect((list.body as ModelVersionDto[]).map((v) => v.n)).toEqual([7, 6, 5, 4, 3, 2, 1]);
    // one blob per distinct file, stored under its own hash
    expect(storedBlobs()).toEqual(FIXTURES.map(([n]) => sha256(fixture(n))).sort());
  });

  test('each analysis finishes and its stored report equals the engine run directly on the file', async () => {
    const build = (engine as unknown as Record<string, unknown>).buildReport as
      ((b: Uint8Array, o: Record<string, unknown>) => Report | Promise<Report>) | undefined;
    expect(typeof build).toBe('function');
    for (const v of versions) {
      const a = await waitForAnalysis(t, owner, manuscriptId, v.id);
      expect({ file: v.filename, status: a.status, error: a.error }).toEqual({
        file: v.filename,
        status: 'done',
        error: null,
      });
      expect(a.progress).toBe(100);
      const res = await request(t.server)
        .get(`/api/manuscripts/${manuscriptId}/models/${v.id}/report`)
        .set('Authorization', `Bearer ${owner.token}`)
        .expect(200);
      const stored = res.body as Report;
      const direct = await build!(fixture(v.filename), { filename: v.filename });
      expect(stored.schema).toBe('foldfolio.report/1');
      expect(stored.models.length).toBe(direct.models.length);
      expect(stored.models[0].residues.length).toBe(direct.models[0].residues.length);
      expect(stored.models[0].summary.composition).toEqual(direct.models[0].summary.composition);
      expect(stored.models[0].summary.rama ?? null).toEqual(direct.models[0].summary.rama ?? null);
      expect(a.summary?.atoms).toBe(direct.models[0].summary.composition.atoms);
      expect(a.summary?.cisPeptides).toBe(direct.models[0].summary.cisPeptides);
      // same input ⇒ byte-identical report
      expect(a.reportSha256).toBe(
        createHash('sha256').update(JSON.stringify(direct)).digest('hex'),
      );
    }
  });
});

describe('refusals', () => {
  test('the same bytes again are reported as a duplicate of the earlier version', async () => {
    const res = await upload(
      t,
      owner,
      manuscriptId,
      fixture('1A8O.cif'),
      'renamed-copy.cif',
    ).expect(409);
    expect(res.body.duplicateOf.n).toBe(1);
    expect(res.body.message).toMatch(/identical to version 1/);
  });

  test('a file over the limit is refused mid-stream and no partial file is left', async () => {
    const big = fixture('2BEG.cif');
    expect(big.length).toBeGreaterThan(LIMIT);
    const before = storedBlobs();
    const res = await upload(t, owner, manuscriptId, big, '2BEG.cif').expect(413);
    expect(res.body.message).toMatch(/larger than this server accepts/);
    expect(storedBlobs()).toEqual(before);
    expect(readdirSync(join(storageDir, 'tmp'))).toEqual([]);
  });

  test('a renamed non-structure is refused with a sentence saying what to do', async () => {
    const png = Buffer.concat([
      Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
      Buffer.alloc(5000, 7),
    ]);
    const res = await upload(t, owner, manuscriptId, png, 'model.cif').expect(415);
    expect(res.body.message).toMatch(/"model\.cif" is not a coordinate file .* upload it again/);
    const log = gzipSync(Buffer.from('REFMAC log\nCycle 1 R=0.21\n'.repeat(100)));
    await upload(t, owner, manuscriptId, log, 'model.pdb.gz').expect(415);
    const empty = await upload(t, owner, manuscriptId, Buffer.alloc(0), 'empty.pdb').expect(400);
    expect(empty.body.message).toMatch(/empty/);
    expect(readdirSync(join(storageDir, 'tmp'))).toEqual([]);
  });

  test('a path-like filename is kept as a label only', async () => {
    // 1A7G.cif: a distinct real structure, so no duplicate
    const res = await upload(
      t,
      owner,
      manuscriptId,
      fixture('1A7G.cif'),
      '../../etc/cron.d/evil model.cif',
    ).expect(201);
    expect(res.body.filename).toBe('evil_model.cif');
    expect(existsSync(join(storageDir, '..', 'etc'))).toBe(false);
    expect(storedBlobs()).toContain(sha256(fixture('1A7G.cif')));
  });

  test('an archived manuscript takes no new version until it is restored', async () => {
    const auth = { Authorization: `Bearer ${owner.token}` };
    await request(t.server).post(`/api/manuscripts/${manuscriptId}/archive`).set(auth).expect(200);
    const res = await upload(t, owner, manuscriptId, fixture('4CUP.cif'), '4CUP.cif').expect(409);
    expect(res.body.message).toMatch(/archived.*restore it first/);
    await request(t.server).post(`/api/manuscripts/${manuscriptId}/restore`).set(auth).expect(200);
  });

  test('the report travels as the stored gzip when accepted, as plain JSON otherwise', async () => {
    const list = await request(t.server)
      .get(`/api/manuscripts/${manuscriptId}/models`)
      .set('Authorization', `Bearer ${owner.token}`)
      .expect(200);
    const v = (list.body as ModelVersionDto[]).find((x) => x.filename === '1A8O.cif')!;
    const path = `/api/manuscripts/${manuscriptId}/models/${v.id}/report`;
    const zipped = await request(t.server)
      .get(path)
      .set('Authorization', `Bearer ${owner.token}`)
      .set('Accept-Encoding', 'gzip')
      .expect(200);
    expect(zipped.headers['content-encoding']).toBe('gzip');
    const plain = await request(t.server)
      .get(path)
      .set('Authorization', `Bearer ${owner.token}`)
      .set('Accept-Encoding', 'identity')
      .expect(200);
    expect(plain.headers['content-encoding']).toBeUndefined();
    expect(plain.body).toEqual(zipped.body);
    expect(createHash('sha256').update(plain.text).digest('hex')).toBe(v.analysis?.reportSha256);
  });

  test('a request without a file gets a sentence', async () => {
    const res = await request(t.server)
      .post(`/api/manuscripts/${manuscriptId}/models`)
      .set('Authorization', `Bearer ${owner.token}`)
      .field('note', 'forgot the file')
      .expect(400);
    expect(res.body.message).toMatch(/Choose a coordinate file/);
  });
});

describe('load and bombs', () => {
  test('a gzip bomb (small upload, huge inside) is stored but its analysis fails with a sentence', async () => {
    // 20 MB of CIF comment lines after a data block header: ~20 kB compressed
    const inner = Buffer.concat([
      Buffer.from('data_bomb\n'),
      Buffer.alloc(20 * 1024 * 1024, '#\n'),
    ]);
    const bomb = gzipSync(inner, { level: 9 });
    expect(bomb.length).toBeLessThan(LIMIT);
    const res = await upload(t, owner, manuscriptId, bomb, 'bomb.cif.gz').expect(201);
    const a = await waitForAnalysis(t, owner, manuscriptId, res.body.id);
    expect(a.status).toBe('failed');
    expect(a.error).toMatch(/expands to more than 5242880 bytes/);
    expect(a.attempts).toBe(1);
  });

  test('20 concurrent uploads all become versions with correct reports', async () => {
    const base = fixture('1A8O.cif');
    const direct = await engine.buildReport(base, { filename: '1A8O.cif' });
    const before = (
      await request(t.server)
        .get(`/api/manuscripts/${manuscriptId}/models`)
        .set('Authorization', `Bearer ${owner.token}`)
        .expect(200)
    ).body.length as number;
    // distinct bytes, same structure: a CIF comment line (ignored by every reader) tells them apart
    const files = Array.from({ length: 20 }, (_, i) =>
      Buffer.concat([Buffer.from(`# upload ${i}\n`), base]),
    );
    const results = await Promise.all(
      files.map((b, i) => upload(t, owner, manuscriptId, b, `copy-${i}.cif`)),
    );
    expect(results.map((r) => r.status)).toEqual(files.map(() => 201));
    const numbers = results.map((r) => (r.body as ModelVersionDto).n).sort((a, b) => a - b);
    expect(numbers).toEqual(Array.from({ length: 20 }, (_, i) => before + 1 + i));
    for (const r of results) {
      const a = await waitForAnalysis(t, owner, manuscriptId, r.body.id);
      expect(a.status).toBe('done');
      expect(a.summary?.atoms).toBe(direct.models[0].summary.composition.atoms);
      expect(a.summary?.ramaOutliers).toBe(direct.models[0].summary.rama?.overall.outlier ?? null);
    }
  });
});
