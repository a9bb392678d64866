import type { ConnectionOptions } from 'bullmq';
import type { AppConfig } from '../config/app-config.js';

export const ANALYSIS_QUEUE = 'analyses';

/** What one analysis job carries; the job id is the model version id (one job per version). */
export interface AnalysisJobData {
  modelVersionId: string;
}

/**
 * Each database gets its own queue namespace, so a worker only ever sees jobs of the database it
 * writes to (the e2e tests give every file its own database on the same Redis).
 */
export function queuePrefix(cfg: AppConfig): string {
  return `foldfolio:${cfg.db.database}`;
}

export function redisConnection(cfg: AppConfig): ConnectionOptions {
  // BullMQ workers need maxRetriesPerRequest null (blocking commands must not time out).
  return { host: cfg.redis.host, port: cfg.redis.port, maxRetriesPerRequest: null };
}

/** Tunables of the worker, from the environment (documented in DEVELOPERS.md). */
export interface WorkerSettings {
  concurrency: number;
  /** ms a job's lock lives without renewal; a crashed worker's job is taken over after it */
  lockDurationMs: number;
  /** ms between checks for jobs whose lock expired */
  stalledIntervalMs: number;
  /** runs of one job allowed (first run + retries after failures or crashes) */
  attempts: number;
}

function positive(env: NodeJS.ProcessEnv, name: string, fallback: number): number {
  const raw = env[name];
  if (raw === undefined || raw === '') return fallback;
  const n = Number(raw);
  if (!Number.isInteger(n) || n <= 0) {
    throw new Error(`${name} must be a positive whole number; it is "${raw}". Fix or unset it.`);
  }
  return n;
}

export function workerSettings(env: NodeJS.ProcessEnv = process.env): WorkerSettings {
  return {
    // one analysis at a time per process: the engine is CPU-bound and these machines have 2 cores
    concurrency: positive(env, 'FOLDFOLIO_WORKER_CONCURRENCY', 1),
    // 30 s lock / 15 s stalled check: BullMQ's defaults are 30 s / 30 s; the engine runs in a
    // worker thread so the lock keeps being renewed during long analyses.
    lockDurationMs: positive(env, 'FOLDFOLIO_WORKER_LOCK_MS', 30000),
    stalledIntervalMs: positive(env, 'FOLDFOLIO_WORKER_STALLED_MS', 15000),
    attempts: positive(env, 'FOLDFOLIO_ANALYSIS_ATTEMPTS', 3),
  };
}
