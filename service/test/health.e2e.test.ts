import request from 'supertest';
import { startTestApp, type TestApp } from './helpers/test-app.js';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp();
});
afterAll(async () => {
  await t?.close();
});

test('health reports the real MariaDB and Redis as reachable', async () => {
  const res = await request(t.server).get('/api/health').expect(200);
  expect(res.body).toEqual({ status: 'ok', database: true, redis: true });
});

test('migrations created every table and no synchronize ran', async () => {
  const rows: Array<{ name: string }> = await t.db.query(
    'SELECT table_name AS name FROM information_schema.tables WHERE table_schema = DATABASE() ORDER BY table_name',
  );
  // later features add their own tables; the foundation's must all be there
  expect(rows.map((r) => r.name)).toEqual(
    expect.arrayContaining([
      'invitations',
      'mail_messages',
      'manuscripts',
      'memberships',
      'migrations',
      'password_resets',
      'refresh_tokens',
      'users',
    ]),
  );
});

test('the OpenAPI document lists the auth and manuscript routes', async () => {
  const res = await request(t.server).get('/api/docs-json').expect(200);
  expect(Object.keys(res.body.paths)).toEqual(
    expect.arrayContaining(['/api/auth/sign-in', '/api/manuscripts/{manuscriptId}/members']),
  );
});

test('helmet sets security headers', async () => {
  const res = await request(t.server).get('/api/health');
  expect(res.headers['x-content-type-options']).toBe('nosniff');
  expect(res.headers['content-security-policy']).toContain("default-src 'self'");
  // served over plain http on loopback: asking browsers to upgrade to https would break it
  expect(res.headers['content-security-policy']).not.toContain('upgrade-insecure-requests');
});
