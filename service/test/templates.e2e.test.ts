import { createHash } from 'node:crypto';
import request from 'supertest';
import { type Account, register, startTestApp, type TestApp } from './helpers/test-app.js';
import { createManuscript, seedVersion, useTempStorage } from './helpers/workflow.js';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { REPO } from './helpers/workflow.js';

/**
 * Versioned templates: fork, immutable numbered versions with author/message/sha256, pins,
 * line diffs, role rules, and compile errors reported with their line.
 */

let t: TestApp;
let owner: Account;
let editor: Account;
let commenter: Account;
let reviewer: Account;
let outsider: Account;
let manuscriptId: string;
let otherManuscriptId: string;

const sha256 = (s: string) => createHash('sha256').update(s, 'utf8').digest('hex');
const builtinSpec = readFileSync(join(REPO, 'templates/figures/torsion-plot/spec.vl.json'), 'utf8');
const builtinTable = readFileSync(join(REPO, 'templates/tables/methods-xray/template.hbs'), 'utf8');

async function addMember(who: Account, role: string, m = manuscriptId): Promise<void> {
  await t.db.query(
    'INSERT INTO memberships (id, manuscript_id, user_id, role) VALUES (UUID(), ?, ?, ?)',
    [m, who.id, role],
  );
}
const api = (who: Account) => ({
  get: (p: string) => request(t.server).get(p).set('Authorization', `Bearer ${who.token}`),
  post: (p: string) => request(t.server).post(p).set('Authorization', `Bearer ${who.token}`),
  put: (p: string) => request(t.server).put(p).set('Authorization', `Bearer ${who.token}`),
});

beforeAll(async () => {
  useTempStorage();
  t = await startTestApp();
  owner = await register(t, 'Owner');
  editor = await register(t, 'Editor');
  commenter = await register(t, 'Commenter');
  reviewer = await register(t, 'Reviewer');
  outsider = await register(t, 'Outsider');
  manuscriptId = await createManuscript(t, owner, 'Invented lectin');
  otherManuscriptId = await createManuscript(t, outsider, 'Invented protease');
  await addMember(editor, 'editor');
  await addMember(commenter, 'commenter');
  await addMember(reviewer, 'reviewer');
}, 60000);
afterAll(async () => {
  await t?.close();
});

const base = () => `/api/manuscripts/${manuscriptId}`;

test('the list holds every built-in template as version 1 with the sha256 of the shipped file', async () => {
  const res = await api(reviewer).get(`${base()}/templates`).expect(200);
  const torsion = res.body.find((x: { id: string }) => x.id === 'builtin:torsion-plot');
  expect(torsion).toMatchObject({ kind: 'figure', scope: 'builtin', latest: 1 });
  expect(torsion.versions[0].sha256).toBe(sha256(builtinSpec));
  const table = res.body.find((x: { id: string }) => x.id === 'builtin:methods-xray');
  expect(table.versions[0].sha256).toBe(sha256(builtinTable));
  const v = await api(commenter)
    .get(`${base()}/templates/builtin:torsion-plot/versions/1`)
    .expect(200);
  expect(v.body.body).toBe(builtinSpec);
});

