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
  for (const table of ['users', 'manuscripts', 'memberships', 'invitations', 'mail_messages']) {
    const rows: Array<{ n: number | string }> = await t.db.query(
      `SELECT COUNT(*) AS n FROM ${table}`,
    );
    out[table] = Number(rows[0].n);
  }
  return out;
}

test('the demo seed creates three people, one manuscript and one invitation, once', async () => {
  const seed = t.app.get(DemoSeedService);
  await seed.seed();
  await waitForMail(t, DEMO_INVITEE, /invites you/);
  const first = await counts();
  expect(first).toEqual({
    users: 3,
    manuscripts: 1,
    memberships: 3,
    invitations: 1,
    mail_messages: 1,
  });
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
