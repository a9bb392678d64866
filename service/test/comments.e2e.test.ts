import { randomUUID } from 'node:crypto';
import { rmSync } from 'node:fs';
import request from 'supertest';
import type { CommentThreadDto } from '@foldfolio/shared';
import { type Account, register, startTestApp, type TestApp } from './helpers/test-app.js';
import { createManuscript, seedVersion, useTempStorage } from './helpers/workflow.js';

let storageDir: string;
let t: TestApp;
let owner: Account;
let editor: Account;
let commenter: Account;
let reviewer: Account;
let manuscriptId: string;
let versionId: string;

async function join(a: Account, role: string) {
  await t.db.query(
    'INSERT INTO memberships (id, manuscript_id, user_id, role) VALUES (?, ?, ?, ?)',
    [randomUUID(), manuscriptId, a.id, role],
  );
}

const base = () => `/api/manuscripts/${manuscriptId}/comments`;
const as = (a: Account) => ({ Authorization: `Bearer ${a.token}` });

beforeAll(async () => {
  storageDir = useTempStorage();
  t = await startTestApp();
  owner = await register(t, 'Owner');
  editor = await register(t, 'Editor');
  commenter = await register(t, 'Commenter');
  reviewer = await register(t, 'Reviewer');
  manuscriptId = await createManuscript(t, owner);
  await join(editor, 'editor');
  await join(commenter, 'commenter');
  await join(reviewer, 'reviewer');
  versionId = (await seedVersion(t, manuscriptId, owner.id, '1A8O.cif')).id;
});
afterAll(async () => {
  await t?.close();
  rmSync(storageDir, { recursive: true, force: true });
  delete process.env.FOLDFOLIO_STORAGE_DIR;
});

test('a residue comment: Markdown rendered, script and javascript: links removed, mention resolved', async () => {
  const editorHandle = editor.email.split('@')[0];
  const body = [
    `**Check** the density here, @${editorHandle} — ψ looks odd (Å, 日本語).`,
    '<script>alert(1)</script>',
    '[click](javascript:alert(1)) and [ok](https://example.org/x)',
    '<img src=x onerror=alert(2)>',
  ].join('\n\n');
  const res = await request(t.server)
    .post(base())
    .set(as(commenter))
    .send({
      anchor: { type: 'residue', modelVersionId: versionId, chain: 'A', seq: 170, icode: '' },
      body,
    })
    .expect(201);
  const c = res.body as CommentThreadDto;
  expect(c.anchorKey).toBe(`residue:${versionId}:A:170:`);
  expect(c.anchor).toEqual({
    type: 'residue',
    modelVersionId: versionId,
    chain: 'A',
    seq: 170,
    icode: '',
  });
  expect(c.bodyMarkdown).toBe(body); // stored verbatim, Unicode included
  expect(c.bodyHtml).toContain('<strong>Check</strong>');
  expect(c.bodyHtml).toContain('ψ looks odd (Å, 日本語)');
  expect(c.bodyHtml).toContain('href="https://example.org/x"');
  // the attack vectors of the trade (OWASP XSS cheat sheet): none survives
  expect(c.bodyHtml).not.toMatch(/<script|javascript:|onerror|<img/i);
  expect(c.mentions).toEqual([expect.stringMatching(/^Editor/)]);
  expect(c.author?.id).toBe(commenter.id);
  expect(c.replies).toEqual([]);
});

test('threads: reply, resolve, reopen; the open/resolved filters and per-anchor counts follow', async () => {
  const created = await request(t.server)
    .post(base())
    .set(as(owner))
    .send({
      anchor: { type: 'version', modelVersionId: versionId },
      body: 'Is this the final refinement?',
    })
    .expect(201);
  const id = created.body.id as string;
  const replied = await request(t.server)
    .post(`${base()}/${id}/replies`)
    .set(as(editor))
    .send({ body: 'One more round of TLS.' })
    .expect(201);
  expect((replied.body as CommentThreadDto).replies.map((r) => r.bodyMarkdown)).toEqual([
    'One more round of TLS.',
  ]);
  // replying to a reply lands in the same thread
  const replyId = (replied.body as CommentThreadDto).replies[0].id;
  const nested = await request(t.server)
    .post(`${base()}/${replyId}/replies`)
    .set(as(owner))
    .send({ body: 'OK.' })
    .expect(201);
  expect(nested.body.id).toBe(id);
  expect(nested.body.replies).toHaveLength(2);

  const counts = await request(t.server)
    .get(`${base()}/counts/${versionId}`)
    .set(as(owner))
    .expect(200);
  expect(counts.body).toEqual({ [`version:${versionId}`]: 1, [`residue:${versionId}:A:170:`]: 1 });

  const resolved = await request(t.server)
    .post(`${base()}/${id}/resolve`)
    .set(as(commenter))
    .expect(200);
  expect(resolved.body.resolvedAt).not.toBeNull();
  const open = await request(t.server)
    .get(base())
    .query({ modelVersionId: versionId })
    .set(as(owner))
    .expect(200);
  expect((open.body as CommentThreadDto[]).map((c) => c.id)).not.toContain(id);
  const done = await request(t.server)
    .get(base())
    .query({ status: 'resolved' })
    .set(as(owner))
    .expect(200);
  expect((done.body as CommentThreadDto[]).map((c) => c.id)).toEqual([id]);
  await request(t.server).post(`${base()}/${id}/reopen`).set(as(owner)).expect(200);
  const again = await request(t.server)
    .get(base())
    .query({ anchorKey: `version:${versionId}` })
    .set(as(owner))
    .expect(200);
  expect((again.body as CommentThreadDto[]).map((c) => [c.id, c.resolvedAt])).toEqual([[id, null]]);
});

test('figure and table-cell anchors; an incomplete anchor gets a sentence', async () => {
  await request(t.server)
    .post(base())
    .set(as(editor))
    .send({
      anchor: { type: 'table-cell', tableId: 'methods', row: 'R-free', column: 'value' },
      body: 'Two decimals.',
    })
    .expect(201);
  await request(t.server)
    .post(base())
    .set(as(editor))
    .send({ anchor: { type: 'figure', figureId: 'rama-1' }, body: 'Bigger font.' })
    .expect(201);
  const bad = await request(t.server)
    .post(base())
    .set(as(editor))
    .send({ anchor: { type: 'residue', modelVersionId: versionId, chain: 'A' }, body: 'where?' })
    .expect(400);
  expect(bad.body.message).toMatch(/A residue comment needs modelVersionId, chain and seq\./);
  const foreign = await request(t.server)
    .post(base())
    .set(as(editor))
    .send({ anchor: { type: 'version', modelVersionId: randomUUID() }, body: 'x' })
    .expect(404);
  expect(foreign.body.message).toMatch(/no model version/);
});

test('reviewers can neither read nor write the discussion', async () => {
  await request(t.server).get(base()).set(as(reviewer)).expect(403);
  await request(t.server)
    .post(base())
    .set(as(reviewer))
    .send({ anchor: { type: 'figure', figureId: 'rama-1' }, body: 'sneaky' })
    .expect(403);
});
