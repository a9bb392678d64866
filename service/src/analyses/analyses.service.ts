import {
  Inject,
  Injectable,
  Logger,
  NotFoundException,
  type OnApplicationBootstrap,
  type OnModuleDestroy,
} from '@nestjs/common';
import { InjectRepository } from '@nestjs/typeorm';
import { Queue, QueueEvents } from 'bullmq';
import { EventEmitter } from 'node:events';
import { gunzipSync } from 'node:zlib';
import { Repository } from 'typeorm';
import type { AnalysisDto, Report } from '@foldfolio/shared';
import { APP_CONFIG, type AppConfig } from '../config/app-config.js';
import { Analysis } from './analysis.entity.js';
import {
  ANALYSIS_QUEUE,
  type AnalysisJobData,
  queuePrefix,
  redisConnection,
  workerSettings,
} from './queue.js';
import { SUMMARY_KEYS } from './summary.js';

export type AnalysisOutcome = { modelVersionId: string; status: 'done' | 'failed'; error?: string };

/** The API side of analyses: enqueue, read state and reports, hear when runs finish. */
@Injectable()
export class AnalysesService implements OnApplicationBootstrap, OnModuleDestroy {
  private readonly log = new Logger('Analyses');
  private queue: Queue<AnalysisJobData> | null = null;
  private events: QueueEvents | null = null;
  /** 'finished' (AnalysisOutcome) — notifications listen here */
  readonly finished = new EventEmitter();

  constructor(
    @Inject(APP_CONFIG) private readonly cfg: AppConfig,
    @InjectRepository(Analysis) private readonly analyses: Repository<Analysis>,
  ) {}

  private getQueue(): Queue<AnalysisJobData> {
    this.queue ??= new Queue<AnalysisJobData>(ANALYSIS_QUEUE, {
      connection: redisConnection(this.cfg),
      prefix: queuePrefix(this.cfg),
    });
    return this.queue;
  }

  async onApplicationBootstrap(): Promise<void> {
    this.events = new QueueEvents(ANALYSIS_QUEUE, {
      connection: redisConnection(this.cfg),
      prefix: queuePrefix(this.cfg),
    });
    this.events.on('completed', ({ jobId }) => {
      this.finished.emit('finished', { modelVersionId: jobId, status: 'done' } as AnalysisOutcome);
    });
    this.events.on('failed', ({ jobId, failedReason }) => void this.onFailed(jobId, failedReason));
    try {
      await this.events.waitUntilReady();
      // Versions stored while Redis was down are queued now (the job id makes this idempotent).
      const waiting = await this.analyses.find({
        where: [{ status: 'queued' }, { status: 'running' }],
      });
      for (const a of waiting) await this.enqueue(a.modelVersionId);
    } catch (err) {
      this.log.warn(`queue not reachable at start: ${(err as Error).message}`);
    }
  }

  private async onFailed(jobId: string, reason: string): Promise<void> {
    const job = await this.getQueue().getJob(jobId);
    const state = job ? await job.getState() : 'failed';
    if (state !== 'failed') return; // retried: not final yet
    await this.analyses.query(
      "UPDATE analyses SET status = 'failed', stage = NULL, error = ?, finished_at = NOW(3) WHERE model_version_id = ? AND status <> 'done'",
      [reason.slice(0, 4000), jobId],
    );
    this.finished.emit('finished', {
      modelVersionId: jobId,
      status: 'failed',
      error: reason,
    } as AnalysisOutcome);
  }

  async onModuleDestroy(): Promise<void> {
    await this.events?.close();
    await this.queue?.close();
  }

  /** Queues the analysis of a version; the job id is the version id, so it is queued once. */
  async enqueue(modelVersionId: string): Promise<void> {
    const s = workerSettings();
    await this.getQueue().add(
      'analyse',
      { modelVersionId },
      {
        jobId: modelVersionId,
        attempts: s.attempts,
        backoff: { type: 'exponential', delay: 2000 },
        removeOnComplete: { age: 24 * 3600 },
        removeOnFail: { age: 7 * 24 * 3600 },
      },
    );
  }

  async get(modelVersionId: string): Promise<Analysis | null> {
    return this.analyses.findOneBy({ modelVersionId });
  }

  /** The stored gzip of the report JSON, exactly as the worker wrote it. */
  async reportGzip(modelVersionId: string): Promise<Buffer> {
    const row = await this.analyses
      .createQueryBuilder('a')
      .addSelect('a.reportGz')
      .where('a.modelVersionId = :id', { id: modelVersionId })
      .getOne();
    if (!row || row.status !== 'done' || !row.reportGz) {
      throw new NotFoundException(
        'This version has no finished analysis yet. Wait for the progress bar to complete, or re-upload if it failed.',
      );
    }
    return row.reportGz;
  }

  async report(modelVersionId: string): Promise<Report> {
    const gz = await this.reportGzip(modelVersionId);
    return JSON.parse(gunzipSync(gz).toString('utf8')) as Report;
  }
}

export function analysisDto(a: Analysis | null): AnalysisDto | null {
  if (!a) return null;
  const summary =
    a.status === 'done' ? Object.fromEntries(SUMMARY_KEYS.map((k) => [k, a[k]])) : null;
  return {
    status: a.status,
    stage: a.stage,
    progress: a.progress,
    attempts: a.attempts,
    error: a.error,
    engineVersion: a.engineVersion,
    queuedAt: a.queuedAt.toISOString(),
    startedAt: a.startedAt?.toISOString() ?? null,
    finishedAt: a.finishedAt?.toISOString() ?? null,
    summary: summary as AnalysisDto['summary'],
    reportSha256: a.reportSha256,
  };
}
