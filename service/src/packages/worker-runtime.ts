import { Readable } from 'node:stream';
import { Job, UnrecoverableError } from 'bullmq';
import { DataSource } from 'typeorm';
import { type RunningQueueWorker, startQueueWorker } from '../analyses/queue-worker.js';
import type { AppConfig } from '../config/app-config.js';
import type { BlobStore } from '../storage/blob-store.js';
import { newId } from '../common/tokens.js';
import type { MethodsForm } from '../tables/values.js';
import {
  buildPackage,
  builtinTemplateSet,
  PackageBuildError,
  pinnedFolder,
  type TemplateSet,
} from './build.js';
import { PACKAGE_QUEUE, type PackageJobData } from './queue.js';

export type RunningPackageWorker = RunningQueueWorker<PackageJobData>;

async function audit(
  db: DataSource,
  manuscriptId: string,
  packageId: string,
  action: string,
  detail: string,
): Promise<void> {
  await db.query(
    'INSERT INTO package_audit_events (id, manuscript_id, package_id, action, detail) VALUES (?, ?, ?, ?, ?)',
    [newId(), manuscriptId, packageId, action, detail.slice(0, 300)],
  );
}

/**
 * The manuscript's pinned template versions (built-in where nothing is pinned) and the saved
 * methods-form entries of each chosen version (tables of the templates module, issue 5).
 */
export async function manuscriptTemplates(
  db: DataSource,
  manuscriptId: string,
  versions: { id: string; n: number }[],
): Promise<{ templates: TemplateSet; forms: Map<number, MethodsForm> }> {
  const templates = builtinTemplateSet();
  const pins = (await db.query(
    `SELECT p.template_key, p.template_id, p.n, v.body FROM template_pins p
       JOIN template_versions v ON v.template_id = p.template_id AND v.n = p.n
     WHERE p.manuscript_id = ?`,
    [manuscriptId],
  )) as { template_key: string; template_id: string; n: number; body: string }[];
  for (const p of pins) {
    const ref = `${p.template_id}@${p.n}`;
    const fig = templates.figures.get(p.template_key);
    const tab = templates.tables.get(p.template_key);
    if (fig)
      templates.figures.set(
        p.template_key,
        pinnedFolder('figure', fig, { ref, n: p.n, body: p.body }),
      );
    else if (tab)
      templates.tables.set(
        p.template_key,
        pinnedFolder('table', tab, { ref, n: p.n, body: p.body }),
      );
  }
  const forms = new Map<number, MethodsForm>();
  if (versions.length) {
    const rows = (await db.query(
      `SELECT model_version_id, values_json FROM methods_forms WHERE model_version_id IN (${versions.map(() => '?').join(',')})`,
      versions.map((v) => v.id),
    )) as { model_version_id: string; values_json: string }[];
    for (const r of rows) {
      const v = versions.find((x) => x.id === r.model_version_id);
      if (v) forms.set(v.n, JSON.parse(r.values_json) as MethodsForm);
    }
  }
  return { templates, forms };
}

