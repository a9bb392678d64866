import { randomBytes } from 'node:crypto';
import type { Server } from 'node:http';
import type { NestExpressApplication } from '@nestjs/platform-express';
import { createConnection } from 'mysql2/promise';
import request from 'supertest';
import { DataSource } from 'typeorm';
import { createApp } from '../../src/app.js';
import { type AppConfig, loadConfig } from '../../src/config/app-config.js';

export interface TestApp {
  app: NestExpressApplication;
  server: Server;
  cfg: AppConfig;
  db: DataSource;
  close(): Promise<void>;
}

/**
 * Starts the real application against a fresh MariaDB database of its own
 * (`foldfolio_test_<random>`, migrated from scratch) and an SMTP sink on a free port.
 * Needs `scripts/services.sh start` (scripts/test.sh does it).
 */
export async function startTestApp(overrides: Record<string, string> = {}): Promise<TestApp> {
  process.env.FOLDFOLIO_QUIET ??= '1';
  const database = `foldfolio_test_${randomBytes(5).toString('hex')}`;
  const cfg = loadConfig({
    ...process.env,
    FOLDFOLIO_DB_NAME: database,
    FOLDFOLIO_SMTP_PORT: '0',
    FOLDFOLIO_PORT: '0',
    FOLDFOLIO_JWT_SECRET: randomBytes(32).toString('base64url'),
    // bcrypt's minimum cost we accept, to keep the suite fast; still the real algorithm.
    FOLDFOLIO_BCRYPT_COST: '10',
    FOLDFOLIO_UI_DIST: '/nonexistent',
    FOLDFOLIO_PUBLIC_URL: 'http://foldfolio.test',
    ...overrides,
  });
  const admin = await createConnection({
    host: cfg.db.host,
    port: cfg.db.port,
    user: cfg.db.user,
    password: cfg.db.password,
  });
  await admin.query(
    `CREATE DATABASE \`${database}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`,
  );
  let app: NestExpressApplication;
  try {
    app = await createApp(cfg);
    await app.init();
  } catch (err) {
    await admin.query(`DROP DATABASE IF EXISTS \`${database}\``);
    await admin.end();
    throw err;
  }
  return {
    app,
    server: app.getHttpServer() as Server,
    cfg,
    db: app.get(DataSource),
    async close() {
      await app.close();
      await admin.query(`DROP DATABASE IF EXISTS \`${database}\``);
      await admin.end();
    },
  };
}

export interface Account {
  id: string;
  email: string;
  password: string;
  token: string;
  agent: ReturnType<typeof request.agent>;
}

let counter = 0;
/** Registers a new account through the API and returns its access token and cookie agent. */
export async function register(t: TestApp, name = 'Tester'): Promise<Account> {
  counter++;
  const email = `${name.toLowerCase().replace(/[^a-z]/g, '')}${counter}.${randomBytes(3).toString('hex')}@lab.example`;
  const password = `pw-${randomBytes(8).toString('hex')}`;
  const agent = request.agent(t.server);
  const res = await agent
    .post('/api/auth/register')
    .send({ email, displayName: `${name} ${counter}`, password })
    .expect(201);
  return { id: res.body.user.id, email, password, token: res.body.accessToken, agent };
}

/** Waits until the sink has stored a message to `to` whose subject matches, and returns it. */
export async function waitForMail(
  t: TestApp,
  to: string,
  subject: RegExp,
): Promise<{ id: string; text: string; html: string | null }> {
  for (let i = 0; i < 100; i++) {
    const rows: Array<{
      id: string;
      subject: string;
      text_body: string;
      html_body: string | null;
    }> = await t.db.query(
      'SELECT id, subject, text_body, html_body FROM mail_messages WHERE to_addrs = ? ORDER BY received_at DESC',
      [to],
    );
    const hit = rows.find((r) => subject.test(r.subject));
    if (hit) return { id: hit.id, text: hit.text_body, html: hit.html_body };
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error(`no mail to ${to} matching ${subject} arrived within 5 s`);
}

export function linkIn(text: string, pathPrefix: string): string {
  const m = text.match(new RegExp(`https?://[^\\s]*${pathPrefix}[^\\s]*`));
  if (!m) throw new Error(`no ${pathPrefix} link in:\n${text}`);
  return m[0];
}
