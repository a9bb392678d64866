/**
 * Review package files without the web service: determinism, verify (pass, tampered figure,
 * changed model, no model), zip safety (slip, absolute, symlink, bomb limits), and the zip read
 * back by Python's zipfile module (an outside reader) against the manifest.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import yazl from 'yazl';
import { sharedVegaHost } from '../src/figures/vega-host.js';
import {
  buildPackage,
  builtinTemplateSet,
  checkAnonymous,
  type BuiltPackage,
} from '../src/packages/build.js';
import { verifyPackage } from '../src/packages/verify.js';
import { readZip, writeZip, ZipSafetyError } from '../src/packages/zip.js';
import { fixture, REPO } from './helpers/workflow.js';

const MODEL = fixture('1A8O.cif');
let first: BuiltPackage;
let dir: string;

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'ff-pkg-'));
  first = await buildPackage({
    title: 'Invented capsid domain',
    models: [{ n: 1, filename: '1A8O.cif', bytes: MODEL }],
    includeModel: true,
    anonymise: false,
    preparedBy: ['Ada Quillfeather'],
  });
});
afterAll(async () => {
  await sharedVegaHost().close();
  rmSync(dir, { recursive: true, force: true });
});

/** Moves one CA atom 2 Å along x (columns found from the _atom_site loop header). */
function shiftedModel(): Buffer {
  const lines = MODEL.toString('utf8').split('\n');
  const header = lines.filter((l) => l.startsWith('_atom_site.')).map((l) => l.trim());
  const xCol = header.indexOf('_atom_site.Cartn_x');
  const nameCol = header.indexOf('_atom_site.label_atom_id');
  let seen = 0;
  for (let i = 0; i < lines.length; i++) {
    if (!lines[i].startsWith('ATOM')) continue;
    const f = lines[i].trim().split(/\s+/);
    if (f[nameCol] !== 'CA' || ++seen !== 30) continue;
    f[xCol] = (Number(f[xCol]) + 2).toFixed(3);
    lines[i] = f.join(' ');
    return Buffer.from(lines.join('\n'), 'utf8');
  }
  throw new Error('fixture has fewer than 30 CA atoms');
}

test('the same package built twice gives identical zip bytes, and verify passes', async () => {
  const again = await buildPackage({
    title: 'Invented capsid domain',
    models: [{ n: 1, filename: '1A8O.cif', bytes: MODEL }],
    includeModel: true,
    anonymise: false,
    preparedBy: ['Ada Quillfeather'],
  });
  expect(again.zip.equals(first.zip)).toBe(true);
  // what the brief asks every package to hold
  const paths = [...first.files.keys()];
  for (const p of [
    'README.md',
    'manifest.json',
    'model/v1.cif',
    'v1/report.json',
    'v1/residues.csv',
    'v1/figures/torsion-plot.svg',
    'v1/figures/torsion-plot.pdf',
    'v1/figures/torsion-plot.data.csv',
    'v1/figures/torsion-plot.data.json',
    'v1/tables/methods-xray.html',
    'v1/tables/methods-xray.md',
    'v1/tables/methods-xray.tex',
    'v1/tables/methods-xray.csv',
    'v1/tables/methods-xray.docx',
  ])
    expect(paths).toContain(p);
  const readme = first.files.get('README.md')!.toString('utf8');
  expect(readme).toMatch(/support expert judgement; they do not replace it/);
  expect(readme).toMatch(/journal's and the structure archive's own requirements/);
  expect(readme).toContain(`Foldfolio engine ${first.reports[0].engine.version}`);
  // every file of the zip is described in the README
  for (const p of paths.filter((x) => x !== 'manifest.json')) expect(readme).toContain(`\`${p}\``);

  const r = await verifyPackage(first.zip);
  expect(r.files.filter((f) => f.status !== 'identical')).toEqual([]);
  expect(r.ok).toBe(true);
  expect(r.counts.identical).toBe(first.files.size);
}, 60000);

test("Python's zipfile (outside reader) sees every manifest file with its SHA-256 and the fixed settings", () => {
  const zipPath = join(dir, 'p.zip');
  writeFileSync(zipPath, first.zip);
  const py = `
import hashlib, json, sys, zipfile
z = zipfile.ZipFile(sys.argv[1])
out = []
for i in z.infolist():
    out.append({"name": i.filename, "sha": hashlib.sha256(z.read(i)).hexdigest(), "date": list(i.date_time),
                "method": i.compress_type, "extra": len(i.extra), "mode": (i.external_attr >> 16) & 0o777})
print(json.dumps(out))
`;
  const got = JSON.parse(
    execFileSync('/usr/bin/python3', ['-c', py, zipPath], { encoding: 'utf8' }),
  ) as {
    name: string;
    sha: string;
    date: number[];
    method: number;
    extra: number;
    mode: number;
  }[];
  const names = got.map((g) => g.name);
  expect(names).toEqual([...names].sort());
  const manifest = JSON.parse(first.files.get('manifest.json')!.toString('utf8')) as {
    files: { path: string; sha256: string }[];
  };
  const bySha = new Map(got.map((g) => [g.name, g.sha]));
  for (const f of manifest.files) expect(bySha.get(f.path)).toBe(f.sha256);
  expect(names.length).toBe(manifest.files.length + 1);
  for (const g of got) {
    expect(g.date).toEqual([2000, 1, 1, 0, 0, 0]);
    expect(g.method).toBe(8); // ZIP_DEFLATED
    expect(g.extra).toBe(0);
    expect(g.mode).toBe(0o644);
  }
  // the model inside is the uploaded file byte for byte (sha256 by Node's crypto, not ours)
  expect(bySha.get('model/v1.cif')).toBe(createHash('sha256').update(MODEL).digest('hex'));
});