test('fork, save: versions are numbered 1, 2, 3 with author, message and sha256 of the body; old versions keep their body', async () => {
  const fork = await api(editor)
    .post(`${base()}/templates`)
    .send({ from: 'builtin:torsion-plot@1', scope: 'manuscript', name: 'Torsion, bigger dots' })
    .expect(201);
  const id = fork.body.id as string;
  expect(fork.body).toMatchObject({ scope: 'manuscript', key: 'torsion-plot', latest: 1 });
  expect(fork.body.forkedFrom).toBe('builtin:torsion-plot@1');
  expect(fork.body.versions[0].sha256).toBe(sha256(builtinSpec));

  const body2 = builtinSpec.replace(/\n/, '\n  "description": "house style v2",\n');
  const s2 = await api(owner)
    .post(`${base()}/templates/${id}/versions`)
    .send({ body: body2, message: 'Describe the house style' })
    .expect(201);
  expect(s2.body).toMatchObject({
    n: 2,
    message: 'Describe the house style',
    sha256: sha256(body2),
  });
  expect(s2.body.author).toMatch(/^Owner /);
  const body3 = body2.replace('house style v2', 'house style v3');
  const s3 = await api(editor)
    .post(`${base()}/templates/${id}/versions`)
    .send({ body: body3, message: 'Third' })
    .expect(201);
  expect(s3.body.n).toBe(3);
  expect(s3.body.author).toMatch(/^Editor /);

  // version 2 still holds its own body, and the database refuses to change it
  const v2 = await api(reviewer).get(`${base()}/templates/${id}/versions/2`).expect(200);
  expect(v2.body.body).toBe(body2);
  await expect(
    t.db.query("UPDATE template_versions SET body = 'x' WHERE template_id = ? AND n = 2", [id]),
  ).rejects.toThrow(/immutable/);
  const again = await api(reviewer).get(`${base()}/templates/${id}/versions/2`).expect(200);
  expect(sha256(again.body.body)).toBe(v2.body.sha256);

  const listed = await api(commenter).get(`${base()}/templates/${id}`).expect(200);
  expect(listed.body.versions.map((v: { n: number }) => v.n)).toEqual([1, 2, 3]);
});

test('parallel saves get distinct consecutive numbers', async () => {
  const fork = await api(owner)
    .post(`${base()}/templates`)
    .send({ from: 'builtin:omega-histogram@1', scope: 'manuscript', name: 'Omega' })
    .expect(201);
  const bodies = [1, 2, 3, 4].map((i) =>
    builtinSpecOf('omega-histogram').replace(/\n/, `\n  "description": "p${i}",\n`),
  );
  const res = await Promise.all(
    bodies.map((b, i) =>
      api(owner)
        .post(`${base()}/templates/${fork.body.id}/versions`)
        .send({ body: b, message: `p${i}` }),
    ),
  );
  expect(res.map((r) => r.status)).toEqual([201, 201, 201, 201]);
  expect(res.map((r) => r.body.n as number).sort()).toEqual([2, 3, 4, 5]);
});

function builtinSpecOf(key: string): string {
  return readFileSync(join(REPO, `templates/figures/${key}/spec.vl.json`), 'utf8');
}

test('the diff between two versions is a line diff with the changed line only', async () => {
  const fork = await api(owner)
    .post(`${base()}/templates`)
    .send({ from: 'builtin:methods-xray@1', scope: 'manuscript', name: 'Table, house' })
    .expect(201);
  const lines = builtinTable.split('\n');
  const idx = lines.findIndex((l) => l.includes('<caption>'));
  expect(idx).toBeGreaterThanOrEqual(0);
  const changed = [...lines];
  changed[idx] = changed[idx].replace('<caption>', '<caption>Table 1. ');
  await api(owner)
    .post(`${base()}/templates/${fork.body.id}/versions`)
    .send({ body: changed.join('\n'), message: 'Number the table' })
    .expect(201);
  const d = await api(reviewer)
    .get(`${base()}/templates/diff`)
    .query({ from: `${fork.body.id}@1`, to: `${fork.body.id}@2` })
    .expect(200);
  const removed = d.body.parts.filter((p: { removed: boolean }) => p.removed);
  const added = d.body.parts.filter((p: { added: boolean }) => p.added);
  expect(removed.map((p: { value: string }) => p.value)).toEqual([lines[idx] + '\n']);
  expect(added.map((p: { value: string }) => p.value)).toEqual([changed[idx] + '\n']);
  expect(d.body.patch).toContain(`-${lines[idx]}`);
  expect(d.body.patch).toContain(`+${changed[idx]}`);
  // across templates: built-in against the fork's second version
  const d2 = await api(reviewer)
    .get(`${base()}/templates/diff`)
    .query({ from: 'builtin:methods-xray@1', to: `${fork.body.id}@2` })
    .expect(200);
  expect(d2.body.parts.filter((p: { added: boolean }) => p.added)).toHaveLength(1);
});

