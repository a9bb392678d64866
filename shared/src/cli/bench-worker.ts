/**
 * A forked worker that runs the engine's side of a benchmark on batches of files (Node edge).
 *
 * The measuring process must not start processes itself: every process start forks the (large)
 * Node heap, and each heap page written afterwards takes a copy-on-write fault that is charged to
 * the measured code (measured here: 2.7 s CPU for the reference set without, 4.4 s with a Python
 * start between batches). So the benchmark's parent starts gemmi, and this worker, which starts
 * nothing, measures our side.
 */
import { fork, type ChildProcess } from 'node:child_process';

export class BatchWorker<R> {
  private readonly child: ChildProcess;
  private pending: ((r: R) => void) | null = null;
  private failed: ((e: Error) => void) | null = null;

  /** `script` is started with `args`; it must call `serveBatches` when it sees them. */
  constructor(script: string, args: string[]) {
    this.child = fork(script, args, { execArgv: ['--max-old-space-size=4096'] });
    this.child.on('message', (m) => {
      const done = this.pending;
      this.pending = null;
      this.failed = null;
      done?.(m as R);
    });
    this.child.on('exit', (code) => {
      this.failed?.(new Error(`the benchmark worker stopped (exit code ${String(code)})`));
      this.pending = null;
      this.failed = null;
    });
  }

  /** Runs one batch in the worker and resolves with its result. */
  run(files: string[]): Promise<R> {
    return new Promise((res, rej) => {
      this.pending = res;
      this.failed = rej;
      this.child.send(files);
    });
  }

  stop(): void {
    this.child.kill();
  }
}

/** Worker side: answers each batch of files with `fn`'s result. */
export function serveBatches<R>(fn: (files: string[]) => Promise<R>): void {
  process.on('message', (files: string[]) => {
    fn(files).then(
      (r) => process.send?.(r),
      (e: unknown) => {
        process.stderr.write(`benchmark worker: ${e instanceof Error ? e.message : String(e)}\n`);
        process.exit(2);
      },
    );
  });
}