test('one byte changed in a figure: verify (the CLI) names that file and fails', async () => {
  const files = await readZip(first.zip);
  const svg = Buffer.from(files.get('v1/figures/torsion-plot.svg')!);
  const at = svg.indexOf('<svg') + 1;
  svg[at] = svg[at] === 0x73 ? 0x53 : 0x73;
  files.set('v1/figures/torsion-plot.svg', svg);
  const tampered = join(dir, 'tampered.zip');
  writeFileSync(tampered, await writeZip(files));
  const cli = resolve(REPO, 'service/dist/cli/main.js');
  const run = spawnSync(process.execPath, [cli, 'verify', tampered], {
    encoding: 'utf8',
    cwd: REPO,
  });
  expect(run.status).toBe(1);
  const bad = run.stdout.split('\n').filter((l) => /^(different|missing|unexpected)/.test(l));
  expect(bad).toHaveLength(1);
  expect(bad[0]).toMatch(
    /^different\s+v1\/figures\/torsion-plot\.svg — its SHA-256 does not match manifest\.json/,
  );
  expect(run.stdout).toMatch(/NOT VERIFIED/);
}, 60000);

test('a changed model: verify reports every file that depends on it', async () => {
  const changed = shiftedModel();
  const r = await verifyPackage(first.zip, { model: { filename: 'changed.cif', bytes: changed } });
  expect(r.ok).toBe(false);
  expect(r.inputNotes.join(' ')).toMatch(/is not the one recorded/);
  const manifest = JSON.parse(first.files.get('manifest.json')!.toString('utf8')) as {
    files: { path: string; dependsOn: string[] }[];
  };
  const dependent = manifest.files
    .filter((f) => f.dependsOn.includes('model:v1'))
    .map((f) => f.path);
  // every file but the template copies is computed from the model; the templates stay identical
  const templates = manifest.files.filter((f) => f.path.startsWith('templates/'));
  expect(templates.length).toBeGreaterThan(0);
  expect(dependent.length).toBe(manifest.files.length - templates.length);
  const byPath = new Map(r.files.map((f) => [f.path, f]));
  for (const p of dependent) expect(byPath.get(p)?.changedInputs).toContain('model:v1');
  // files whose content must move when a CA moves 2 Å: the model, torsions, the per-residue table
  for (const p of [
    'model/v1.cif',
    'v1/report.json',
    'v1/residues.csv',
    'v1/figures/torsion-plot.data.json',
    'manifest.json',
  ])
    expect(byPath.get(p)?.status).toBe('different');
  for (const f of templates)
    expect(byPath.get(f.path)).toEqual({ path: f.path, status: 'identical' });
  expect(byPath.get('v1/report.json')!.detail).toMatch(/line\(s\) differ; first at line \d+/);
}, 60000);

test('a package made by another engine version: verify says so and marks the engine-made files', async () => {
  const files = await readZip(first.zip);
  const manifest = JSON.parse(files.get('manifest.json')!.toString('utf8')) as {
    inputs: { key: string; kind: string; version: string }[];
    files: { path: string; dependsOn: string[] }[];
  };
  const engine = manifest.inputs.find((i) => i.kind === 'engine')!;
  const library = manifest.inputs.find((i) => i.kind === 'geometry-library')!;
  expect(library.version).toBe(first.reports[0].geometryLibrary!.id);
  engine.version = '0.0.9';
  files.set('manifest.json', Buffer.from(JSON.stringify(manifest, null, 2) + '\n', 'utf8'));
  const r = await verifyPackage(await writeZip(files));
  expect(r.ok).toBe(false);
  expect(r.inputNotes.join(' ')).toMatch(
    /made with Foldfolio engine 0\.0\.9; this installation has \d+\.\d+\.\d+\. Files holding numbers the engine computed may differ/,
  );
  const byPath = new Map(r.files.map((f) => [f.path, f]));
  expect(byPath.get('v1/report.json')?.changedInputs).toContain('engine');
  // the model and the template copies hold nothing the engine computed
  expect(manifest.files.find((f) => f.path === 'model/v1.cif')!.dependsOn).not.toContain('engine');
  expect(byPath.get('model/v1.cif')?.changedInputs).toBeUndefined();
}, 60000);