test('pins: default is the built-in; pinning a fork version is listed; a version of another slot is refused', async () => {
  const before = await api(reviewer).get(`${base()}/template-pins`).expect(200);
  const p0 = before.body.find((p: { key: string }) => p.key === 'b-factor-groups');
  expect(p0).toMatchObject({ templateId: 'builtin:b-factor-groups', n: 1, isDefault: true });
  const fork = await api(editor)
    .post(`${base()}/templates`)
    .send({ from: 'builtin:b-factor-groups@1', scope: 'lab', name: 'Lab B-factors' })
    .expect(201);
  const pinned = await api(editor)
    .put(`${base()}/template-pins/b-factor-groups`)
    .send({ version: `${fork.body.id}@1` })
    .expect(200);
  expect(pinned.body).toMatchObject({
    templateId: fork.body.id,
    n: 1,
    isDefault: false,
    templateName: 'Lab B-factors',
  });
  const wrong = await api(editor)
    .put(`${base()}/template-pins/torsion-plot`)
    .send({ version: `${fork.body.id}@1` })
    .expect(400);
  expect(wrong.body.message).toMatch(/b-factor-groups slot/);
  const missing = await api(editor)
    .put(`${base()}/template-pins/b-factor-groups`)
    .send({ version: `${fork.body.id}@9` })
    .expect(404);
  expect(missing.body.message).toMatch(/no version 9/);
});

test('lab templates are seen from every manuscript; manuscript templates only from their own', async () => {
  const lab = await api(owner)
    .post(`${base()}/templates`)
    .send({ from: 'builtin:geometry-z@1', scope: 'lab', name: 'Lab Z' })
    .expect(201);
  const mine = await api(owner)
    .post(`${base()}/templates`)
    .send({ from: 'builtin:geometry-z@1', scope: 'manuscript', name: 'Only here' })
    .expect(201);
  const other = await api(outsider)
    .get(`/api/manuscripts/${otherManuscriptId}/templates`)
    .expect(200);
  const ids = other.body.map((x: { id: string }) => x.id);
  expect(ids).toContain(lab.body.id);
  expect(ids).not.toContain(mine.body.id);
  const res = await api(outsider)
    .get(`/api/manuscripts/${otherManuscriptId}/templates/${mine.body.id}`)
    .expect(404);
  expect(res.body.message).toMatch(/no such template/);
});

test('roles: commenters and reviewers read but cannot fork, save or pin; built-ins cannot be saved over', async () => {
  const fork = await api(owner)
    .post(`${base()}/templates`)
    .send({ from: 'builtin:chi-density@1', scope: 'manuscript', name: 'Chi' })
    .expect(201);
  for (const who of [commenter, reviewer]) {
    const s = await api(who)
      .post(`${base()}/templates/${fork.body.id}/versions`)
      .send({ body: '{}', message: 'try' })
      .expect(403);
    expect(s.body.message).toMatch(/does not allow this/);
    await api(who)
      .post(`${base()}/templates`)
      .send({ from: 'builtin:chi-density@1', scope: 'manuscript', name: 'x' })
      .expect(403);
    await api(who)
      .put(`${base()}/template-pins/chi-density`)
      .send({ version: `${fork.body.id}@1` })
      .expect(403);
    await api(who).get(`${base()}/templates/${fork.body.id}/versions/1`).expect(200);
  }
  await api(outsider).get(`${base()}/templates`).expect(404);
  const b = await api(owner)
    .post(`${base()}/templates/builtin:chi-density/versions`)
    .send({ body: '{}', message: 'overwrite' })
    .expect(409);
  expect(b.body.message).toMatch(/fork it/);
  const versions = await api(owner).get(`${base()}/templates/${fork.body.id}`).expect(200);
  expect(versions.body.latest).toBe(1);
});

