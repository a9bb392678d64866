/**
 * Review packages through the API: freeze as a background job with progress, download, verify;
 * anonymisation (no member name, e-mail, comment or lab file name in any entry, nested Word
 * parts and inflated PDF streams included); reviewer links refused when wrong, expired or
 * revoked, with every access and refusal in the owner's audit log; the verify upload.
 */
import { rmSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { inflateSync } from 'node:zlib';
import request from 'supertest';
import type {
  CreatedReviewLinkDto,
  PackageAuditEventDto,
  ReviewPackageDto,
} from '@foldfolio/shared';
import { sharedVegaHost } from '../src/figures/vega-host.js';
import { verifyPackage } from '../src/packages/verify.js';
import { startPackageWorker, type RunningPackageWorker } from '../src/packages/worker-runtime.js';
import { readZip, writeZip } from '../src/packages/zip.js';
import { type Account, register, startTestApp, type TestApp } from './helpers/test-app.js';
import { createManuscript, fixture, upload, useTempStorage } from './helpers/workflow.js';

const LAB_FILENAME = 'quillfeather-lab_final.cif';
const COMMENT = 'Marrowdale suspects the loop near residue 180 is built backwards';

let storageDir: string;
let t: TestApp;
let worker: RunningPackageWorker;
let owner: Account;
let editor: Account;
let ownerName: string;
let editorName: string;
let manuscriptId: string;
let versionId: string;
let plain: { pkg: ReviewPackageDto; zip: Buffer };
let anon: { pkg: ReviewPackageDto; zip: Buffer };

const auth = (a: Account) => ({ Authorization: `Bearer ${a.token}` });

async function buildAndWait(
  body: Record<string, unknown>,
): Promise<{ pkg: ReviewPackageDto; zip: Buffer; seen: number[] }> {
  const res = await request(t.server)
    .post(`/api/manuscripts/${manuscriptId}/packages`)
    .set(auth(owner))
    .send(body)
    .expect(201);
  const id = (res.body as ReviewPackageDto).id;
  const seen: number[] = [];
  const until = Date.now() + 50000;
  for (;;) {
    const r = await request(t.server)
      .get(`/api/manuscripts/${manuscriptId}/packages/${id}`)
      .set(auth(owner))
      .expect(200);
    const p = r.body as ReviewPackageDto;
    seen.push(p.progress);
    if (p.status === 'done' || p.status === 'failed') {
      if (p.status === 'failed') throw new Error(`package failed: ${p.error}`);
      const z = await request(t.server)
        .get(`/api/manuscripts/${manuscriptId}/packages/${id}/zip`)
        .set(auth(owner))
        .buffer(true)
        .parse((resp, cb) => {
          const chunks: Buffer[] = [];
          resp.on('data', (c: Buffer) => chunks.push(c));
          resp.on('end', () => cb(null, Buffer.concat(chunks)));
        })
        .expect(200);
      return { pkg: p, zip: z.body as Buffer, seen };
    }
    if (Date.now() > until) throw new Error(`package still ${p.status} at ${p.progress} %`);
    await new Promise((r) => setTimeout(r, 150));
  }
}

function binary(req: request.Test): request.Test {
  return req.buffer(true).parse((resp, cb) => {
    const chunks: Buffer[] = [];
    resp.on('data', (c: Buffer) => chunks.push(c));
    resp.on('end', () => cb(null, Buffer.concat(chunks)));
  });
}

beforeAll(async () => {
  storageDir = useTempStorage();
  t = await startTestApp();
  worker = await startPackageWorker(t.cfg);
  owner = await register(t, 'Quillfeather');
  editor = await register(t, 'Marrowdale');
  const names = (await t.db.query('SELECT id, display_name FROM users')) as {
    id: string;
    display_name: string;
  }[];
  ownerName = names.find((n) => n.id === owner.id)!.display_name;
  editorName = names.find((n) => n.id === editor.id)!.display_name;
  manuscriptId = await createManuscript(t, owner, 'Invented capsid domain at 1.5 Å');
  await t.db.query(
    "INSERT INTO memberships (id, manuscript_id, user_id, role) VALUES (UUID(), ?, ?, 'editor')",
    [manuscriptId, editor.id],
  );
  const up = await upload(t, owner, manuscriptId, fixture('1A8O.cif'), LAB_FILENAME).expect(201);
  versionId = up.body.id as string;
  await request(t.server)
    .post(`/api/manuscripts/${manuscriptId}/comments`)
    .set(auth(editor))
    .send({ anchor: { type: 'figure', figureId: 'torsion-plot' }, body: COMMENT })
    .expect(201);
  plain = await buildAndWait({
    modelVersionIds: [versionId],
    includeModel: true,
    anonymise: false,
  });
  anon = await buildAndWait({ modelVersionIds: [versionId], includeModel: true, anonymise: true });
}, 110000);
afterAll(async () => {
  await worker?.close();
  await sharedVegaHost().close();
  await t?.close();
  rmSync(storageDir, { recursive: true, force: true });
  delete process.env.FOLDFOLIO_STORAGE_DIR;
});

test('a package is frozen in the background with progress; the download verifies', async () => {
  expect(plain.pkg.progress).toBe(100);
  expect(plain.pkg.zipSha256).toBe(createHash('sha256').update(plain.zip).digest('hex'));
  expect(plain.pkg.modelVersions).toEqual([{ id: versionId, n: 1 }]);
  const r = await verifyPackage(plain.zip);
  expect(r.files.filter((f) => f.status !== 'identical')).toEqual([]);
  // the non-anonymised package does name the lab: the anonymised test below is not vacuous
  const files = await readZip(plain.zip);
  expect(files.get('README.md')!.toString('utf8')).toContain(ownerName);
  expect(files.get('manifest.json')!.toString('utf8')).toContain(LAB_FILENAME);
  // the same request again gives the same bytes
  const again = await buildAndWait({
    modelVersionIds: [versionId],
    includeModel: true,
    anonymise: false,
  });
  expect(again.zip.equals(plain.zip)).toBe(true);
  // progress was seen between start and end while the job ran
  expect(again.seen.some((p) => p > 0 && p < 100)).toBe(true);
}, 60000);

/** Every text a package entry holds: raw bytes, the parts of nested zips, inflated PDF streams. */
async function texts(name: string, bytes: Buffer): Promise<string[]> {
  const out = [bytes.toString('utf8'), bytes.toString('latin1')];
  if (name.endsWith('.docx')) {
    for (const [inner, b] of await readZip(bytes)) out.push(...(await texts(inner, b)));
  }
  if (name.endsWith('.pdf')) {
    const s = bytes.toString('latin1');
    const re = /stream\r?\n/g;
    let m: RegExpExecArray | null;
    while ((m = re.exec(s))) {
      const start = m.index + m[0].length;
      const end = s.indexOf('endstream', start);
      try {
        out.push(inflateSync(bytes.subarray(start, end)).toString('latin1'));
      } catch {
        // not a Flate stream (e.g. an image); its raw bytes are already searched
      }
    }
  }
  return out;
}

test('the anonymised package has no member name, e-mail, comment text or lab file name in any entry', async () => {
  const forbidden = [
    ownerName,
    editorName,
    owner.email,
    editor.email,
    COMMENT,
    'quillfeather',
    'marrowdale',
  ];
  const files = await readZip(anon.zip);
  expect(files.size).toBeGreaterThan(20);
  for (const [name, bytes] of files) {
    expect(name.toLowerCase()).not.toContain('quillfeather');
    for (const text of await texts(name, bytes)) {
      const low = text.toLowerCase();
      for (const f of forbidden)
        expect({ name, found: low.includes(f.toLowerCase()) ? f : null }).toEqual({
          name,
          found: null,
        });
    }
  }
  // (the anonymised package verifies: checked through the verify upload below)
}, 60000);

test('reviewer links: browse and download; wrong, unknown, expired and revoked tokens refused; all audited', async () => {
  const mk = async (days: number) =>
    (
      await request(t.server)
        .post(`/api/manuscripts/${manuscriptId}/packages/${anon.pkg.id}/links`)
        .set(auth(owner))
        .send({ expiresInDays: days, label: 'Referee 2' })
        .expect(201)
    ).body as CreatedReviewLinkDto;
  const good = await mk(14);
  expect(good.url).toBe(`http://foldfolio.test/review/${good.token}`);
  // only the secret's hash is stored
  const [row] = (await t.db.query('SELECT secret_hash FROM review_links WHERE id = ?', [
    good.link.id,
  ])) as { secret_hash: string }[];
  const secret = good.token.split('.')[1];
  expect(row.secret_hash).toBe(createHash('sha256').update(secret).digest('hex'));
  expect(JSON.stringify(await t.db.query('SELECT * FROM review_links'))).not.toContain(secret);

  // no sign-in: the token is the key
  const view = await request(t.server).get(`/api/review/${good.token}`).expect(200);
  expect(view.body.anonymised).toBe(true);
  expect(view.body.files.map((f: { path: string }) => f.path)).toContain(
    'v1/figures/torsion-plot.svg',
  );
  const svg = await binary(
    request(t.server)
      .get(`/api/review/${good.token}/file`)
      .query({ path: 'v1/figures/torsion-plot.svg' }),
  ).expect(200);
  expect(svg.headers['content-type']).toMatch(/^image\/svg\+xml/);
  expect(svg.headers['content-security-policy']).toMatch(/sandbox/);
  expect((svg.body as Buffer).toString('utf8')).toMatch(/^<svg|<\?xml/);
  await request(t.server)
    .get(`/api/review/${good.token}/file`)
    .query({ path: '../../etc/passwd' })
    .expect(404);
  const zip = await binary(request(t.server).get(`/api/review/${good.token}/zip`)).expect(200);
  expect((zip.body as Buffer).equals(anon.zip)).toBe(true);

  // refusals
  const wrong = `${good.link.id}.${'A'.repeat(secret.length)}`;
  const r1 = await request(t.server).get(`/api/review/${wrong}`).expect(404);
  expect(r1.body.message).toMatch(/not valid.*ask the authors/);
  await request(t.server)
    .get(`/api/review/00000000-0000-4000-8000-000000000000.${secret}`)
    .expect(404);
  await request(t.server).get('/api/review/garbage').expect(404);
  const expiring = await mk(1);
  await t.db.query('UPDATE review_links SET expires_at = NOW(3) - INTERVAL 1 MINUTE WHERE id = ?', [
    expiring.link.id,
  ]);
  const r2 = await request(t.server).get(`/api/review/${expiring.token}/zip`).expect(410);
  expect(r2.body.message).toMatch(/expired on \d{4}-\d{2}-\d{2}\. Ask the authors/);
  const revoked = await request(t.server)
    .post(`/api/manuscripts/${manuscriptId}/review-links/${good.link.id}/revoke`)
    .set(auth(owner))
    .expect(200);
  expect(revoked.body.state).toBe('revoked');
  const r3 = await request(t.server).get(`/api/review/${good.token}`).expect(410);
  expect(r3.body.message).toMatch(/withdrew this review link/);

  const log = (
    await request(t.server)
      .get(`/api/manuscripts/${manuscriptId}/package-audit`)
      .set(auth(owner))
      .expect(200)
  ).body as PackageAuditEventDto[];
  const actions = log.map((e) => e.action);
  for (const a of [
    'package-requested',
    'package-built',
    'package-downloaded',
    'link-created',
    'reviewer-opened',
    'reviewer-file',
    'reviewer-downloaded',
    'refused-wrong-secret',
    'refused-expired',
    'link-revoked',
    'refused-revoked',
  ])
    expect(actions).toContain(a);
  expect(
    log.filter((e) => e.action === 'link-created').every((e) => e.userName === ownerName),
  ).toBe(true);
  expect(log.find((e) => e.action === 'reviewer-opened')!.userName).toBeNull();
  // refusals of links that do not exist cannot be attributed to a manuscript, but are kept
  const unknown = (await t.db.query(
    "SELECT manuscript_id FROM package_audit_events WHERE action = 'refused-unknown-link'",
  )) as { manuscript_id: string | null }[];
  expect(unknown.length).toBe(2);
  expect(unknown.every((u) => u.manuscript_id === null)).toBe(true);
  // editors see no audit log and cannot make links
  await request(t.server)
    .get(`/api/manuscripts/${manuscriptId}/package-audit`)
    .set(auth(editor))
    .expect(403);
});

test('the verify upload: passes on the package, names a tampered file, refuses a zip-slip entry, needs sign-in', async () => {
  const ok = await request(t.server)
    .post('/api/packages/verify')
    .set(auth(editor))
    .attach('package', anon.zip, 'p.zip')
    .expect(200);
  expect(ok.body.ok).toBe(true);
  const files = await readZip(anon.zip);
  const csv = Buffer.from(files.get('v1/residues.csv')!);
  csv[csv.length - 2] ^= 1;
  files.set('v1/residues.csv', csv);
  const bad = await request(t.server)
    .post('/api/packages/verify')
    .set(auth(editor))
    .attach('package', await writeZip(files), 'p.zip')
    .expect(200);
  expect(bad.body.ok).toBe(false);
  expect(
    bad.body.files
      .filter((f: { status: string }) => f.status !== 'identical')
      .map((f: { path: string }) => f.path),
  ).toEqual(['v1/residues.csv']);
  const slip = Buffer.from(await writeZip(new Map([['aa/x.txt', Buffer.from('x')]])));
  let i = slip.indexOf('aa/x.txt');
  while (i >= 0) {
    slip.write('..', i, 'latin1');
    i = slip.indexOf('aa/x.txt', i + 1);
  }
  const refused = await request(t.server)
    .post('/api/packages/verify')
    .set(auth(editor))
    .attach('package', slip, 'p.zip')
    .expect(400);
  expect(refused.body.message).toMatch(/"\.\.\/x\.txt" is refused/);
  await request(t.server)
    .post('/api/packages/verify')
    .attach('package', anon.zip, 'p.zip')
    .expect(401);
}, 60000);

test("the manuscript's pinned template version and saved methods form go into the package and verify", async () => {
  // a saved torsion-plot version pinned by the manuscript, and the authors' form entries
  const { readFileSync } = await import('node:fs');
  const { join } = await import('node:path');
  const { REPO } = await import('./helpers/workflow.js');
  const spec = JSON.parse(
    readFileSync(join(REPO, 'templates/figures/torsion-plot/spec.vl.json'), 'utf8'),
  ) as Record<string, unknown>;
  const body = JSON.stringify(
    { ...spec, description: 'Quillfeather edit of the torsion plot' },
    null,
    2,
  );
  const tid = '11111111-2222-4333-8444-555555555555';
  await t.db.query(
    `INSERT INTO templates (id, kind, template_key, name, scope, manuscript_id, forked_from, created_by)
     VALUES (?, 'figure', 'torsion-plot', 'Torsions (edited)', 'manuscript', ?, 'builtin:torsion-plot@1', ?)`,
    [tid, manuscriptId, owner.id],
  );
  await t.db.query(
    `INSERT INTO template_versions (template_id, n, body, sha256, author_id, author_name, message)
     VALUES (?, 2, ?, ?, ?, 'x', 'edit')`,
    [tid, body, createHash('sha256').update(body).digest('hex'), owner.id],
  );
  await t.db.query(
    "INSERT INTO template_pins (manuscript_id, template_key, template_id, n, pinned_by) VALUES (?, 'torsion-plot', ?, 2, ?)",
    [manuscriptId, tid, owner.id],
  );
  await t.db.query(
    'INSERT INTO methods_forms (model_version_id, manuscript_id, values_json, updated_by) VALUES (?, ?, ?, ?)',
    [versionId, manuscriptId, JSON.stringify({ multiplicity: 6.5 }), owner.id],
  );
  const pinned = await buildAndWait({
    modelVersionIds: [versionId],
    includeModel: true,
    anonymise: true,
  });
  const files = await readZip(pinned.zip);
  expect(files.get('templates/figures/torsion-plot/spec.vl.json')!.toString('utf8')).toBe(body);
  const manifest = JSON.parse(files.get('manifest.json')!.toString('utf8')) as {
    inputs: { key: string; version: string; pinned?: string }[];
  };
  const input = manifest.inputs.find((i) => i.key === 'figure-template:torsion-plot')!;
  expect(input).toMatchObject({ version: '2', pinned: `${tid}@2` });
  // the pinned spec's description reaches the SVG, the form value reaches every table format
  expect(
    files
      .get('v1/figures/torsion-plot.svg')!
      .equals((await readZip(anon.zip)).get('v1/figures/torsion-plot.svg')!),
  ).toBe(false);
  expect(JSON.parse(files.get('v1/methods-form.json')!.toString('utf8'))).toEqual({
    multiplicity: 6.5,
  });
  // the unpinned package shows no multiplicity (the file has none); this one shows the form's
  const rowOf = (text: string) => text.split('\n').find((l) => l.includes('Multiplicity')) ?? '';
  expect(
    rowOf((await readZip(anon.zip)).get('v1/tables/methods-xray.md')!.toString('utf8')),
  ).not.toContain('6.5');
  for (const ext of ['md', 'csv', 'tex', 'html'])
    expect(rowOf(files.get(`v1/tables/methods-xray.${ext}`)!.toString('utf8'))).toContain('6.5');
  const r = await verifyPackage(pinned.zip);
  expect(r.files.filter((f) => f.status !== 'identical')).toEqual([]);
  // a changed form in the package: the tables depending on it are reported
  files.set(
    'v1/methods-form.json',
    Buffer.from(JSON.stringify({ multiplicity: 3.25 }, null, 2) + '\n'),
  );
  const r2 = await verifyPackage(await writeZip(files));
  const bad = r2.files.filter((f) => f.status !== 'identical').map((f) => f.path);
  expect(bad).toEqual(
    expect.arrayContaining([
      'v1/methods-form.json',
      'v1/tables/methods-xray.md',
      'v1/tables/methods-xray.csv',
    ]),
  );
  expect(
    bad.every(
      (p) =>
        p === 'v1/methods-form.json' ||
        p === 'manifest.json' ||
        p.startsWith('v1/tables/') ||
        p === 'README.md',
    ),
  ).toBe(true);
}, 60000);
