import { createHash, randomUUID } from 'node:crypto';
import { type ExecutionContext, ForbiddenException } from '@nestjs/common';
import request from 'supertest';
import { ManuscriptRoleGuard } from '../src/manuscripts/manuscript-roles.js';
import { type Account, register, startTestApp, type TestApp } from './helpers/test-app.js';
import { fixture as structureFile, seedVersion } from './helpers/workflow.js';

/**
 * Every manuscript route × every role (+ a signed-in non-member, + anonymous).
 * Expected: allowed roles get 2xx, other members 403, non-members 404 (the manuscript's
 * existence is not revealed), anonymous callers 401.
 * The first test fails when a route with `:manuscriptId` exists without an entry here:
 * add one for every new manuscript route.
 */

type Role = 'owner' | 'editor' | 'commenter' | 'reviewer';
const ROLES: Role[] = ['owner', 'editor', 'commenter', 'reviewer'];
const ALL: Role[] = ROLES;

interface Fixture {
  manuscriptId: string;
  users: Record<Role | 'coOwner' | 'outsider', Account>;
}
interface Call {
  params?: Record<string, string>;
  body?: Record<string, unknown>;
  /** a multipart upload instead of a JSON body */
  attach?: { field: string; bytes: Buffer; filename: string };
  /** query-string parameters */
  query?: Record<string, string>;
}
interface Entry {
  allowed: Role[];
  /** Builds the parameters and body of a call that succeeds for an allowed role. */
  prepare?: (fx: Fixture, t: TestApp) => Promise<Call> | Call;
}

