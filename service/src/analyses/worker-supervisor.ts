import { type ChildProcess, fork } from 'node:child_process';
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { Logger } from '@nestjs/common';

/**
 * Starts FOLDFOLIO_WORKERS analysis worker processes (default 1; 0 = none, e.g. when workers run
 * on other machines) beside the API and restarts one that dies. Each is `dist/worker.js`, the
 * same program an admin starts by hand on another machine.
 */
export function superviseWorkers(env: NodeJS.ProcessEnv = process.env): () => void {
  const log = new Logger('Workers');
  const count = Number(env.FOLDFOLIO_WORKERS ?? 1);
  const script = fileURLToPath(new URL('../worker.js', import.meta.url));
  if (!Number.isInteger(count) || count <= 0) return () => undefined;
  if (!existsSync(script)) {
    log.warn(`${script} not built: no analysis worker started (run \`npm run build\`).`);
    return () => undefined;
  }
  let stopping = false;
  const children = new Set<ChildProcess>();
  const start = () => {
    const child = fork(script, [], { env, stdio: 'inherit' });
    children.add(child);
    child.on('exit', (code, signal) => {
      children.delete(child);
      if (stopping) return;
      log.warn(`analysis worker ${child.pid} stopped (${signal ?? code}); starting another in 2 s`);
      setTimeout(() => !stopping && start(), 2000);
    });
  };
  for (let i = 0; i < count; i++) start();
  log.log(`${count} analysis worker${count > 1 ? 's' : ''} started`);
  return () => {
    stopping = true;
    for (const c of children) c.kill('SIGTERM');
  };
}
