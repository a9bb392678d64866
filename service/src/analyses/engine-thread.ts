// Runs the engine off the worker's main thread, so BullMQ keeps renewing the job's lock while a
// large model is analysed (a blocked event loop would let the lock expire and the job be taken
// over by another worker: two concurrent runs).
import { parentPort, workerData } from 'node:worker_threads';
import { runEngine } from './engine.js';

interface ThreadInput {
  bytes: Uint8Array;
  filename: string;
  sha256: string;
}

const input = workerData as ThreadInput;
runEngine(input.bytes, {
  filename: input.filename,
  sha256: input.sha256,
  onStage: (stage, fraction) => parentPort?.postMessage({ kind: 'stage', stage, fraction }),
}).then(
  (report) => parentPort?.postMessage({ kind: 'done', json: JSON.stringify(report) }),
  (err: unknown) =>
    parentPort?.postMessage({
      kind: 'error',
      message: err instanceof Error ? err.message : String(err),
      name: err instanceof Error ? err.name : 'Error',
    }),
);