const MATRIX: Record<string, Entry> = {
  'GET /api/manuscripts/:manuscriptId': { allowed: ALL },
  'PATCH /api/manuscripts/:manuscriptId': {
    allowed: ['owner', 'editor'],
    prepare: () => ({ body: { title: 'Renamed in the matrix' } }),
  },
  'POST /api/manuscripts/:manuscriptId/archive': { allowed: ['owner'] },
  'POST /api/manuscripts/:manuscriptId/restore': { allowed: ['owner'] },
  'GET /api/manuscripts/:manuscriptId/members': { allowed: ALL },
  'PATCH /api/manuscripts/:manuscriptId/members/:userId': {
    allowed: ['owner'],
    prepare: (fx) => ({ params: { userId: fx.users.reviewer.id }, body: { role: 'commenter' } }),
  },
  'DELETE /api/manuscripts/:manuscriptId/members/:userId': {
    allowed: ['owner'],
    prepare: (fx) => ({ params: { userId: fx.users.reviewer.id } }),
  },
  'POST /api/manuscripts/:manuscriptId/leave': { allowed: ALL },
  'GET /api/manuscripts/:manuscriptId/invitations': { allowed: ['owner'] },
  'POST /api/manuscripts/:manuscriptId/invitations': {
    allowed: ['owner'],
    prepare: () => ({
      body: { email: `m${randomUUID().slice(0, 8)}@lab.example`, role: 'reviewer' },
    }),
  },
  'DELETE /api/manuscripts/:manuscriptId/invitations/:invitationId': {
    allowed: ['owner'],
    prepare: async (fx, t) => {
      const id = randomUUID();
      await t.db.query(
        `INSERT INTO invitations (id, manuscript_id, email, role, token_hash, expires_at)
         VALUES (?, ?, 'x@lab.example', 'reviewer', ?, NOW(3) + INTERVAL 1 DAY)`,
        [id, fx.manuscriptId, createHash('sha256').update(id).digest('hex')],
      );
      return { params: { invitationId: id } };
    },
  },
  // Workflow (issue 6): model versions, analyses, ledger, comments, notifications.
  'POST /api/manuscripts/:manuscriptId/models': {
    allowed: ['owner', 'editor'],
    prepare: () => ({
      attach: { field: 'file', bytes: structureFile('1A8O.cif'), filename: '1A8O.cif' },
    }),
  },
  'GET /api/manuscripts/:manuscriptId/models': { allowed: ALL },
  'GET /api/manuscripts/:manuscriptId/models/:versionId': {
    allowed: ALL,
    prepare: async (fx, t) => ({
      params: {
        versionId: (await seedVersion(t, fx.manuscriptId, fx.users.owner.id, '1A8O.cif')).id,
      },
    }),
  },
  'GET /api/manuscripts/:manuscriptId/models/:versionId/analysis': {
    allowed: ALL,
    prepare: async (fx, t) => ({
      params: {
        versionId: (await seedVersion(t, fx.manuscriptId, fx.users.owner.id, '1A8O.cif')).id,
      },
    }),
  },
  'GET /api/manuscripts/:manuscriptId/models/:versionId/report': {
    allowed: ALL,
    prepare: async (fx, t) => ({
      params: {
        versionId: (await seedVersion(t, fx.manuscriptId, fx.users.owner.id, '1A8O.cif')).id,
      },
    }),
  },
  'GET /api/manuscripts/:manuscriptId/models/:versionId/file': {
    allowed: ALL,
    prepare: async (fx, t) => ({
      params: {
        versionId: (await seedVersion(t, fx.manuscriptId, fx.users.owner.id, '1A8O.cif')).id,
      },
    }),
  },
  'GET /api/manuscripts/:manuscriptId/models/:versionId/ledger': {
    allowed: ALL,
    prepare: async (fx, t) => {
      await seedVersion(t, fx.manuscriptId, fx.users.owner.id, '1A8O.cif');
      const v2 = await seedVersion(t, fx.manuscriptId, fx.users.owner.id, '1A8O.pdb');
      return { params: { versionId: v2.id } };
    },
  },
  'GET /api/manuscripts/:manuscriptId/comments': { allowed: ['owner', 'editor', 'commenter'] },
  'GET /api/manuscripts/:manuscriptId/comments/counts/:versionId': {
    allowed: ['owner', 'editor', 'commenter'],
    prepare: async (fx, t) => ({
      params: {
        versionId: (await seedVersion(t, fx.manuscriptId, fx.users.owner.id, '1A8O.cif')).id,
      },
    }),
  },
  'POST /api/manuscripts/:manuscriptId/comments': {
    allowed: ['owner', 'editor', 'commenter'],
    prepare: () => ({
      body: { anchor: { type: 'figure', figureId: 'fig-1' }, body: 'Axis labels?' },
    }),
  },
  'POST /api/manuscripts/:manuscriptId/comments/:commentId/replies': {
    allowed: ['owner', 'editor', 'commenter'],
    prepare: async (fx, t) => ({
      params: { commentId: await seedComment(t, fx) },
      body: { body: 'Agreed.' },
    }),
  },
  'POST /api/manuscripts/:manuscriptId/comments/:commentId/resolve': {
    allowed: ['owner', 'editor', 'commenter'],
    prepare: async (fx, t) => ({ params: { commentId: await seedComment(t, fx) } }),
  },
  'POST /api/manuscripts/:manuscriptId/comments/:commentId/reopen': {
    allowed: ['owner', 'editor', 'commenter'],
    prepare: async (fx, t) => ({ params: { commentId: await seedComment(t, fx) } }),
  },
  'GET /api/manuscripts/:manuscriptId/notifications': { allowed: ALL },
  'PUT /api/manuscripts/:manuscriptId/notifications': {
    allowed: ALL,
    prepare: () => ({ body: { muted: true } }),
  },
  // Review packages (issue 7).
  'POST /api/manuscripts/:manuscriptId/packages': {
    allowed: ['owner', 'editor'],
    prepare: async (fx, t) => ({
      body: {
        modelVersionIds: [await seedVersionRow(t, fx)],
        includeModel: false,
        anonymise: true,
      },
    }),
  },
  'GET /api/manuscripts/:manuscriptId/packages': { allowed: ['owner', 'editor'] },
  'GET /api/manuscripts/:manuscriptId/packages/:packageId': {
    allowed: ['owner', 'editor'],
    prepare: async (fx, t) => ({ params: { packageId: await seedPackage(t, fx) } }),
  },
  'GET /api/manuscripts/:manuscriptId/packages/:packageId/zip': {
    allowed: ['owner', 'editor'],
    prepare: async (fx, t) => ({ params: { packageId: await seedPackage(t, fx) } }),
  },
  'POST /api/manuscripts/:manuscriptId/packages/:packageId/links': {
    allowed: ['owner'],
    prepare: async (fx, t) => ({
      params: { packageId: await seedPackage(t, fx) },
      body: { expiresInDays: 7, label: 'matrix' },
    }),
  },
  'POST /api/manuscripts/:manuscriptId/review-links/:linkId/revoke': {
    allowed: ['owner'],
    prepare: async (fx, t) => {
      const packageId = await seedPackage(t, fx);
      const linkId = randomUUID();
      await t.db.query(
        `INSERT INTO review_links (id, package_id, manuscript_id, secret_hash, label, expires_at)
         VALUES (?, ?, ?, ?, '', NOW(3) + INTERVAL 1 DAY)`,
        [linkId, packageId, fx.manuscriptId, createHash('sha256').update(linkId).digest('hex')],
      );
      return { params: { linkId } };
    },
  },
  'GET /api/manuscripts/:manuscriptId/package-audit': { allowed: ['owner'] },
  // Templates, figures and the methods table (issue 5).
  'GET /api/manuscripts/:manuscriptId/templates': { allowed: ALL },
  'GET /api/manuscripts/:manuscriptId/templates/diff': {
    allowed: ALL,
    prepare: () => ({ query: { from: 'builtin:torsion-plot@1', to: 'builtin:torsion-plot@1' } }),
  },
  'GET /api/manuscripts/:manuscriptId/templates/:templateId': {
    allowed: ALL,
    prepare: () => ({ params: { templateId: 'builtin:omega-histogram' } }),
  },
  'GET /api/manuscripts/:manuscriptId/templates/:templateId/versions/:n': {
    allowed: ALL,
    prepare: async (fx, t) => ({ params: { templateId: await seedTemplate(t, fx), n: '1' } }),
  },
  'POST /api/manuscripts/:manuscriptId/templates': {
    allowed: ['owner', 'editor'],
    prepare: () => ({ body: { from: 'builtin:geometry-z@1', scope: 'manuscript', name: 'Z' } }),
  },
  'POST /api/manuscripts/:manuscriptId/templates/:templateId/versions': {
    allowed: ['owner', 'editor'],
    prepare: async (fx, t) => ({
      params: { templateId: await seedTemplate(t, fx) },
      body: { body: '{"mark": "point"}', message: 'Matrix save' },
    }),
  },
  'POST /api/manuscripts/:manuscriptId/templates/preview': {
    allowed: ['owner', 'editor'],
    prepare: async (fx, t) => ({
      body: {
        key: 'methods-xray',
        body: '<table><tbody><tr><td>{{val "rFree" d=3}}</td></tr></tbody></table>',
        modelVersionId: (await seedVersion(t, fx.manuscriptId, fx.users.owner.id, '1A8O.cif')).id,
      },
    }),
  },
  'GET /api/manuscripts/:manuscriptId/template-pins': { allowed: ALL },
  'PUT /api/manuscripts/:manuscriptId/template-pins/:key': {
    allowed: ['owner', 'editor'],
    prepare: () => ({
      params: { key: 'torsion-plot' },
      body: { version: 'builtin:torsion-plot@1' },
    }),
  },
  'GET /api/manuscripts/:manuscriptId/figures': { allowed: ALL },
  'GET /api/manuscripts/:manuscriptId/models/:versionId/figures/:key': {
    allowed: ALL,
    prepare: async (fx, t) => ({
      params: {
        versionId: (await seedVersion(t, fx.manuscriptId, fx.users.owner.id, '1A8O.cif')).id,
        key: 'omega-histogram',
      },
    }),
  },
  'GET /api/manuscripts/:manuscriptId/models/:versionId/figures/:key/export': {
    allowed: ALL,
    prepare: async (fx, t) => ({
      params: {
        versionId: (await seedVersion(t, fx.manuscriptId, fx.users.owner.id, '1A8O.cif')).id,
        key: 'omega-histogram',
      },
      query: { format: 'svg' },
    }),
  },
  'GET /api/manuscripts/:manuscriptId/models/:versionId/methods-table': {
    allowed: ALL,
    prepare: async (fx, t) => ({
      params: {
        versionId: (await seedVersion(t, fx.manuscriptId, fx.users.owner.id, '1A8O.cif')).id,
      },
    }),
  },
  'GET /api/manuscripts/:manuscriptId/models/:versionId/methods-table/export': {
    allowed: ALL,
    prepare: async (fx, t) => ({
      params: {
        versionId: (await seedVersion(t, fx.manuscriptId, fx.users.owner.id, '1A8O.cif')).id,
      },
      query: { format: 'csv' },
    }),
  },
  'GET /api/manuscripts/:manuscriptId/models/:versionId/methods-form': {
    allowed: ALL,
    prepare: async (fx, t) => ({ params: { versionId: await seedVersionRow(t, fx) } }),
  },
  'PUT /api/manuscripts/:manuscriptId/models/:versionId/methods-form': {
    allowed: ['owner', 'editor'],
    prepare: async (fx, t) => ({
      params: {
        versionId: (await seedVersion(t, fx.manuscriptId, fx.users.owner.id, '1A8O.cif')).id,
      },
      body: { values: { rFree: 0.25 } },
    }),
  },
};