/** Builds one package: model bytes from the store, zip back into it, progress on the row. */
export async function processPackage(
  db: DataSource,
  store: BlobStore,
  job: Job<PackageJobData>,
): Promise<void> {
  const id = job.data.packageId;
  const claim: { affectedRows?: number } = await db.query(
    "UPDATE review_packages SET status = 'building', progress = 1, step = 'starting', error = NULL WHERE id = ? AND status IN ('queued', 'building')",
    [id],
  );
  if (!claim.affectedRows) return;
  const [pkg] = (await db.query(
    'SELECT manuscript_id, model_version_ids, include_model, anonymised FROM review_packages WHERE id = ?',
    [id],
  )) as {
    manuscript_id: string;
    model_version_ids: string;
    include_model: number;
    anonymised: number;
  }[];
  const manuscriptId = pkg.manuscript_id;
  const versionIds = JSON.parse(pkg.model_version_ids) as string[];
  const versions = (await db.query(
    `SELECT id, n, sha256, filename FROM model_versions WHERE manuscript_id = ? AND id IN (${versionIds.map(() => '?').join(',')}) ORDER BY n`,
    [manuscriptId, ...versionIds],
  )) as { id: string; n: number; sha256: string; filename: string }[];
  if (versions.length !== versionIds.length)
    throw new UnrecoverableError(
      'A chosen model version no longer exists; build the package again.',
    );
  const [ms] = (await db.query('SELECT title FROM manuscripts WHERE id = ?', [manuscriptId])) as {
    title: string;
  }[];
  const people = (await db.query(
    `SELECT u.display_name, u.email, m.role FROM memberships m JOIN users u ON u.id = m.user_id
     WHERE m.manuscript_id = ? ORDER BY m.role = 'owner' DESC, m.created_at, u.id`,
    [manuscriptId],
  )) as { display_name: string; email: string; role: string }[];
  const comments = (await db.query('SELECT body_md FROM comments WHERE manuscript_id = ?', [
    manuscriptId,
  ])) as { body_md: string }[];
  const models = [];
  for (const v of versions)
    models.push({ n: v.n, filename: v.filename, bytes: await store.read(v.sha256) });

  const { templates, forms } = await manuscriptTemplates(db, manuscriptId, versions);

  let lastWrite = 0;
  const onProgress = (fraction: number, step: string) => {
    const now = Date.now();
    if (now - lastWrite < 250 && fraction < 1) return;
    lastWrite = now;
    const pct = Math.max(1, Math.min(99, Math.round(fraction * 100)));
    void db
      .query(
        "UPDATE review_packages SET progress = ?, step = ? WHERE id = ? AND status = 'building'",
        [pct, step.slice(0, 200), id],
      )
      .catch(() => undefined);
    void job.updateProgress({ progress: pct, step }).catch(() => undefined);
  };
  let built;
  try {
    built = await buildPackage({
      title: ms.title,
      models,
      includeModel: !!pkg.include_model,
      anonymise: !!pkg.anonymised,
      // authors: owners and editors (commenters and reviewers are not named as preparers)
      preparedBy: people
        .filter((p) => p.role === 'owner' || p.role === 'editor')
        .map((p) => p.display_name),
      // member names and e-mails, and each line of every comment (a whole multi-line body
      // would only be caught verbatim)
      forbiddenTexts: [
        ...people.flatMap((p) => [p.display_name, p.email]),
        ...comments
          .flatMap((c) => c.body_md.split('\n'))
          .filter((l) => l.trim().length >= 20 && l.trim().split(/\s+/).length >= 4),
      ],
      onProgress,
      templates,
      forms,
    });
  } catch (err) {
    if (err instanceof PackageBuildError || (err as Error).name === 'StructureReadError')
      throw new UnrecoverableError((err as Error).message);
    throw err;
  }
  const blob = await store.put(Readable.from([built.zip]), { maxBytes: built.zip.length + 1 });
  const done: { affectedRows?: number } = await db.query(
    `UPDATE review_packages SET status = 'done', progress = 100, step = NULL, zip_sha256 = ?, size_bytes = ?,
       manifest_json = ?, finished_at = NOW(3) WHERE id = ? AND status = 'building'`,
    [blob.sha256, built.zip.length, JSON.stringify(built.manifest), id],
  );
  if (done.affectedRows)
    await audit(
      db,
      manuscriptId,
      id,
      'package-built',
      `${built.files.size} files, sha256 ${blob.sha256}`,
    );
}

async function recordFailure(db: DataSource, job: Job<PackageJobData> | undefined, err: Error) {
  if (!job) return;
  const final = err instanceof UnrecoverableError || job.attemptsMade >= (job.opts.attempts ?? 1);
  if (!final) {
    await db.query(
      "UPDATE review_packages SET status = 'queued' WHERE id = ? AND status = 'building'",
      [job.data.packageId],
    );
    return;
  }
  await db.query(
    "UPDATE review_packages SET status = 'failed', step = NULL, error = ?, finished_at = NOW(3) WHERE id = ? AND status <> 'done'",
    [err.message.slice(0, 4000), job.data.packageId],
  );
  const [row] = (await db.query('SELECT manuscript_id FROM review_packages WHERE id = ?', [
    job.data.packageId,
  ])) as {
    manuscript_id: string;
  }[];
  if (row) await audit(db, row.manuscript_id, job.data.packageId, 'package-failed', err.message);
}

/** Starts a BullMQ worker for the packages queue of `cfg`'s database (same Redis prefix as analyses). */
export async function startPackageWorker(cfg: AppConfig): Promise<RunningPackageWorker> {
  return startQueueWorker<PackageJobData>(cfg, {
    queue: PACKAGE_QUEUE,
    // one package at a time: figure rendering and the engine are CPU-bound
    concurrency: 1,
    process: processPackage,
    recordFailure,
  });
}
