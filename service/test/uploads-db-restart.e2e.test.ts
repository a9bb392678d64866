// Fault test (issue 6): MariaDB restarted while the service runs → requests fail with 503 and a
// sentence, then succeed again without restarting the service. The test runs its own MariaDB
// (Debian mariadbd, fresh datadir in a temp folder, its own port) so the shared one is never
// disturbed.
import { type ChildProcess, execFileSync, spawn } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createConnection } from 'mysql2/promise';
import request from 'supertest';
import { type Account, register, startTestApp, type TestApp } from './helpers/test-app.js';
import { createManuscript, useTempStorage } from './helpers/workflow.js';

let dir: string;
let port: number;
let db: ChildProcess | null = null;
let storageDir: string;
let t: TestApp;
let owner: Account;
let manuscriptId: string;
const password = randomBytes(12).toString('hex');

function freePort(): Promise<number> {
  return new Promise((ok, fail) => {
    const srv = createServer();
    srv.on('error', fail);
    srv.listen(0, '127.0.0.1', () => {
      const a = srv.address();
      srv.close(() => ok(typeof a === 'object' && a ? a.port : 0));
    });
  });
}

async function waitForDb(): Promise<void> {
  for (let i = 0; i < 100; i++) {
    try {
      const c = await createConnection({ socketPath: join(dir, 'db.sock'), user: 'root' });
      await c.end();
      return;
    } catch {
      await new Promise((r) => setTimeout(r, 200));
    }
  }
  throw new Error('the private MariaDB did not start');
}

async function startDb(): Promise<void> {
  db = spawn(
    '/usr/sbin/mariadbd',
    [
      '--no-defaults',
      '--user=root',
      `--datadir=${join(dir, 'data')}`,
      `--socket=${join(dir, 'db.sock')}`,
      `--port=${port}`,
      '--bind-address=127.0.0.1',
      `--pid-file=${join(dir, 'db.pid')}`,
      `--log-error=${join(dir, 'db.err')}`,
      '--character-set-server=utf8mb4',
      '--collation-server=utf8mb4_unicode_ci',
      '--innodb-buffer-pool-size=32M',
    ],
    { stdio: 'ignore' },
  );
  await waitForDb();
}

async function stopDb(): Promise<void> {
  const proc = db;
  if (!proc || proc.exitCode !== null) return;
  await new Promise<void>((ok) => {
    proc.once('exit', () => ok());
    proc.kill('SIGTERM');
  });
  db = null;
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'ff-mariadb-'));
  port = await freePort();
  execFileSync('mariadb-install-db', [
    '--user=root',
    `--datadir=${join(dir, 'data')}`,
    '--auth-root-authentication-method=socket',
    '--skip-test-db',
  ]);
  await startDb();
  const root = await createConnection({ socketPath: join(dir, 'db.sock'), user: 'root' });
  await root.query(`CREATE USER 'foldfolio'@'127.0.0.1' IDENTIFIED BY '${password}'`);
  await root.query("GRANT ALL PRIVILEGES ON `foldfolio%`.* TO 'foldfolio'@'127.0.0.1'");
  await root.end();
  storageDir = useTempStorage();
  t = await startTestApp({
    FOLDFOLIO_DB_PORT: String(port),
    FOLDFOLIO_DB_USER: 'foldfolio',
    FOLDFOLIO_DB_PASSWORD: password,
  });
  owner = await register(t, 'Owner');
  manuscriptId = await createManuscript(t, owner);
}, 60_000);

afterAll(async () => {
  if (db === null) await startDb().catch(() => undefined);
  await t?.close().catch(() => undefined);
  await stopDb();
  rmSync(dir, { recursive: true, force: true });
  rmSync(storageDir, { recursive: true, force: true });
  delete process.env.FOLDFOLIO_STORAGE_DIR;
});

test('with MariaDB down the API answers 503 with a sentence, and recovers by itself when it is back', async () => {
  const list = () =>
    request(t.server)
      .get(`/api/manuscripts/${manuscriptId}/models`)
      .set('Authorization', `Bearer ${owner.token}`);
  await list().expect(200);

  await stopDb();
  const down = await list();
  expect(down.status).toBe(503);
  expect(down.body.message).toMatch(
    /cannot reach its database right now\. Wait a moment and try again/,
  );

  await startDb();
  let status = 0;
  for (let i = 0; i < 50 && status !== 200; i++) {
    status = (await list()).status;
    if (status !== 200) await new Promise((r) => setTimeout(r, 200));
  }
  expect(status).toBe(200);
  // writes work again too
  await request(t.server)
    .post(`/api/manuscripts/${manuscriptId}/comments`)
    .set('Authorization', `Bearer ${owner.token}`)
    .send({ anchor: { type: 'figure', figureId: 'fig-1' }, body: 'Back online.' })
    .expect(201);
});
