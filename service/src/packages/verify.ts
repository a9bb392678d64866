/**
 * Verify a review package: every entry against manifest.json (hashes catch tampering), then
 * rebuild the whole package from the model inside it (or one supplied beside it) with the
 * recorded template versions, and compare file by file.
 */
import {
  buildPackage,
  PACKAGE_SCHEMA,
  sha256,
  builtinTemplateSet,
  folderSha,
  presetInput,
  type TemplateFolder,
  type TemplateSet,
  type Manifest,
  type PackageModelInput,
} from './build.js';
import type { MethodsForm } from '../tables/values.js';
import { DEFAULT_READ_LIMITS, readZip, type ReadLimits } from './zip.js';

export type FileStatus = 'identical' | 'different' | 'missing' | 'unexpected' | 'not-recomputed';

export interface FileResult {
  path: string;
  status: FileStatus;
  /** what differs, or why the file could not be recomputed */
  detail?: string;
  /** an input this file depends on differs from the recorded one */
  changedInputs?: string[];
}

export interface VerifyResult {
  ok: boolean;
  title: string;
  /** one sentence per input that differs from what the manifest records */
  inputNotes: string[];
  files: FileResult[];
  counts: Record<FileStatus, number>;
}

export class PackageVerifyError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'PackageVerifyError';
  }
}

const TEXT = /\.(json|csv|md|html|tex|svg|txt)$/;

const INPUT_WORDS = {
  engine: 'Foldfolio engine',
  reference: 'reference data',
  'geometry-library': 'side-chain geometry library',
} as const;

/** First difference between two files, in words. */
export function describeDifference(path: string, expected: Buffer, actual: Buffer): string {
  if (TEXT.test(path)) {
    const a = expected.toString('utf8').split('\n');
    const b = actual.toString('utf8').split('\n');
    const n = Math.max(a.length, b.length);
    let diffLines = 0;
    let first = -1;
    for (let i = 0; i < n; i++)
      if (a[i] !== b[i]) {
        diffLines++;
        if (first < 0) first = i;
      }
    const cut = (s: string | undefined) =>
      s === undefined ? '(no line)' : JSON.stringify(s.length > 120 ? `${s.slice(0, 117)}...` : s);
    return `${diffLines} line(s) differ; first at line ${first + 1}: recomputed ${cut(a[first])}, package ${cut(b[first])}.`;
  }
  let i = 0;
  while (i < expected.length && i < actual.length && expected[i] === actual[i]) i++;
  return `recomputed ${expected.length} bytes, package ${actual.length} bytes; first difference at byte ${i}.`;
}

export interface VerifyOptions {
  /** a model file supplied beside the package; used for every model version it records */
  model?: { filename: string; bytes: Buffer };
  limits?: ReadLimits;
}