test('a table template that does not compile is refused with its line; a figure spec with broken JSON too', async () => {
  const fork = await api(owner)
    .post(`${base()}/templates`)
    .send({ from: 'builtin:methods-xray@1', scope: 'manuscript', name: 'Broken' })
    .expect(201);
  // line 3 opens a block that never closes
  const bad = '<table>\n<tbody>\n{{#each rows}}\n<tr><td>x</td></tr>\n</tbody></table>\n';
  const res = await api(owner)
    .post(`${base()}/templates/${fork.body.id}/versions`)
    .send({ body: bad, message: 'broken' })
    .expect(422);
  expect(typeof res.body.line).toBe('number');
  expect(res.body.message).toMatch(/does not compile/);
  // an unknown helper on line 2 (the sandbox allows a fixed list)
  const helper = '<table>\n<tr><td>{{shell "cat"}}</td></tr>\n</table>\n';
  const r2 = await api(owner)
    .post(`${base()}/templates/${fork.body.id}/versions`)
    .send({ body: helper, message: 'helper' })
    .expect(422);
  expect(r2.body.line).toBe(2);
  // raw output on line 4
  const raw = '<table>\n<tr>\n<td>x</td>\n<td>{{{engineVersion}}}</td></tr></table>\n';
  const r3 = await api(owner)
    .post(`${base()}/templates/${fork.body.id}/versions`)
    .send({ body: raw, message: 'raw' })
    .expect(422);
  expect(r3.body.line).toBe(4);

  const figFork = await api(owner)
    .post(`${base()}/templates`)
    .send({ from: 'builtin:residue-strip@1', scope: 'manuscript', name: 'Broken strip' })
    .expect(201);
  const spec = builtinSpecOf('residue-strip').split('\n');
  spec[4] = spec[4] + ' ,,';
  const r4 = await api(owner)
    .post(`${base()}/templates/${figFork.body.id}/versions`)
    .send({ body: spec.join('\n'), message: 'broken json' })
    .expect(422);
  expect(r4.body.line).toBe(5);
  const after = await api(owner).get(`${base()}/templates/${fork.body.id}`).expect(200);
  expect(after.body.latest).toBe(1);
});

test('the live preview renders a draft table and reports a render error with its line', async () => {
  const v = await seedVersion(t, manuscriptId, owner.id, '1A8O.cif');
  const ok = await api(editor)
    .post(`${base()}/templates/preview`)
    .send({
      key: 'methods-xray',
      body: builtinTable.replace('<caption>', '<caption>DRAFT '),
      modelVersionId: v.id,
    })
    .expect(201);
  expect(ok.body.kind).toBe('table');
  expect(ok.body.html).toContain('DRAFT');
  // a name the context does not hold, on line 2 (strict mode)
  const bad = '<table><tbody>\n<tr><td>{{noSuchValue}}</td></tr>\n</tbody></table>\n';
  const err = await api(editor)
    .post(`${base()}/templates/preview`)
    .send({ key: 'methods-xray', body: bad, modelVersionId: v.id })
    .expect(422);
  expect(err.body.line).toBe(2);
  expect(err.body.message).toMatch(/noSuchValue/);
  await api(commenter)
    .post(`${base()}/templates/preview`)
    .send({ key: 'methods-xray', body: builtinTable, modelVersionId: v.id })
    .expect(403);
}, 60000);

test('the live preview draws a draft figure spec (title from the draft) with its readiness', async () => {
  const v = await seedVersion(t, manuscriptId, owner.id, '1A8O.cif');
  const spec = JSON.parse(builtinSpecOf('omega-histogram')) as Record<string, unknown>;
  spec.title = 'Draft title from the editor';
  const res = await api(owner)
    .post(`${base()}/templates/preview`)
    .send({ key: 'omega-histogram', body: JSON.stringify(spec), modelVersionId: v.id })
    .expect(201);
  expect(res.body.kind).toBe('figure');
  expect(res.body.svg).toContain('Draft title from the editor');
  // numbered as the version it would become: a fresh fork has 1, so the draft is v2
  const fork = await api(owner)
    .post(`${base()}/templates`)
    .send({ from: 'builtin:omega-histogram@1', scope: 'manuscript', name: 'Omega draft' })
    .expect(201);
  const numbered = await api(owner)
    .post(`${base()}/templates/preview`)
    .send({
      key: 'omega-histogram',
      body: JSON.stringify(spec),
      modelVersionId: v.id,
      templateId: fork.body.id,
    })
    .expect(201);
  expect(numbered.body.svg).toMatch(/omega-histogram v2\b/);
  expect(typeof res.body.readiness.ok).toBe('boolean');
  const bad = await api(owner)
    .post(`${base()}/templates/preview`)
    .send({ key: 'omega-histogram', body: '{\n  "mark": "bar",\n  oops\n}', modelVersionId: v.id })
    .expect(422);
  expect(bad.body.line).toBe(3);
  const { sharedVegaHost } = await import('../src/figures/vega-host.js');
  await sharedVegaHost().close();
}, 60000);
