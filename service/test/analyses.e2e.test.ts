// The worker as a separate process (the built service/dist/worker.js, as `npm start` runs it):
// crash recovery, single completion, failure reasons, and progress exposed to the browser.
import { type ChildProcess, spawn } from 'node:child_process';
import { existsSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import request from 'supertest';
import type { AnalysisDto, ModelVersionDto } from '@foldfolio/shared';
import { type Account, register, startTestApp, type TestApp } from './helpers/test-app.js';
import {
  REPO,
  createManuscript,
  fixture,
  upload,
  useTempStorage,
  waitForAnalysis,
} from './helpers/workflow.js';

const WORKER = join(REPO, 'service/dist/worker.js');
let storageDir: string;
let t: TestApp;
let owner: Account;
let manuscriptId: string;
const children: ChildProcess[] = [];

function startWorker(extraEnv: Record<string, string>): ChildProcess {
  const child = spawn(process.execPath, [WORKER], {
    env: {
      ...process.env,
      NODE_OPTIONS: '',
      FOLDFOLIO_DB_NAME: t.cfg.db.database,
      FOLDFOLIO_STORAGE_DIR: storageDir,
      // short locks so a dead worker's job is taken over within seconds
      FOLDFOLIO_WORKER_LOCK_MS: '2000',
      FOLDFOLIO_WORKER_STALLED_MS: '1000',
      FOLDFOLIO_QUIET: '1',
      ...extraEnv,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let err = '';
  child.stderr?.on('data', (d: Buffer) => (err += d.toString()));
  child.on('exit', (code) => {
    if (code && code !== 0 && !child.killed)
      process.stderr.write(`worker exited ${code}: ${err}\n`);
  });
  children.push(child);
  return child;
}

async function analysisRow(id: string) {
  const rows: { status: string; attempts: number; completions: number; worker: string }[] =
    await t.db.query(
      'SELECT status, attempts, completions, worker FROM analyses WHERE model_version_id = ?',
      [id],
    );
  return rows[0];
}

beforeAll(async () => {
  if (!existsSync(WORKER))
    throw new Error(`${WORKER} is missing: run \`npm run build\` first (scripts/test.sh does).`);
  storageDir = useTempStorage();
  t = await startTestApp();
  owner = await register(t, 'Owner');
  manuscriptId = await createManuscript(t, owner);
});
afterAll(async () => {
  for (const c of children) if (c.exitCode === null) c.kill('SIGKILL');
  await t?.close();
  rmSync(storageDir, { recursive: true, force: true });
  delete process.env.FOLDFOLIO_STORAGE_DIR;
});

test('a worker killed mid-analysis: the job is retried by another worker and completes once', async () => {
  // the first worker pauses 60 s after claiming the job, so it is surely killed mid-run
  const first = startWorker({ FOLDFOLIO_WORKER_PAUSE_MS: '60000' });
  const res = await upload(t, owner, manuscriptId, fixture('2XHE.cif'), '2XHE.cif').expect(201);
  const v = res.body as ModelVersionDto;
  const until = Date.now() + 20000;
  while ((await analysisRow(v.id)).status !== 'running') {
    if (Date.now() > until) throw new Error('the first worker never started the analysis');
    await new Promise((r) => setTimeout(r, 100));
  }
  // what the browser sees while it runs: the stage and a progress between 0 and 100
  const running = await request(t.server)
    .get(`/api/manuscripts/${manuscriptId}/models/${v.id}/analysis`)
    .set('Authorization', `Bearer ${owner.token}`)
    .expect(200);
  expect(running.body).toMatchObject({ status: 'running', stage: 'parse' });
  expect(running.body.progress).toBeGreaterThan(0);
  expect(running.body.progress).toBeLessThan(100);
  const firstName = (await analysisRow(v.id)).worker;
  first.kill('SIGKILL');

  startWorker({});
  const a = await waitForAnalysis(t, owner, manuscriptId, v.id, 40000);
  expect(a.status).toBe('done');
  const row = await analysisRow(v.id);
  expect(row).toMatchObject({ status: 'done', attempts: 2, completions: 1 });
  expect(row.worker).not.toBe(firstName);
  // stays done once: no late second completion from a stalled copy
  await new Promise((r) => setTimeout(r, 3000));
  expect((await analysisRow(v.id)).completions).toBe(1);
});

test('a file the engine refuses fails at once with the engine’s reason, without retries', async () => {
  // 5moo_header.pdb: a real PDB header with no coordinates (passes sniffing, has no atoms)
  const res = await upload(
    t,
    owner,
    manuscriptId,
    fixture('5moo_header.pdb'),
    '5moo_header.pdb',
  ).expect(201);
  const a: AnalysisDto = await waitForAnalysis(t, owner, manuscriptId, res.body.id, 30000);
  expect(a.status).toBe('failed');
  expect(a.error).toMatch(/\./); // a sentence from the engine
  expect(a.attempts).toBe(1);
});

test('two uploads back to back are analysed by the running worker, one completion each', async () => {
  const ids: string[] = [];
  for (const name of ['1A8O.cif', '3dg1_final.cif']) {
    const res = await upload(t, owner, manuscriptId, fixture(name), name).expect(201);
    ids.push(res.body.id);
  }
  for (const id of ids) {
    expect((await waitForAnalysis(t, owner, manuscriptId, id, 30000)).status).toBe('done');
    expect((await analysisRow(id)).completions).toBe(1);
  }
});

test('upload to summary for an 8,112-atom model (7CFN) takes under 5 s (issue 6 bar: 10,000 atoms, 5 s)', async () => {
  const t0 = Date.now();
  const res = await upload(t, owner, manuscriptId, fixture('7CFN.cif'), '7CFN.cif').expect(201);
  const a = await waitForAnalysis(t, owner, manuscriptId, res.body.id, 20000);
  const elapsed = Date.now() - t0;
  expect(a.status).toBe('done');
  // atom count of 7CFN.cif: 8,112 ATOM/HETATM records in the file as published
  expect(a.summary?.atoms).toBeGreaterThan(8000);
  expect(elapsed).toBeLessThan(5000);
});