/** A manuscript template with one version (a minimal figure spec), inserted directly. */
async function seedTemplate(t: TestApp, fx: Fixture): Promise<string> {
  const id = randomUUID();
  await t.db.query(
    `INSERT INTO templates (id, kind, template_key, name, scope, manuscript_id, forked_from, created_by)
     VALUES (?, 'figure', 'omega-histogram', 'Matrix', 'manuscript', ?, 'builtin:omega-histogram@1', ?)`,
    [id, fx.manuscriptId, fx.users.owner.id],
  );
  const body = '{"mark": "bar"}';
  await t.db.query(
    `INSERT INTO template_versions (template_id, n, body, sha256, author_id, author_name, message)
     VALUES (?, 1, ?, ?, ?, 'Owner', 'seed')`,
    [id, body, createHash('sha256').update(body).digest('hex'), fx.users.owner.id],
  );
  return id;
}

/** A model version row (no file or analysis needed: the package job never runs here). */
async function seedVersionRow(t: TestApp, fx: Fixture): Promise<string> {
  const id = randomUUID();
  await t.db.query(
    `INSERT INTO model_versions (id, manuscript_id, n, sha256, format, gzip, filename, size_bytes, uploaded_by)
     VALUES (?, ?, (SELECT COALESCE(MAX(n), 0) + 1 FROM model_versions m WHERE m.manuscript_id = ?), ?, 'mmcif', 0, 'm.cif', 1, ?)`,
    [id, fx.manuscriptId, fx.manuscriptId, '0'.repeat(64), fx.users.owner.id],
  );
  return id;
}

