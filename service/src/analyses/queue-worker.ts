import { type Job, Worker } from 'bullmq';
import { DataSource } from 'typeorm';
import type { AppConfig } from '../config/app-config.js';
import { dataSourceOptions } from '../database.js';
import type { BlobStore } from '../storage/blob-store.js';
import { FsBlobStore } from '../storage/fs-blob-store.js';
import { storageSettings } from '../storage/storage.module.js';
import { queuePrefix, redisConnection, workerSettings } from './queue.js';

export interface RunningQueueWorker<T> {
  worker: Worker<T>;
  db: DataSource;
  close(): Promise<void>;
}

export interface QueueWorkerSpec<T> {
  queue: string;
  /** jobs this process runs at once */
  concurrency: number;
  process(db: DataSource, store: BlobStore, job: Job<T>): Promise<unknown>;
  /** records a failed run (retry pending or final) in the database */
  recordFailure(db: DataSource, job: Job<T> | undefined, err: Error): Promise<void>;
}

/**
 * Starts a BullMQ worker on `spec.queue` with its own database connection and blob store; the
 * analyses and packages workers differ only in what they process and how they record failures.
 */
export async function startQueueWorker<T>(
  cfg: AppConfig,
  spec: QueueWorkerSpec<T>,
): Promise<RunningQueueWorker<T>> {
  const settings = workerSettings();
  const db = new DataSource({ ...dataSourceOptions(cfg), migrationsRun: false });
  await db.initialize();
  const store = new FsBlobStore(storageSettings(cfg).root);
  const worker = new Worker<T>(spec.queue, (job) => spec.process(db, store, job), {
    connection: redisConnection(cfg),
    prefix: queuePrefix(cfg),
    concurrency: spec.concurrency,
    lockDuration: settings.lockDurationMs,
    stalledInterval: settings.stalledIntervalMs,
    // a job whose worker died is retried this many times before it is failed
    maxStalledCount: settings.attempts,
  });
  worker.on('failed', (job, err) => {
    void spec.recordFailure(db, job, err).catch(() => undefined);
  });
  await worker.waitUntilReady();
  return {
    worker,
    db,
    async close() {
      await worker.close();
      await db.destroy();
    },
  };
}
