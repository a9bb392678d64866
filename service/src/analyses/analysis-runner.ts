import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { Worker as Thread } from 'node:worker_threads';
import type { AnalysisStage, Report } from '@foldfolio/shared';
import { runEngine } from './engine.js';

export interface EngineJob {
  bytes: Uint8Array;
  filename: string;
  sha256: string;
  onStage: (stage: AnalysisStage, fraction: number) => void;
}

/**
 * Runs the engine in a worker thread when the compiled thread script is present (the built
 * service), otherwise in this thread (tests running from the TypeScript sources).
 */
export async function analyse(job: EngineJob): Promise<Report> {
  const script = fileURLToPath(new URL('./engine-thread.js', import.meta.url));
  if (!existsSync(script)) return runEngine(job.bytes, job);
  return new Promise<Report>((resolve, reject) => {
    const thread = new Thread(script, {
      workerData: { bytes: job.bytes, filename: job.filename, sha256: job.sha256 },
    });
    let settled = false;
    thread.on(
      'message',
      (msg: {
        kind: string;
        stage?: AnalysisStage;
        fraction?: number;
        json?: string;
        message?: string;
        name?: string;
      }) => {
        if (msg.kind === 'stage' && msg.stage) job.onStage(msg.stage, msg.fraction ?? 0);
        else if (msg.kind === 'done' && msg.json !== undefined) {
          settled = true;
          resolve(JSON.parse(msg.json) as Report);
          void thread.terminate();
        } else if (msg.kind === 'error') {
          settled = true;
          const err = new Error(msg.message);
          err.name = msg.name ?? 'Error';
          reject(err);
          void thread.terminate();
        }
      },
    );
    thread.on('error', (err) => {
      if (!settled) reject(err);
      settled = true;
    });
    thread.on('exit', (code) => {
      if (!settled)
        reject(
          new Error(
            `The analysis stopped unexpectedly (engine thread exit ${code}). It will be retried.`,
          ),
        );
      settled = true;
    });
  });
}
