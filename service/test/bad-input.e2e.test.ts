import request from 'supertest';
import {
  type Account,
  register,
  startTestApp,
  type TestApp,
  waitForMail,
} from './helpers/test-app.js';

let t: TestApp;
let owner: Account;
beforeAll(async () => {
  t = await startTestApp();
  owner = await register(t, 'Owner');
});
afterAll(async () => {
  await t?.close();
});

const auth = () => ({ Authorization: `Bearer ${owner.token}` });

describe('validation answers with a sentence per field', () => {
  test('an over-long title is refused; exactly 300 characters is fine', async () => {
    const res = await request(t.server)
      .post('/api/manuscripts')
      .set(auth())
      .send({ title: 'x'.repeat(301) })
      .expect(400);
    expect(res.body.message).toBe('Shorten the title to at most 300 characters.');
    expect(res.body.fields).toEqual({ title: ['Shorten the title to at most 300 characters.'] });
    const ok = await request(t.server)
      .post('/api/manuscripts')
      .set(auth())
      .send({ title: 'y'.repeat(300) })
      .expect(201);
    expect(ok.body.title).toHaveLength(300);
  });

  test('an empty or missing title is refused', async () => {
    for (const body of [{}, { title: '' }, { title: '   ' }, { title: 42 }]) {
      const res = await request(t.server).post('/api/manuscripts').set(auth()).send(body);
      expect(res.status).toBe(400);
      expect(res.body.message).toMatch(/title/);
    }
  });

  test.each([
    ['no @', 'not-an-address'],
    ['two @', 'two@@lab.example'],
    ['a space', 'spaces in@lab.example'],
    ['markup', '<script>@lab.example'],
    ['262 characters', `${'a'.repeat(250)}@lab.example`],
  ])(
    'a malformed e-mail address (%s) is refused at registration and invitation',
    async (_label, email) => {
      const reg = await request(t.server)
        .post('/api/auth/register')
        .send({ email, displayName: 'Someone', password: 'long enough password' })
        .expect(400);
      expect(reg.body.fields.email[0]).toMatch(/e-mail address/);
      const ms = await request(t.server)
        .post('/api/manuscripts')
        .set(auth())
        .send({ title: 'Invite test' })
        .expect(201);
      await request(t.server)
        .post(`/api/manuscripts/${ms.body.id}/invitations`)
        .set(auth())
        .send({ email, role: 'editor' })
        .expect(400);
    },
  );

  test('a short password, an over-long name and an unknown role are refused', async () => {
    const short = await request(t.server)
      .post('/api/auth/register')
      .send({ email: 'short.pw@lab.example', displayName: 'Short', password: 'tiny' })
      .expect(400);
    expect(short.body.message).toMatch(/at least 10 characters/);
    await request(t.server)
      .post('/api/auth/register')
      .send({
        email: 'long.name@lab.example',
        displayName: 'n'.repeat(101),
        password: 'long enough pw',
      })
      .expect(400);
    const ms = await request(t.server)
      .post('/api/manuscripts')
      .set(auth())
      .send({ title: 'Role test' })
      .expect(201);
    const res = await request(t.server)
      .post(`/api/manuscripts/${ms.body.id}/invitations`)
      .set(auth())
      .send({ email: 'role@lab.example', role: 'superuser' })
      .expect(400);
    expect(res.body.message).toMatch(/Choose one of the roles owner, editor, commenter, reviewer/);
  });

  test('unknown properties are refused (whitelist), not silently stored', async () => {
    const res = await request(t.server)
      .post('/api/manuscripts')
      .set(auth())
      .send({ title: 'Fine', status: 'archived', id: 'mine' })
      .expect(400);
    expect(Object.keys(res.body.fields).sort()).toEqual(['id', 'status']);
    const reg = await request(t.server)
      .post('/api/auth/register')
      .send({
        email: 'sneaky@lab.example',
        displayName: 'S',
        password: 'long enough pw',
        siteRole: 'admin',
      })
      .expect(400);
    expect(reg.body.fields.siteRole).toBeDefined();
  });

  test('malformed ids and query values get a sentence, not a stack trace', async () => {
    const ms = await request(t.server)
      .post('/api/manuscripts')
      .set(auth())
      .send({ title: 'Ids' })
      .expect(201);
    const bad = await request(t.server)
      .patch(`/api/manuscripts/${ms.body.id}/members/not-a-uuid`)
      .set(auth())
      .send({ role: 'editor' })
      .expect(400);
    expect(bad.body.message).toMatch(/member id is not valid/);
    await request(t.server).get('/api/manuscripts/not-a-uuid').set(auth()).expect(404);
    const q = await request(t.server)
      .get('/api/manuscripts?includeArchived=maybe')
      .set(auth())
      .expect(400);
    expect(q.body.message).toMatch(/includeArchived must be true or false/);
    const json = await request(t.server)
      .post('/api/manuscripts')
      .set(auth())
      .set('Content-Type', 'application/json')
      .send('{"title": ')
      .expect(400);
    expect(typeof json.body.message).toBe('string');
  });
});

describe('hostile strings are stored and returned verbatim, and escaped in e-mail HTML', () => {
  const SQLISH = 'Robert\'); DROP TABLE manuscripts;-- " OR 1=1 #';
  const HTML = '<img src=x onerror="alert(1)"><script>alert(\'t\')</script>&amp;';
  const UNICODE = 'φ/ψ of Gly 57 at 1.9 Å — 🧬 naïve';

  test.each([SQLISH, HTML, UNICODE])('title %s round-trips byte for byte', async (title) => {
    const created = await request(t.server)
      .post('/api/manuscripts')
      .set(auth())
      .send({ title })
      .expect(201);
    expect(created.body.title).toBe(title);
    const got = await request(t.server)
      .get(`/api/manuscripts/${created.body.id}`)
      .set(auth())
      .expect(200);
    expect(got.body.title).toBe(title);
    const desk = await request(t.server).get('/api/manuscripts').set(auth()).expect(200);
    expect(desk.body.map((m: { title: string }) => m.title)).toContain(title);
    // the table survived the SQL-looking text
    const n: Array<{ n: number | string }> = await t.db.query(
      'SELECT COUNT(*) AS n FROM manuscripts',
    );
    expect(Number(n[0].n)).toBeGreaterThan(0);
  });

  test('a display name with markup is returned verbatim', async () => {
    const res = await request(t.server)
      .post('/api/auth/register')
      .send({
        email: 'markup@lab.example',
        displayName: HTML.slice(0, 100),
        password: 'long enough pw',
      })
      .expect(201);
    expect(res.body.user.displayName).toBe(HTML.slice(0, 100));
  });

  test('the invitation e-mail escapes the title in its HTML part and keeps it in the text part', async () => {
    const ms = await request(t.server)
      .post('/api/manuscripts')
      .set(auth())
      .send({ title: HTML })
      .expect(201);
    const to = `escaped.${Date.now()}@lab.example`;
    await request(t.server)
      .post(`/api/manuscripts/${ms.body.id}/invitations`)
      .set(auth())
      .send({ email: to, role: 'reviewer' })
      .expect(201);
    const mail = await waitForMail(t, to, /invites you/);
    expect(mail.text).toContain(HTML);
    expect(mail.html).not.toBeNull();
    expect(mail.html).not.toContain('<img src=x');
    expect(mail.html).not.toContain('<script>');
    expect(mail.html).toContain('&lt;img src=x onerror=&quot;alert(1)&quot;&gt;');
    expect(mail.html).toContain('&amp;amp;');
  });
});
