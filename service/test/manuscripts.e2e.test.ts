import request from 'supertest';
import {
  type Account,
  linkIn,
  register,
  startTestApp,
  type TestApp,
  waitForMail,
} from './helpers/test-app.js';

let t: TestApp;
let admin: Account;
beforeAll(async () => {
  t = await startTestApp();
  admin = await register(t, 'Admin'); // first account of the install
});
afterAll(async () => {
  await t?.close();
});

const auth = (a: Account) => ({ Authorization: `Bearer ${a.token}` });

async function createManuscript(owner: Account, title = 'A structure paper'): Promise<string> {
  const res = await request(t.server)
    .post('/api/manuscripts')
    .set(auth(owner))
    .send({ title })
    .expect(201);
  expect(res.body).toMatchObject({ title, role: 'owner', status: 'active', memberCount: 1 });
  return res.body.id as string;
}

function invite(owner: Account, manuscriptId: string, email: string, role: string) {
  return request(t.server)
    .post(`/api/manuscripts/${manuscriptId}/invitations`)
    .set(auth(owner))
    .send({ email, role });
}

/** Reads the invitation mail through the admin Outbox API, as the Outbox page does. */
async function invitationTokenFromOutbox(email: string): Promise<string> {
  await waitForMail(t, email, /invites you/);
  const list = await request(t.server).get('/api/admin/outbox').set(auth(admin)).expect(200);
  const summary = (list.body as Array<{ id: string; to: string }>).find((m) => m.to === email);
  expect(summary).toBeDefined();
  const msg = await request(t.server)
    .get(`/api/admin/outbox/${summary!.id}`)
    .set(auth(admin))
    .expect(200);
  const link = (msg.body.links as string[]).find((l) => l.includes('/invitations/'));
  expect(link).toBeDefined();
  expect(link).toBe(linkIn(msg.body.text, '/invitations/'));
  return decodeURIComponent(link!.split('/invitations/')[1]);
}

test('register → create → invite by e-mail → read the sink → accept → the membership exists', async () => {
  const owner = await register(t, 'Owner');
  const id = await createManuscript(owner, 'Crystal structure of an invented lyase');
  const inviteeEmail = `invitee.${Date.now()}@lab.example`;
  const inv = await invite(owner, id, inviteeEmail, 'editor').expect(201);
  expect(inv.body).toMatchObject({ email: inviteeEmail, role: 'editor', state: 'pending' });
  const days = (Date.parse(inv.body.expiresAt) - Date.now()) / 86_400_000;
  expect(days).toBeGreaterThan(6.99);
  expect(days).toBeLessThanOrEqual(7);

  const token = await invitationTokenFromOutbox(inviteeEmail);
  // only a hash of the token is stored
  const stored: Array<{ token_hash: string }> = await t.db.query(
    'SELECT token_hash FROM invitations WHERE id = ?',
    [inv.body.id],
  );
  expect(stored[0].token_hash).toMatch(/^[0-9a-f]{64}$/);
  expect(stored[0].token_hash).not.toContain(token);

  const preview = await request(t.server).get(`/api/invitations/${token}`).expect(200);
  expect(preview.body).toMatchObject({
    manuscriptTitle: 'Crystal structure of an invented lyase',
    email: inviteeEmail,
    role: 'editor',
  });

  const invitee = await register(t, 'Invitee');
  // accepting needs the invited address
  const wrong = await request(t.server)
    .post(`/api/invitations/${token}/accept`)
    .set(auth(invitee))
    .expect(403);
  expect(wrong.body.message).toMatch(/This invitation is for .* Sign in with the invited address/);

  const right = await request(t.server)
    .post('/api/auth/register')
    .send({ email: inviteeEmail, displayName: 'Invited Editor', password: 'invitee password' })
    .expect(201);
  const accepted = await request(t.server)
    .post(`/api/invitations/${token}/accept`)
    .set('Authorization', `Bearer ${right.body.accessToken}`)
    .expect(200);
  expect(accepted.body).toEqual({ manuscriptId: id, role: 'editor' });

  const members = await request(t.server)
    .get(`/api/manuscripts/${id}/members`)
    .set(auth(owner))
    .expect(200);
  expect(
    (members.body as Array<{ email: string; role: string }>).map((m) => [m.email, m.role]),
  ).toEqual([
    [owner.email, 'owner'],
    [inviteeEmail, 'editor'],
  ]);
  const desk = await request(t.server)
    .get('/api/manuscripts')
    .set('Authorization', `Bearer ${right.body.accessToken}`)
    .expect(200);
  expect(desk.body).toEqual([expect.objectContaining({ id, role: 'editor', memberCount: 2 })]);

  // single use
  const again = await request(t.server)
    .post(`/api/invitations/${token}/accept`)
    .set('Authorization', `Bearer ${right.body.accessToken}`)
    .expect(410);
  expect(again.body.message).toMatch(/already used or withdrawn/);
  await request(t.server).get(`/api/invitations/${token}`).expect(410);
  const listed = await request(t.server)
    .get(`/api/manuscripts/${id}/invitations`)
    .set(auth(owner))
    .expect(200);
  expect(listed.body[0]).toMatchObject({ id: inv.body.id, state: 'accepted' });
});

