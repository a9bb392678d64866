// Starts the real Foldfolio service (built output, real MariaDB, its own SMTP sink) on free
// ports with a throw-away database, and Debian's Chromium through playwright-core.
import { spawn, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { createServer } from 'node:net';
import { basename, join, resolve } from 'node:path';
import { createConnection } from 'mysql2/promise';
import { chromium, type Browser, type Page } from 'playwright-core';

export const ROOT = resolve(__dirname, '../..');
export const SCREENSHOTS = join(ROOT, 'test-output', 'screenshots');

export function freePort(): Promise<number> {
  return new Promise((ok, fail) => {
    const srv = createServer();
    srv.unref();
    srv.on('error', fail);
    srv.listen(0, '127.0.0.1', () => {
      const addr = srv.address();
      const port = typeof addr === 'object' && addr ? addr.port : 0;
      srv.close(() => ok(port));
    });
  });
}

/** MariaDB connection settings of the app user (same environment variables as the service). */
export function dbSettings() {
  const varDir = process.env.FOLDFOLIO_VAR ?? join(ROOT, 'var');
  const pwFile = join(varDir, 'db-password');
  const password =
    process.env.FOLDFOLIO_DB_PASSWORD ??
    (existsSync(pwFile) ? readFileSync(pwFile, 'utf8').trim() : '');
  return {
    host: process.env.FOLDFOLIO_DB_HOST ?? '127.0.0.1',
    port: Number(process.env.FOLDFOLIO_DB_PORT ?? 33061),
    user: process.env.FOLDFOLIO_DB_USER ?? 'foldfolio',
    password,
  };
}

async function adminSql(sql: string): Promise<void> {
  const conn = await createConnection(dbSettings());
  try {
    await conn.query(sql);
  } finally {
    await conn.end();
  }
}

export interface RunningService {
  url: string;
  dbName: string;
  stop(): Promise<void>;
}

export interface ServiceOptions {
  /** Access-token lifetime; short values make every page exercise the silent refresh. */
  accessTtlSec?: number;
  /** test-output/service-<logName>.log receives the service's output. */
  logName?: string;
}

export async function startService(opts: ServiceOptions = {}): Promise<RunningService> {
  const logName = opts.logName ?? 'e2e';
  const main = process.env.FOLDFOLIO_E2E_SERVICE_MAIN ?? join(ROOT, 'service', 'dist', 'main.js');
  if (!existsSync(main))
    throw new Error(`${main} does not exist: build first with \`npm run build\` at the repo root.`);
  if (!existsSync(join(ROOT, 'ui', 'dist', 'index.html')))
    throw new Error('ui/dist is missing: build the UI first with `npm run build -w ui`.');

  const dbName = `foldfolio_e2e_${randomBytes(4).toString('hex')}`;
  // the app user may create databases named foldfolio% (scripts/services.sh grants it)
  await adminSql(`CREATE DATABASE \`${dbName}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  const port = await freePort();
  const smtpPort = await freePort();
  const url = `http://127.0.0.1:${port}`;
  let output = '';
  const child: ChildProcess = spawn(process.execPath, [main], {
    cwd: ROOT,
    env: {
      ...process.env,
      FOLDFOLIO_PORT: String(port),
      FOLDFOLIO_SMTP_PORT: String(smtpPort),
      FOLDFOLIO_DB_NAME: dbName,
      FOLDFOLIO_PUBLIC_URL: url,
      FOLDFOLIO_JWT_SECRET: randomBytes(32).toString('hex'),
      FOLDFOLIO_SEED_DEMO: '0',
      // the test signs in a handful of times from one address; keep the limiter out of the way
      FOLDFOLIO_SIGNIN_LIMIT: '50',
      // a cheaper hash keeps registration fast; the service still enforces its floor of 10
      FOLDFOLIO_BCRYPT_COST: '10',
      ...(opts.accessTtlSec ? { FOLDFOLIO_ACCESS_TTL_SEC: String(opts.accessTtlSec) } : {}),
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  child.stdout?.on('data', (d: Buffer) => (output += d.toString()));
  child.stderr?.on('data', (d: Buffer) => (output += d.toString()));
  let exited = false;
  child.on('exit', () => (exited = true));

  const stop = async () => {
    if (!exited) {
      child.kill('SIGTERM');
      const t0 = Date.now();
      while (!exited && Date.now() - t0 < 10_000) await new Promise((r) => setTimeout(r, 100));
      if (!exited) child.kill('SIGKILL');
    }
    await adminSql(`DROP DATABASE IF EXISTS \`${dbName}\``);
    // the service's own log, for reading after a failure
    mkdirSync(join(ROOT, 'test-output'), { recursive: true });
    writeFileSync(join(ROOT, 'test-output', `service-${logName}.log`), output);
  };

  const deadline = Date.now() + 60_000;
  for (;;) {
    if (exited) {
      await stop();
      throw new Error(`The service exited during start-up:\n${output}`);
    }
    try {
      const res = await fetch(`${url}/api/health`);
      if (res.ok) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) {
      await stop();
      throw new Error(`The service did not answer /api/health within 60 s:\n${output}`);
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  return { url, dbName, stop };
}

export function launchBrowser(): Promise<Browser> {
  mkdirSync(SCREENSHOTS, { recursive: true });
  return chromium.launch({
    executablePath: process.env.FOLDFOLIO_CHROMIUM ?? '/usr/bin/chromium',
    headless: true,
    args: [
      '--no-sandbox',
      '--disable-gpu',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
}

export interface Person {
  name: string;
  email: string;
  password: string;
}

/** Registers an account through the API (for people whose sign-up is not what a test is about). */
export async function registerViaApi(url: string, who: Person): Promise<string> {
  const res = await fetch(`${url}/api/auth/register`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json' },
    body: JSON.stringify({ email: who.email, password: who.password, displayName: who.name }),
  });
  if (res.status !== 201)
    throw new Error(`register ${who.email}: ${res.status} ${await res.text()}`);
  const body = (await res.json()) as { accessToken: string };
  return body.accessToken;
}

export async function apiPost<T>(
  url: string,
  token: string,
  path: string,
  body: unknown,
): Promise<T> {
  const res = await fetch(`${url}${path}`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json', Authorization: `Bearer ${token}` },
    body: JSON.stringify(body),
  });
  if (!res.ok) throw new Error(`POST ${path}: ${res.status} ${await res.text()}`);
  return (await res.json()) as T;
}

export async function apiGet<T>(url: string, token: string, path: string): Promise<T> {
  const res = await fetch(`${url}${path}`, { headers: { Authorization: `Bearer ${token}` } });
  if (!res.ok) throw new Error(`GET ${path}: ${res.status} ${await res.text()}`);
  return (await res.json()) as T;
}

/** Signs in through the API and returns the access token. */
export async function signInViaApi(url: string, who: Person): Promise<string> {
  const res = await fetch(`${url}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json' },
    body: JSON.stringify({ email: who.email, password: who.password }),
  });
  if (!res.ok) throw new Error(`sign in ${who.email}: ${res.status} ${await res.text()}`);
  return ((await res.json()) as { accessToken: string }).accessToken;
}

/** Uploads a coordinate file as a new model version; the caller checks the response status. */
export function uploadModel(
  url: string,
  token: string,
  manuscriptId: string,
  file: string,
): Promise<Response> {
  const form = new FormData();
  form.append('file', new Blob([readFileSync(file)]), basename(file));
  return fetch(`${url}/api/manuscripts/${manuscriptId}/models`, {
    method: 'POST',
    headers: { Authorization: `Bearer ${token}` },
    body: form,
  });
}

/** Polls a version's analysis until it is done (throws if it fails or takes over a minute). */
export async function waitForAnalysis(
  url: string,
  token: string,
  manuscriptId: string,
  versionId: string,
): Promise<void> {
  for (let i = 0; ; i++) {
    const a = await apiGet<{ status: string }>(
      url,
      token,
      `/api/manuscripts/${manuscriptId}/models/${versionId}/analysis`,
    );
    if (a.status === 'done') return;
    if (a.status === 'failed' || i > 600) throw new Error(`analysis ${a.status}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

/** Collects the page's uncaught errors into `errors` (each test asserts the list stays empty). */
export function watchPageErrors(page: Page, errors: string[]): Page {
  page.on('pageerror', (err) => errors.push(`${err.name}: ${err.message}`));
  return page;
}

export async function shot(page: Page, name: string): Promise<void> {
  await page.screenshot({
    path: join(SCREENSHOTS, `${name}.png`),
    fullPage: true,
    animations: 'disabled',
  });
}

/** Fills and submits the sign-up form (the e-mail may already be filled in by an invitation). */
export async function fillRegister(page: Page, who: Person): Promise<void> {
  await page.getByLabel('Your name').fill(who.name);
  const email = page.getByLabel('E-mail address');
  if ((await email.inputValue()) !== who.email) await email.fill(who.email);
  await page.getByLabel('Password').fill(who.password);
  await page.getByRole('button', { name: 'Create account' }).click();
}

/** Fills and submits the sign-in form of the current page. */
export async function fillSignIn(page: Page, who: Person, password = who.password): Promise<void> {
  await page.getByLabel('E-mail address').fill(who.email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
}

/** Opens the sign-in page, signs in and waits for the Desk. */
export async function signInToDesk(page: Page, who: Person): Promise<void> {
  await page.goto('/sign-in');
  await fillSignIn(page, who);
  await page.waitForURL(/\/desk$/);
}

export interface BrowserSuite {
  service: RunningService;
  browser: Browser;
  /** a throw-away directory for downloads, removed after the file's tests */
  dir: string;
  /** uncaught page errors (see watchPageErrors); each test must leave it empty */
  pageErrors: string[];
}

export interface BrowserSuiteOptions extends ServiceOptions {
  /** runs after the service is up and before the browser starts (e.g. to register an admin) */
  afterStart?: (service: RunningService) => Promise<void>;
}

/**
 * Registers the jest hooks every browser test file needs: the service and Chromium start before
 * the file's tests and stop after them, and an uncaught exception in any page fails the test
 * that caused it. The returned object is filled in once `beforeAll` has run.
 */
export function browserSuite(opts: BrowserSuiteOptions = {}): BrowserSuite {
  const suite = { pageErrors: [] as string[] } as BrowserSuite;
  beforeAll(async () => {
    suite.dir = mkdtempSync(join(tmpdir(), 'ff-e2e-'));
    suite.service = await startService(opts);
    if (opts.afterStart) await opts.afterStart(suite.service);
    suite.browser = await launchBrowser();
  }, 90_000);
  afterAll(async () => {
    await suite.browser?.close();
    await suite.service?.stop();
    if (suite.dir) rmSync(suite.dir, { recursive: true, force: true });
  });
  afterEach(() => {
    expect(suite.pageErrors.splice(0)).toEqual([]);
  });
  return suite;
}

/**
 * Registers `who` through the API, creates a manuscript titled `title` and uploads `file` to it;
 * the caller checks the upload's status.
 */
export async function manuscriptWithUpload(
  url: string,
  who: Person,
  title: string,
  file: string,
): Promise<{ token: string; ms: { id: string }; up: Response }> {
  const token = await registerViaApi(url, who);
  const ms = await apiPost<{ id: string }>(url, token, '/api/manuscripts', { title });
  const up = await uploadModel(url, token, ms.id, file);
  return { token, ms, up };
}
