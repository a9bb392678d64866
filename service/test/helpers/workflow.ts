// Helpers shared by the workflow e2e tests (uploads, analyses, ledger, comments, notifications).
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import request from 'supertest';
import type { AnalysisDto, ModelVersionDto } from '@foldfolio/shared';
import type { Account, TestApp } from './test-app.js';

// jest runs in the service workspace; FOLDFOLIO_ROOT is set by scripts/lib.sh
export const REPO = process.env.FOLDFOLIO_ROOT ?? resolve(process.cwd(), '..');
export const FIXTURES = join(REPO, 'shared/test/fixtures');

export function fixture(name: string): Buffer {
  return readFileSync(join(FIXTURES, name));
}

/** A fresh storage folder for one test file (set before startTestApp). */
export function useTempStorage(limitBytes?: number): string {
  const dir = mkdtempSync(join(tmpdir(), 'ff-storage-'));
  process.env.FOLDFOLIO_STORAGE_DIR = dir;
  if (limitBytes !== undefined) process.env.FOLDFOLIO_UPLOAD_LIMIT_BYTES = String(limitBytes);
  return dir;
}

export async function createManuscript(
  t: TestApp,
  owner: Account,
  title = 'Invented kinase',
): Promise<string> {
  const res = await request(t.server)
    .post('/api/manuscripts')
    .set('Authorization', `Bearer ${owner.token}`)
    .send({ title })
    .expect(201);
  return res.body.id as string;
}

export function upload(
  t: TestApp,
  who: Account,
  manuscriptId: string,
  bytes: Buffer,
  filename: string,
  note?: string,
) {
  const req = request(t.server)
    .post(`/api/manuscripts/${manuscriptId}/models`)
    .set('Authorization', `Bearer ${who.token}`);
  if (note !== undefined) req.field('note', note);
  // `filepath` keeps the name exactly as given (form-data would otherwise take its basename)
  const options = { filepath: filename, contentType: 'application/octet-stream' };
  return req.attach('file', bytes, options as unknown as { filename: string });
}

/** Polls the analysis until it is done or failed (the UI polls the same route). */
export async function waitForAnalysis(
  t: TestApp,
  who: Account,
  manuscriptId: string,
  versionId: string,
  timeoutMs = 60000,
): Promise<AnalysisDto> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const res = await request(t.server)
      .get(`/api/manuscripts/${manuscriptId}/models/${versionId}/analysis`)
      .set('Authorization', `Bearer ${who.token}`)
      .expect(200);
    const a = res.body as AnalysisDto;
    if (a.status === 'done' || a.status === 'failed') return a;
    if (Date.now() > until)
      throw new Error(
        `analysis still ${a.status} (${a.stage} ${a.progress} %) after ${timeoutMs} ms`,
      );
    await new Promise((r) => setTimeout(r, 100));
  }
}

export type { ModelVersionDto };

/**
 * Stores a fixture as the next version of a manuscript and runs the real analysis on it in this
 * process (the same processAnalysis the worker runs), without going through the queue.
 */
export async function seedVersion(
  t: TestApp,
  manuscriptId: string,
  uploaderId: string,
  name: string,
  bytes: Buffer = fixture(name),
): Promise<{ id: string; n: number }> {
  const { Readable } = await import('node:stream');
  const { randomUUID } = await import('node:crypto');
  const { BLOB_STORE } = await import('../../src/storage/blob-store.js');
  const { sniffFormat } = await import('../../src/storage/sniff.js');
  const { processAnalysis } = await import('../../src/analyses/worker-runtime.js');
  const store = t.app.get<symbol, import('../../src/storage/blob-store.js').BlobStore>(BLOB_STORE);
  const blob = await store.put(Readable.from([bytes]), { maxBytes: 1 << 30 });
  const sniffed = sniffFormat(bytes.subarray(0, 65536), name);
  const id = randomUUID();
  const [{ next }] = (await t.db.query(
    'SELECT COALESCE(MAX(n), 0) + 1 AS next FROM model_versions WHERE manuscript_id = ?',
    [manuscriptId],
  )) as { next: number | string }[];
  await t.db.query(
    `INSERT INTO model_versions (id, manuscript_id, n, sha256, format, gzip, filename, size_bytes, note, uploaded_by)
     VALUES (?, ?, ?, ?, ?, ?, ?, ?, '', ?)`,
    [
      id,
      manuscriptId,
      Number(next),
      blob.sha256,
      sniffed.format,
      sniffed.gzip,
      name,
      blob.sizeBytes,
      uploaderId,
    ],
  );
  await t.db.query("INSERT INTO analyses (model_version_id, status) VALUES (?, 'queued')", [id]);
  const job = { data: { modelVersionId: id }, updateProgress: async () => undefined };
  await processAnalysis(t.db, store, job as never, 'seed');
  return { id, n: Number(next) };
}
