import { hostname } from 'node:os';
import { createHash } from 'node:crypto';
import { gzipSync } from 'node:zlib';
import { Job, UnrecoverableError } from 'bullmq';
import { DataSource } from 'typeorm';
import type { AnalysisStage } from '@foldfolio/shared';
import type { AppConfig } from '../config/app-config.js';
import type { BlobStore } from '../storage/blob-store.js';
import { analyse } from './analysis-runner.js';
import { type RunningQueueWorker, startQueueWorker } from './queue-worker.js';
import { ANALYSIS_QUEUE, type AnalysisJobData, workerSettings } from './queue.js';
import { summaryColumns } from './summary.js';

// Progress (percent) at which each stage starts; the engine's own fraction moves within it.
const STAGE_START: Record<AnalysisStage, number> = {
  parse: 5,
  geometry: 30,
  overlaps: 60,
  figures: 85,
  store: 95,
};

export type RunningWorker = RunningQueueWorker<AnalysisJobData>;

/** Processes one analysis job against the database and store; exported for tests. */
export async function processAnalysis(
  db: DataSource,
  store: BlobStore,
  job: Job<AnalysisJobData>,
  workerName: string,
): Promise<void> {
  const id = job.data.modelVersionId;
  // Claim the run. A finished analysis is never redone (a duplicate delivery just returns).
  const claim: { affectedRows?: number } = await db.query(
    `UPDATE analyses SET status = 'running', stage = 'parse', progress = 1, attempts = attempts + 1,
       worker = ?, error = NULL, started_at = NOW(3) WHERE model_version_id = ? AND status IN ('queued', 'running')`,
    [workerName, id],
  );
  if (!claim.affectedRows) return;
  const rows: { sha256: string; filename: string }[] = await db.query(
    'SELECT sha256, filename FROM model_versions WHERE id = ?',
    [id],
  );
  if (rows.length === 0) throw new UnrecoverableError('The model version was deleted.');
  const { sha256, filename } = rows[0];
  const bytes = await store.read(sha256);

  let lastWrite = 0;
  let lastPct = 0;
  const setStage = (stage: AnalysisStage, fraction: number) => {
    const next = stageList(stage);
    const start = STAGE_START[stage];
    const end = next ? STAGE_START[next] : 99;
    const pct = Math.max(lastPct, Math.min(99, Math.round(start + (end - start) * fraction)));
    lastPct = pct;
    const now = Date.now();
    // at most a few writes per second: progress is for people, not a log
    if (now - lastWrite < 250 && fraction > 0) return;
    lastWrite = now;
    void db
      .query(
        "UPDATE analyses SET stage = ?, progress = ? WHERE model_version_id = ? AND status = 'running'",
        [stage, pct, id],
      )
      .catch(() => undefined);
    void job.updateProgress({ stage, progress: pct }).catch(() => undefined);
  };

  const pause = Number(process.env.FOLDFOLIO_WORKER_PAUSE_MS ?? 0);
  // Fault-injection pause (the crash test kills a worker here, mid-analysis); 0 in production.
  if (pause > 0) await new Promise((r) => setTimeout(r, pause));
  let report;
  try {
    report = await analyse({ bytes, filename, sha256, onStage: setStage });
  } catch (err) {
    // The engine refusing the file is final: retrying the same bytes gives the same answer.
    if ((err as Error).name === 'StructureReadError')
      throw new UnrecoverableError((err as Error).message);
    throw err;
  }
  setStage('store', 0);
  const json = JSON.stringify(report);
  const gz = gzipSync(Buffer.from(json, 'utf8'), { level: 9 });
  const s = summaryColumns(report);
  const result: { affectedRows?: number } = await db.query(
    `UPDATE analyses SET status = 'done', stage = NULL, progress = 100, completions = completions + 1,
       finished_at = NOW(3), engine_version = ?, reference_id = ?, report_sha256 = ?, report_gz = ?,
       atoms = ?, protein_residues = ?, rama_favored = ?, rama_allowed = ?, rama_outliers = ?, rama_total = ?,
       rotamer_outliers = ?, rotamer_total = ?, bond_rmsd = ?, bond_rmsz = ?, angle_rmsd = ?, angle_rmsz = ?,
       overlaps_per_1000 = ?, cis_peptides = ?, twisted_peptides = ?, cb_outliers = ?, d_residues = ?
     WHERE model_version_id = ? AND status = 'running'`,
    [
      report.engine.version,
      report.reference?.id ?? null,
      createHash('sha256').update(json).digest('hex'),
      gz,
      s.atoms,
      s.proteinResidues,
      s.ramaFavored,
      s.ramaAllowed,
      s.ramaOutliers,
      s.ramaTotal,
      s.rotamerOutliers,
      s.rotamerTotal,
      s.bondRmsd,
      s.bondRmsz,
      s.angleRmsd,
      s.angleRmsz,
      s.overlapsPer1000,
      s.cisPeptides,
      s.twistedPeptides,
      s.cbOutliers,
      s.dResidues,
      id,
    ],
  );
  if (!result.affectedRows) {
    throw new UnrecoverableError('The analysis was finished by another worker.');
  }
}

function stageList(stage: AnalysisStage): AnalysisStage | null {
  const order: AnalysisStage[] = ['parse', 'geometry', 'overlaps', 'figures', 'store'];
  return order[order.indexOf(stage) + 1] ?? null;
}

/** Marks the analysis failed with the engine's reason once BullMQ gives up on the job. */
async function recordFailure(db: DataSource, job: Job<AnalysisJobData> | undefined, err: Error) {
  if (!job) return;
  const final = err instanceof UnrecoverableError || job.attemptsMade >= (job.opts.attempts ?? 1);
  if (final) {
    await db.query(
      "UPDATE analyses SET status = 'failed', stage = NULL, error = ?, finished_at = NOW(3) WHERE model_version_id = ? AND status <> 'done'",
      [err.message.slice(0, 4000), job.data.modelVersionId],
    );
  } else {
    // back in the queue for another attempt
    await db.query(
      "UPDATE analyses SET status = 'queued', error = ? WHERE model_version_id = ? AND status = 'running'",
      [err.message.slice(0, 4000), job.data.modelVersionId],
    );
  }
}

/** Starts a BullMQ worker for the analyses queue of `cfg`'s database. */
export async function startAnalysisWorker(cfg: AppConfig): Promise<RunningWorker> {
  const name = `${hostname()}:${process.pid}`;
  return startQueueWorker<AnalysisJobData>(cfg, {
    queue: ANALYSIS_QUEUE,
    concurrency: workerSettings().concurrency,
    process: (db, store, job) => processAnalysis(db, store, job, name),
    recordFailure,
  });
}