test('an expired invitation is refused with what to do', async () => {
  const owner = await register(t, 'Owner');
  const id = await createManuscript(owner);
  const email = `late.${Date.now()}@lab.example`;
  const inv = await invite(owner, id, email, 'commenter').expect(201);
  const token = await invitationTokenFromOutbox(email);
  await t.db.query('UPDATE invitations SET expires_at = NOW(3) - INTERVAL 1 SECOND WHERE id = ?', [
    inv.body.id,
  ]);
  const res = await request(t.server).get(`/api/invitations/${token}`).expect(410);
  expect(res.body.message).toMatch(/expired.*Ask the manuscript owner/);
  const late = await request(t.server)
    .post('/api/auth/register')
    .send({ email, displayName: 'Late Person', password: 'late password' })
    .expect(201);
  await request(t.server)
    .post(`/api/invitations/${token}/accept`)
    .set('Authorization', `Bearer ${late.body.accessToken}`)
    .expect(410);
  const rows: unknown[] = await t.db.query(
    'SELECT id FROM memberships WHERE manuscript_id = ? AND user_id = ?',
    [id, late.body.user.id],
  );
  expect(rows).toHaveLength(0);
});

test('a withdrawn invitation and an unknown token are refused', async () => {
  const owner = await register(t, 'Owner');
  const id = await createManuscript(owner);
  const email = `withdrawn.${Date.now()}@lab.example`;
  const inv = await invite(owner, id, email, 'reviewer').expect(201);
  const token = await invitationTokenFromOutbox(email);
  await request(t.server)
    .delete(`/api/manuscripts/${id}/invitations/${inv.body.id}`)
    .set(auth(owner))
    .expect(204);
  await request(t.server).get(`/api/invitations/${token}`).expect(410);
  const unknown = await request(t.server)
    .get(`/api/invitations/${'x'.repeat(43)}`)
    .expect(404);
  expect(unknown.body.message).toMatch(/not valid.*ask the manuscript owner/);
});

test('inviting the same address again replaces the open invitation', async () => {
  const owner = await register(t, 'Owner');
  const id = await createManuscript(owner);
  const email = `twice.${Date.now()}@lab.example`;
  await invite(owner, id, email, 'reviewer').expect(201);
  const firstToken = await invitationTokenFromOutbox(email);
  await t.db.query('DELETE FROM mail_messages WHERE to_addrs = ?', [email]);
  await invite(owner, id, email, 'editor').expect(201);
  const secondToken = await invitationTokenFromOutbox(email);
  expect(secondToken).not.toBe(firstToken);
  await request(t.server).get(`/api/invitations/${firstToken}`).expect(410);
  const preview = await request(t.server).get(`/api/invitations/${secondToken}`).expect(200);
  expect(preview.body.role).toBe('editor');
  const listed = await request(t.server)
    .get(`/api/manuscripts/${id}/invitations`)
    .set(auth(owner))
    .expect(200);
  expect(listed.body.map((i: { role: string; state: string }) => [i.role, i.state])).toEqual([
    ['editor', 'pending'],
    ['reviewer', 'revoked'],
  ]);
});

test('inviting someone who is already a member is refused', async () => {
  const owner = await register(t, 'Owner');
  const id = await createManuscript(owner);
  const res = await invite(owner, id, owner.email, 'editor').expect(409);
  expect(res.body.message).toMatch(/already a member/);
});

test('rename, archive and restore; the Desk hides archived manuscripts unless asked', async () => {
  const owner = await register(t, 'Owner');
  const id = await createManuscript(owner, 'Working title');
  const before = await request(t.server).get(`/api/manuscripts/${id}`).set(auth(owner));
  await new Promise((r) => setTimeout(r, 20));
  const renamed = await request(t.server)
    .patch(`/api/manuscripts/${id}`)
    .set(auth(owner))
    .send({ title: 'Final title' })
    .expect(200);
  expect(renamed.body.title).toBe('Final title');
  expect(Date.parse(renamed.body.lastActivityAt)).toBeGreaterThan(
    Date.parse(before.body.lastActivityAt),
  );

  await request(t.server).post(`/api/manuscripts/${id}/archive`).set(auth(owner)).expect(200);
  const desk = await request(t.server).get('/api/manuscripts').set(auth(owner)).expect(200);
  expect(desk.body.map((m: { id: string }) => m.id)).not.toContain(id);
  const all = await request(t.server)
    .get('/api/manuscripts?includeArchived=true')
    .set(auth(owner))
    .expect(200);
  expect(all.body).toEqual([expect.objectContaining({ id, status: 'archived' })]);
  const blocked = await request(t.server)
    .patch(`/api/manuscripts/${id}`)
    .set(auth(owner))
    .send({ title: 'Too late' })
    .expect(409);
  expect(blocked.body.message).toMatch(/archived. Restore it first/);
  await request(t.server).post(`/api/manuscripts/${id}/restore`).set(auth(owner)).expect(200);
  const back = await request(t.server).get('/api/manuscripts').set(auth(owner)).expect(200);
  expect(back.body.map((m: { id: string }) => m.id)).toContain(id);
});