/** A finished package whose zip (a tiny real one) is in the blob store. */
async function seedPackage(t: TestApp, fx: Fixture): Promise<string> {
  const { Readable } = await import('node:stream');
  const { BLOB_STORE } = await import('../src/storage/blob-store.js');
  const { writeZip } = await import('../src/packages/zip.js');
  const store = t.app.get<symbol, import('../src/storage/blob-store.js').BlobStore>(BLOB_STORE);
  const zip = await writeZip(new Map([['manifest.json', Buffer.from('{}')]]));
  const blob = await store.put(Readable.from([zip]), { maxBytes: 1 << 20 });
  const id = randomUUID();
  await t.db.query(
    `INSERT INTO review_packages (id, manuscript_id, status, progress, model_version_ids, include_model, anonymised, zip_sha256, size_bytes, manifest_json, finished_at)
     VALUES (?, ?, 'done', 100, '[]', 0, 1, ?, ?, '{"files":[]}', NOW(3))`,
    [id, fx.manuscriptId, blob.sha256, blob.sizeBytes],
  );
  return id;
}

/** A figure comment by the owner, inserted directly. */
async function seedComment(t: TestApp, fx: Fixture): Promise<string> {
  const id = randomUUID();
  await t.db.query(
    `INSERT INTO comments (id, manuscript_id, anchor_type, anchor_key, author_id, body_md, body_html)
     VALUES (?, ?, 'figure', 'figure:fig-1', ?, 'Check the axis.', '<p>Check the axis.</p>')`,
    [id, fx.manuscriptId, fx.users.owner.id],
  );
  return id;
}

let t: TestApp;
let users: Fixture['users'];
beforeAll(async () => {
  t = await startTestApp();
  const [owner, coOwner, editor, commenter, reviewer, outsider] = [
    await register(t, 'Owner'),
    await register(t, 'Coowner'),
    await register(t, 'Editor'),
    await register(t, 'Commenter'),
    await register(t, 'Reviewer'),
    await register(t, 'Outsider'),
  ];
  users = { owner, coOwner, editor, commenter, reviewer, outsider };
});
afterAll(async () => {
  await t?.close();
});

