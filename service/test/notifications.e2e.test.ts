import { randomUUID } from 'node:crypto';
import { rmSync } from 'node:fs';
import request from 'supertest';
import { startAnalysisWorker, type RunningWorker } from '../src/analyses/worker-runtime.js';
import { NotificationsService } from '../src/notifications/notifications.service.js';
import {
  type Account,
  register,
  startTestApp,
  type TestApp,
  waitForMail,
} from './helpers/test-app.js';
import {
  createManuscript,
  fixture,
  upload,
  useTempStorage,
  waitForAnalysis,
} from './helpers/workflow.js';

let storageDir: string;
let t: TestApp;
let worker: RunningWorker;
let owner: Account;
let editor: Account;
let commenter: Account;
let reviewer: Account;
let manuscriptId: string;

async function mailsTo(a: Account): Promise<string[]> {
  await t.app.get(NotificationsService).idle();
  const rows: { subject: string }[] = await t.db.query(
    'SELECT subject FROM mail_messages WHERE to_addrs = ? ORDER BY received_at',
    [a.email],
  );
  return rows.map((r) => r.subject);
}

beforeAll(async () => {
  storageDir = useTempStorage();
  t = await startTestApp();
  worker = await startAnalysisWorker(t.cfg);
  owner = await register(t, 'Owner');
  editor = await register(t, 'Editor');
  commenter = await register(t, 'Commenter');
  reviewer = await register(t, 'Reviewer');
  manuscriptId = await createManuscript(t, owner, 'Invented flavin reductase');
  for (const [a, role] of [
    [editor, 'editor'],
    [commenter, 'commenter'],
    [reviewer, 'reviewer'],
  ] as const) {
    await t.db.query(
      'INSERT INTO memberships (id, manuscript_id, user_id, role) VALUES (?, ?, ?, ?)',
      [randomUUID(), manuscriptId, a.id, role],
    );
  }
});
afterAll(async () => {
  await worker?.close();
  await t?.close();
  rmSync(storageDir, { recursive: true, force: true });
  delete process.env.FOLDFOLIO_STORAGE_DIR;
});

test('a new version e-mails the team (not the uploader, not reviewers); the finished analysis follows', async () => {
  const res = await upload(
    t,
    editor,
    manuscriptId,
    fixture('1A8O.cif'),
    '1A8O.cif',
    'after TLS',
  ).expect(201);
  const mail = await waitForMail(
    t,
    commenter.email,
    /New model version 1 of “Invented flavin reductase”/,
  );
  expect(mail.text).toContain('after TLS');
  expect(mail.text).toContain(`http://foldfolio.test/manuscripts/${manuscriptId}/models`);
  await waitForMail(t, owner.email, /New model version 1/);

  expect((await waitForAnalysis(t, owner, manuscriptId, res.body.id)).status).toBe('done');
  const ready = await waitForMail(t, owner.email, /Analysis of version 1 .* is ready/);
  expect(ready.text).toMatch(/support, and do not replace/);
  await waitForMail(t, editor.email, /Analysis of version 1 .* is ready/);

  expect((await mailsTo(editor)).filter((s) => /New model version/.test(s))).toEqual([]);
  expect(await mailsTo(reviewer)).toEqual([]);
});

test('a failed analysis e-mails the engine’s reason', async () => {
  const res = await upload(
    t,
    owner,
    manuscriptId,
    fixture('5moo_header.pdb'),
    '5moo_header.pdb',
  ).expect(201);
  const a = await waitForAnalysis(t, owner, manuscriptId, res.body.id);
  expect(a.status).toBe('failed');
  const mail = await waitForMail(t, editor.email, /Analysis of version 2 .* failed/);
  expect(mail.text).toContain(a.error ?? '∅');
});

test('a mention e-mails the mentioned member; muting the manuscript stops it', async () => {
  const handle = commenter.email.split('@')[0];
  await request(t.server)
    .post(`/api/manuscripts/${manuscriptId}/comments`)
    .set('Authorization', `Bearer ${owner.token}`)
    .send({
      anchor: { type: 'figure', figureId: 'fig-2' },
      body: `@${handle} can you check panel B?`,
    })
    .expect(201);
  const mail = await waitForMail(
    t,
    commenter.email,
    /mentioned you on “Invented flavin reductase”/,
  );
  expect(mail.text).toContain('can you check panel B?');
  expect(mail.text).toContain(`/manuscripts/${manuscriptId}/discussion`);

  const put = await request(t.server)
    .put(`/api/manuscripts/${manuscriptId}/notifications`)
    .set('Authorization', `Bearer ${commenter.token}`)
    .send({ muted: true })
    .expect(200);
  expect(put.body).toEqual({ muted: true });
  const get = await request(t.server)
    .get(`/api/manuscripts/${manuscriptId}/notifications`)
    .set('Authorization', `Bearer ${commenter.token}`)
    .expect(200);
  expect(get.body).toEqual({ muted: true });
  const before = (await mailsTo(commenter)).length;
  await request(t.server)
    .post(`/api/manuscripts/${manuscriptId}/comments`)
    .set('Authorization', `Bearer ${owner.token}`)
    .send({ anchor: { type: 'figure', figureId: 'fig-2' }, body: `@${handle} and panel C?` })
    .expect(201);
  await upload(t, owner, manuscriptId, fixture('3dg1_final.cif'), '3dg1_final.cif').expect(201);
  await waitForMail(t, editor.email, /New model version 3/); // others still hear about it
  expect((await mailsTo(commenter)).length).toBe(before);
  await request(t.server)
    .put(`/api/manuscripts/${manuscriptId}/notifications`)
    .set('Authorization', `Bearer ${commenter.token}`)
    .send({ muted: 'yes' })
    .expect(400);
});