export async function verifyPackage(
  zipBytes: Buffer,
  opts: VerifyOptions = {},
): Promise<VerifyResult> {
  const entries = await readZip(zipBytes, opts.limits ?? DEFAULT_READ_LIMITS);
  const manifestBytes = entries.get('manifest.json');
  if (!manifestBytes)
    throw new PackageVerifyError(
      'The archive has no manifest.json, so it is not a Foldfolio review package; check that you chose the right file.',
    );
  let manifest: Manifest;
  try {
    manifest = JSON.parse(manifestBytes.toString('utf8')) as Manifest;
  } catch {
    throw new PackageVerifyError(
      'manifest.json is not valid JSON; the package was altered. Ask its sender for a fresh copy.',
    );
  }
  if (
    manifest.schema !== PACKAGE_SCHEMA ||
    !Array.isArray(manifest.files) ||
    !Array.isArray(manifest.inputs)
  )
    throw new PackageVerifyError(
      `manifest.json is not a ${PACKAGE_SCHEMA} manifest; this Foldfolio cannot check it.`,
    );

  const results = new Map<string, FileResult>();
  // 1. entries against the manifest
  for (const f of manifest.files) {
    const got = entries.get(f.path);
    if (!got)
      results.set(f.path, {
        path: f.path,
        status: 'missing',
        detail: 'listed in manifest.json but not in the archive.',
      });
    else if (sha256(got) !== f.sha256)
      results.set(f.path, {
        path: f.path,
        status: 'different',
        detail:
          'its SHA-256 does not match manifest.json: the file was changed after the package was built.',
      });
  }
  const listed = new Set(manifest.files.map((f) => f.path));
  for (const p of entries.keys())
    if (p !== 'manifest.json' && !listed.has(p))
      results.set(p, {
        path: p,
        status: 'unexpected',
        detail: 'in the archive but not listed in manifest.json.',
      });

  // 2. inputs: model(s) and templates as recorded
  const inputNotes: string[] = [];
  const changed = new Set<string>();
  const stale = new Set<string>();
  // templates: the ones inside the package (recorded versions), else the built-in ones when
  // they are byte-identical to what was recorded
  const builtin = builtinTemplateSet();
  const set: TemplateSet = { figures: new Map(), tables: new Map() };
  for (const i of manifest.inputs) {
    if (i.kind !== 'figure-template' && i.kind !== 'table-template') continue;
    const target = i.kind === 'figure-template' ? set.figures : set.tables;
    let folder: TemplateFolder | undefined;
    if (i.path) {
      folder = new Map();
      for (const [p, b] of entries)
        if (p.startsWith(i.path) && !p.slice(i.path.length).includes('/'))
          folder.set(p.slice(i.path.length), b);
      if (folder.size === 0) folder = undefined;
      else if (folderSha(folder) !== i.sha256) {
        changed.add(i.key);
        inputNotes.push(
          `The ${i.kind} ${i.id} inside the package is not the one recorded in manifest.json; files drawn with it are recomputed with the changed copy.`,
        );
      }
    }
    if (!folder) {
      const b = (i.kind === 'figure-template' ? builtin.figures : builtin.tables).get(i.id);
      if (b && folderSha(b) === i.sha256) folder = b;
    }
    if (!folder) {
      stale.add(i.key);
      inputNotes.push(
        `${i.kind} ${i.id} version ${i.version} is neither in the package nor installed here; files made with it cannot be recomputed.`,
      );
      continue;
    }
    target.set(i.id, folder);
  }
  // the authors' methods-form entries, as recorded in the package
  const forms = new Map<number, MethodsForm>();
  for (const i of manifest.inputs.filter((x) => x.kind === 'form')) {
    const b = i.path ? entries.get(i.path) : undefined;
    if (!b) continue;
    if (sha256(b) !== i.sha256) {
      changed.add(i.key);
      inputNotes.push(
        `The methods form of version ${i.version} is not the one recorded in manifest.json; the tables are recomputed with the changed copy.`,
      );
    }
    try {
      forms.set(Number(i.version), JSON.parse(b.toString('utf8')) as MethodsForm);
    } catch {
      inputNotes.push(
        `The methods form of version ${i.version} is not valid JSON; the tables are recomputed without it.`,
      );
    }
  }
  const preset = presetInput();
  for (const i of manifest.inputs.filter((x) => x.kind === 'preset')) {
    if (i.key !== preset.key || i.sha256 !== preset.sha256) {
      stale.add(i.key);
      inputNotes.push(
        `The figure preset ${i.id} version ${i.version} differs from this Foldfolio's (version ${preset.version}); figures cannot be recomputed byte for byte.`,
      );
    }
  }
  const models: PackageModelInput[] = [];
  let modelMissing = false;
  for (const i of manifest.inputs.filter((x) => x.kind === 'model')) {
    const n = Number(i.version);
    let bytes: Buffer | undefined;
    if (opts.model) bytes = opts.model.bytes;
    else if (i.path) bytes = entries.get(i.path);
    if (!bytes) {
      modelMissing = true;
      inputNotes.push(
        `Model version ${i.version} is not in the package; pass the model file with --model (or choose it on the Verify page) to recompute.`,
      );
      continue;
    }
    if (sha256(bytes) !== i.sha256) {
      changed.add(i.key);
      inputNotes.push(
        `The model used for version ${i.version} (sha256 ${sha256(bytes).slice(0, 12)}…) is not the one recorded (sha256 ${i.sha256.slice(0, 12)}…); every file computed from it is compared anyway.`,
      );
    }
    models.push({ n, filename: i.filename ?? '', bytes });
  }

  // 3. rebuild and compare
  if (!modelMissing && models.length > 0) {
    const rebuilt = await buildPackage({
      title: manifest.title,
      models,
      includeModel: manifest.includesModel,
      anonymise: manifest.anonymised,
      preparedBy: manifest.preparedBy,
      templates: set,
      forms,
    });
    // engine, reference data and side-chain library: recorded vs. this installation's
    for (const kind of ['engine', 'reference', 'geometry-library'] as const) {
      const was = manifest.inputs.find((x) => x.kind === kind);
      const now = rebuilt.manifest.inputs.find((x) => x.kind === kind);
      if (!was || (now && now.version === was.version && now.sha256 === was.sha256)) continue;
      changed.add(was.key);
      inputNotes.push(
        `The package was made with ${INPUT_WORDS[kind]} ${was.version}${was.sha256 ? ` (sha256 ${was.sha256.slice(0, 12)}…)` : ''}; this installation has ${now ? `${now.version}${now.sha256 ? ` (sha256 ${now.sha256.slice(0, 12)}…)` : ''}` : 'none'}. Files holding numbers the engine computed may differ for that reason alone.`,
      );
    }
    const deps = new Map(manifest.files.map((f) => [f.path, f.dependsOn]));
    const all = new Set([...rebuilt.files.keys(), ...manifest.files.map((f) => f.path)]);
    for (const p of [...all].sort()) {
      if (p === 'manifest.json') continue;
      const d = deps.get(p) ?? [];
      const changedInputs = d.filter((k) => changed.has(k));
      const staleInputs = d.filter((k) => stale.has(k));
      const prior = results.get(p);
      const extra = changedInputs.length ? { changedInputs } : {};
      if (prior && prior.status === 'unexpected') continue;
      if (prior && prior.status === 'missing') continue;
      const pkg = entries.get(p);
      const fresh = rebuilt.files.get(p);
      if (!fresh && staleInputs.length && !prior) {
        results.set(p, {
          path: p,
          status: 'not-recomputed',
          detail: `made with ${staleInputs.join(', ')}, which is neither in the package nor installed here.`,
          ...extra,
        });
        continue;
      }
      if (!fresh) {
        if (!prior)
          results.set(p, {
            path: p,
            status: 'different',
            detail: 'the recomputation produces no such file.',
            ...extra,
          });
        continue;
      }
      if (!pkg) {
        results.set(p, {
          path: p,
          status: 'missing',
          detail: 'the recomputation produces this file but the package has none.',
          ...extra,
        });
        continue;
      }
      if (staleInputs.length && !fresh.equals(pkg)) {
        results.set(p, {
          path: p,
          status: 'not-recomputed',
          detail: `made with ${staleInputs.join(', ')}, which this Foldfolio does not have.`,
          ...extra,
        });
        continue;
      }
      if (fresh.equals(pkg)) {
        if (!prior) results.set(p, { path: p, status: 'identical', ...extra });
      } else {
        const what = describeDifference(p, fresh, pkg);
        results.set(p, {
          path: p,
          status: 'different',
          detail: prior ? `${prior.detail} Recomputed: ${what}` : what,
          ...extra,
        });
      }
    }
    // the manifest itself: recomputed inputs and hashes must match too
    const freshManifest = rebuilt.files.get('manifest.json')!;
    results.set(
      'manifest.json',
      freshManifest.equals(manifestBytes)
        ? { path: 'manifest.json', status: 'identical' }
        : {
            path: 'manifest.json',
            status: 'different',
            detail: describeDifference('manifest.json', freshManifest, manifestBytes),
          },
    );
  } else {
    for (const f of manifest.files)
      if (!results.has(f.path))
        results.set(f.path, {
          path: f.path,
          status: 'not-recomputed',
          detail: 'hash matches manifest.json; no model to recompute from.',
        });
  }
  const files = [...results.values()].sort((a, b) => (a.path < b.path ? -1 : 1));
  const counts: Record<FileStatus, number> = {
    identical: 0,
    different: 0,
    missing: 0,
    unexpected: 0,
    'not-recomputed': 0,
  };
  for (const f of files) counts[f.status]++;
  return {
    ok: files.every((f) => f.status === 'identical') && inputNotes.length === 0,
    title: manifest.title,
    inputNotes,
    files,
    counts,
  };
}

/** Human-readable lines for the CLI. */
export function formatVerifyResult(r: VerifyResult): string {
  const L: string[] = [`package: ${r.title}`];
  for (const n of r.inputNotes) L.push(`note: ${n}`);
  for (const f of r.files) {
    const inputs = f.changedInputs?.length
      ? ` [depends on changed ${f.changedInputs.join(', ')}]`
      : '';
    L.push(`${f.status.padEnd(14)} ${f.path}${f.detail ? ` — ${f.detail}` : ''}${inputs}`);
  }
  L.push(
    `${r.counts.identical} identical, ${r.counts.different} different, ${r.counts.missing} missing, ${r.counts.unexpected} unexpected, ${r.counts['not-recomputed']} not recomputed: ${r.ok ? 'VERIFIED' : 'NOT VERIFIED'}`,
  );
  return L.join('\n') + '\n';
}