test('the Desk lists newest activity first', async () => {
  const owner = await register(t, 'Sorter');
  const a = await createManuscript(owner, 'First');
  await new Promise((r) => setTimeout(r, 20));
  const b = await createManuscript(owner, 'Second');
  let desk = await request(t.server).get('/api/manuscripts').set(auth(owner)).expect(200);
  expect(desk.body.map((m: { id: string }) => m.id)).toEqual([b, a]);
  await new Promise((r) => setTimeout(r, 20));
  await request(t.server).patch(`/api/manuscripts/${a}`).set(auth(owner)).send({ title: 'First!' });
  desk = await request(t.server).get('/api/manuscripts').set(auth(owner)).expect(200);
  expect(desk.body.map((m: { id: string }) => m.id)).toEqual([a, b]);
});

async function addMember(id: string, role: string): Promise<Account> {
  const m = await register(t, role);
  await t.db.query(
    'INSERT INTO memberships (id, manuscript_id, user_id, role) VALUES (UUID(), ?, ?, ?)',
    [id, m.id, role],
  );
  return m;
}

test('change a role, remove a member; the last owner can neither leave nor be demoted', async () => {
  const owner = await register(t, 'Owner');
  const id = await createManuscript(owner);
  const ed = await addMember(id, 'editor');
  const changed = await request(t.server)
    .patch(`/api/manuscripts/${id}/members/${ed.id}`)
    .set(auth(owner))
    .send({ role: 'commenter' })
    .expect(200);
  expect(changed.body).toMatchObject({ userId: ed.id, role: 'commenter' });

  const leave = await request(t.server)
    .post(`/api/manuscripts/${id}/leave`)
    .set(auth(owner))
    .expect(409);
  expect(leave.body.message).toMatch(/at least one owner.*Make another member an owner first/);
  await request(t.server)
    .patch(`/api/manuscripts/${id}/members/${owner.id}`)
    .set(auth(owner))
    .send({ role: 'editor' })
    .expect(409);
  await request(t.server)
    .delete(`/api/manuscripts/${id}/members/${owner.id}`)
    .set(auth(owner))
    .expect(409);

  // with a second owner the first may leave
  await request(t.server)
    .patch(`/api/manuscripts/${id}/members/${ed.id}`)
    .set(auth(owner))
    .send({ role: 'owner' })
    .expect(200);
  await request(t.server).post(`/api/manuscripts/${id}/leave`).set(auth(owner)).expect(204);
  await request(t.server).get(`/api/manuscripts/${id}`).set(auth(owner)).expect(404);

  const other = await addMember(id, 'reviewer');
  await request(t.server)
    .delete(`/api/manuscripts/${id}/members/${other.id}`)
    .set(auth(ed))
    .expect(204);
  const members = await request(t.server)
    .get(`/api/manuscripts/${id}/members`)
    .set(auth(ed))
    .expect(200);
  expect(members.body.map((m: { userId: string }) => m.userId)).toEqual([ed.id]);
});

test('admin: users list, site roles, and the last admin stays', async () => {
  const u = await register(t, 'Promote');
  const list = await request(t.server).get('/api/admin/users').set(auth(admin)).expect(200);
  expect(list.body.find((x: { id: string }) => x.id === u.id)).toMatchObject({
    siteRole: 'user',
    manuscriptCount: 0,
  });
  await request(t.server).get('/api/admin/users').set(auth(u)).expect(403);
  await request(t.server).get('/api/admin/outbox').set(auth(u)).expect(403);
  const demoteSelf = await request(t.server)
    .patch(`/api/admin/users/${admin.id}`)
    .set(auth(admin))
    .send({ siteRole: 'user' })
    .expect(409);
  expect(demoteSelf.body.message).toMatch(/last admin/);
  const up = await request(t.server)
    .patch(`/api/admin/users/${u.id}`)
    .set(auth(admin))
    .send({ siteRole: 'admin' })
    .expect(200);
  expect(up.body.siteRole).toBe('admin');
  await request(t.server).get('/api/admin/outbox').set(auth(u)).expect(200);
});