/** Every route registered on the Express app whose path has a :manuscriptId. */
function manuscriptRoutes(): string[] {
  const express = t.app.getHttpAdapter().getInstance() as {
    router: { stack: Array<{ route?: { path: string; methods: Record<string, boolean> } }> };
  };
  const out: string[] = [];
  for (const layer of express.router.stack) {
    if (!layer.route || !layer.route.path.includes(':manuscriptId')) continue;
    for (const m of Object.keys(layer.route.methods)) {
      if (m !== '_all') out.push(`${m.toUpperCase()} ${layer.route.path}`);
    }
  }
  return out.sort();
}

/** A fresh manuscript where every role (and a second owner) is held by its own account. */
async function fixture(): Promise<Fixture> {
  const manuscriptId = randomUUID();
  await t.db.query(
    "INSERT INTO manuscripts (id, title, status, created_by) VALUES (?, 'Matrix', 'active', ?)",
    [manuscriptId, users.owner.id],
  );
  const holders: Array<[Account, Role]> = [
    [users.owner, 'owner'],
    [users.coOwner, 'owner'],
    [users.editor, 'editor'],
    [users.commenter, 'commenter'],
    [users.reviewer, 'reviewer'],
  ];
  for (const [a, role] of holders) {
    await t.db.query(
      'INSERT INTO memberships (id, manuscript_id, user_id, role) VALUES (UUID(), ?, ?, ?)',
      [manuscriptId, a.id, role],
    );
  }
  return { manuscriptId, users };
}

test('every manuscript route has an entry in the role matrix, and every entry is a route', () => {
  const routes = manuscriptRoutes();
  expect(routes.length).toBeGreaterThan(0);
  const missing = routes.filter((r) => !(r in MATRIX));
  const stale = Object.keys(MATRIX).filter((k) => !routes.includes(k));
  expect({ missing, stale }).toEqual({ missing: [], stale: [] });
});

type Actor = Role | 'non-member' | 'anonymous';
const ACTORS: Actor[] = [...ROLES, 'non-member', 'anonymous'];

describe.each(Object.keys(MATRIX))('%s', (route) => {
  test.each(ACTORS)('as %s', async (actor) => {
    const entry = MATRIX[route];
    const fx = await fixture();
    const call = (await entry.prepare?.(fx, t)) ?? {};
    const [method, pattern] = route.split(' ');
    const params: Record<string, string> = { manuscriptId: fx.manuscriptId, ...call.params };
    const path = pattern.replace(/:(\w+)/g, (_, name: string) => params[name]);
    let req = request(t.server)[
      method.toLowerCase() as 'get' | 'post' | 'patch' | 'put' | 'delete'
    ](path);
    const account =
      actor === 'anonymous' ? null : actor === 'non-member' ? users.outsider : users[actor];
    if (account) req = req.set('Authorization', `Bearer ${account.token}`);
    if (call.attach) req = req.attach(call.attach.field, call.attach.bytes, call.attach.filename);
    if (call.query) req = req.query(call.query);
    const res = await (call.body ? req.send(call.body) : req);

    const expected =
      actor === 'anonymous'
        ? 401
        : actor === 'non-member'
          ? 404
          : entry.allowed.includes(actor)
            ? '2xx'
            : 403;
    const got = res.status >= 200 && res.status < 300 ? '2xx' : res.status;
    expect({ route, actor, status: got }).toEqual({ route, actor, status: expected });
    if (typeof expected === 'number') expect(typeof res.body.message).toBe('string');
  });
});

test('a manuscript route without @ManuscriptRoles is refused (fail closed)', async () => {
  const guard = t.app.get(ManuscriptRoleGuard);
  const fx = await fixture();
  class Undecorated {
    handler(): void {}
  }
  const owner = await t.db.query('SELECT * FROM users WHERE id = ?', [users.owner.id]);
  const req = {
    params: { manuscriptId: fx.manuscriptId },
    user: owner[0],
    method: 'GET',
    path: '/x',
  };
  const ctx = {
    switchToHttp: () => ({ getRequest: () => req }),
    getHandler: () => Undecorated.prototype.handler,
    getClass: () => Undecorated,
  } as unknown as ExecutionContext;
  await expect(guard.canActivate(ctx)).rejects.toBeInstanceOf(ForbiddenException);
});