test('a package without the model file cannot be recomputed until the model is supplied', async () => {
  const files = await readZip(first.zip);
  files.delete('model/v1.cif');
  const r = await verifyPackage(await writeZip(files));
  expect(r.ok).toBe(false);
  expect(r.files.find((f) => f.path === 'model/v1.cif')?.status).toBe('missing');
  expect(r.counts['not-recomputed']).toBe(first.files.size - 2);
});

test('verify recomputes with the template versions inside the package, not the installed ones', async () => {
  // a lab's edited torsion template (another title, so another caption) that is not installed here
  const set = builtinTemplateSet();
  const folder = new Map(set.figures.get('torsion-plot')!);
  const manifest = JSON.parse(folder.get('manifest.json')!.toString('utf8')) as {
    title: string;
    version: number;
  };
  folder.set(
    'manifest.json',
    Buffer.from(
      JSON.stringify({ ...manifest, title: 'Backbone torsions (lab edit)', version: 7 }, null, 2),
    ),
  );
  set.figures.set('torsion-plot', folder);
  const pkg = await buildPackage({
    title: 'Invented capsid domain',
    models: [{ n: 1, filename: '1A8O.cif', bytes: MODEL }],
    includeModel: true,
    anonymise: true,
    templates: set,
  });
  const files = await readZip(pkg.zip);
  expect(files.get('templates/figures/torsion-plot/manifest.json')!.toString('utf8')).toContain(
    'lab edit',
  );
  expect(
    files
      .get('v1/figures/torsion-plot.svg')!
      .equals(first.files.get('v1/figures/torsion-plot.svg')!),
  ).toBe(false);
  const r = await verifyPackage(pkg.zip);
  expect(r.files.filter((f) => f.status !== 'identical')).toEqual([]);
  expect(r.ok).toBe(true);
}, 60000);

test('the anonymisation guard names the file that would reveal a member, by whole words only', () => {
  const files = new Map([
    ['README.md', Buffer.from('Analysed by the engine; Anatomy of a fold.\n')],
    ['model/v1.cif', Buffer.from("_audit_author.name 'Lund, Ana'\n")],
  ]);
  // "Ana" inside "Analysed"/"Anatomy" is not a name; the author record in the model is
  expect(() => checkAnonymous(files, ['Ana'])).toThrow(
    /would reveal "Ana" in model\/v1\.cif\. Remove it from the model file/,
  );
  files.delete('model/v1.cif');
  expect(() => checkAnonymous(files, ['Ana', 'a.lund@fen-lab.example'])).not.toThrow();
  // on a real (non-anonymised) package: a name it does not hold passes, its preparer is found
  expect(() => checkAnonymous(first.files, ['Marrowdale'])).not.toThrow();
  expect(() => checkAnonymous(first.files, ['Ada Quillfeather'])).toThrow(/in README\.md/);
});

/** A zip whose entry name is patched after writing (yazl itself refuses unsafe names). */
async function zipWithName(safe: string, evil: string, mode?: number): Promise<Buffer> {
  expect(safe.length).toBe(evil.length);
  const z = new yazl.ZipFile();
  z.addBuffer(Buffer.from('{}'), 'manifest.json');
  z.addBuffer(Buffer.from('payload'), safe, mode ? { mode } : {});
  z.end();
  const chunks: Buffer[] = [];
  for await (const c of z.outputStream) chunks.push(c as Buffer);
  const buf = Buffer.concat(chunks);
  let i = buf.indexOf(safe);
  while (i >= 0) {
    buf.write(evil, i, 'latin1');
    i = buf.indexOf(safe, i + 1);
  }
  return buf;
}

test('zip safety: verify refuses entries with "..", absolute paths and symlinks; limits stop bombs', async () => {
  await expect(verifyPackage(await zipWithName('aa/evil.txt', '../evil.txt'))).rejects.toThrow(
    /"\.\.\/evil\.txt" is refused: it climbs out of its folder/,
  );
  await expect(verifyPackage(await zipWithName('xetc/passwd', '/etc/passwd'))).rejects.toThrow(
    /"\/etc\/passwd" is refused: it is an absolute path/,
  );
  await expect(
    verifyPackage(await zipWithName('v1/link.svg', 'v1/link.svg', 0o120777)),
  ).rejects.toThrow(/symbolic link/);
  // 20 MB of zeros deflates to ~20 kB: refused by its declared size before inflating
  const bomb = await writeZip(new Map([['manifest.json', Buffer.alloc(20 * 1024 * 1024)]]));
  expect(bomb.length).toBeLessThan(100 * 1024);
  await expect(
    verifyPackage(bomb, {
      limits: { maxEntries: 10, maxEntryBytes: 1024 * 1024, maxTotalBytes: 2 * 1024 * 1024 },
    }),
  ).rejects.toThrow(ZipSafetyError);
  await expect(readZip(Buffer.from('not a zip at all'))).rejects.toThrow(
    /not a readable zip archive/,
  );
  // and we never write such names ourselves
  await expect(writeZip(new Map([['../x', Buffer.from('x')]]))).rejects.toThrow(/climbs out/);
  await expect(writeZip(new Map([['/x', Buffer.from('x')]]))).rejects.toThrow(/absolute/);
});
