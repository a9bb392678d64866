import request from 'supertest';
import {
  DEMO_INVITEE,
  DEMO_PASSWORD,
  DEMO_PEOPLE,
  DemoSeedService,
} from '../src/seed/demo-seed.service.js';
import { startTestApp, type TestApp, waitForMail } from './helpers/test-app.js';

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp();
});
afterAll(async () => {
  await t?.close();
});

async function counts(): Promise<Record<string, number>> {
  const out: Record<string, number> = {};
  for (const table of ['users', 'manuscripts', 'memberships', 'invitations', 'model_versions']) {
    const rows: Array<{ n: number | string }> = await t.db.query(
      `SELECT COUNT(*) AS n FROM ${table}`,
    );
    out[table] = Number(rows[0].n);
  }
  return out;
}

test('the demo seed creates three people, one manuscript with two demo models and one invitation, once', async () => {
  const seed = t.app.get(DemoSeedService);
  await seed.seed();
  await waitForMail(t, DEMO_INVITEE, /invites you/);
  const first = await counts();
  expect(first).toEqual({
    users: 3,
    manuscripts: 1,
    memberships: 3,
    invitations: 1,
    model_versions: 2,
  });
  // the demo models are the engine's invented ones, queued for analysis like any upload
  const versions: Array<{ filename: string; note: string }> = await t.db.query(
    'SELECT filename, note FROM model_versions ORDER BY n',
  );
  for (const v of versions) {
    expect(v.filename).toMatch(/\.cif$/);
    expect(v.note).toMatch(/invented demo model/);
  }
  const queued: Array<{ n: number | string }> = await t.db.query(
    'SELECT COUNT(*) AS n FROM analyses',
  );
  expect(Number(queued[0].n)).toBe(2);
  await seed.seed();
  expect(await counts()).toEqual(first);

  // each demo person signs in with the documented password and sees the manuscript in their role
  for (const p of DEMO_PEOPLE) {
    const s = await request(t.server)
      .post('/api/auth/sign-in')
      .send({ email: p.email, password: DEMO_PASSWORD })
      .expect(200);
    expect(s.body.user.siteRole).toBe(p.siteRole);
    const desk = await request(t.server)
      .get('/api/manuscripts')
      .set('Authorization', `Bearer ${s.body.accessToken}`)
      .expect(200);
    expect(desk.body).toEqual([expect.objectContaining({ role: p.role, memberCount: 3 })]);
  }
});
