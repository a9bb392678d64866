// The analysis worker process: `node service/dist/worker.js`. Start as many as you like, on
// this machine or others, against the same Redis and MariaDB (see DEVELOPERS.md).
import { Logger } from '@nestjs/common';
import { loadConfig } from './config/app-config.js';
import { startAnalysisWorker } from './analyses/worker-runtime.js';
import { startPackageWorker } from './packages/worker-runtime.js';

const log = new Logger('Worker');
const cfg = loadConfig();
const running = await startAnalysisWorker(cfg);
// review packages (issue 7) share the worker processes: one queue each, same Redis prefix
const packages = await startPackageWorker(cfg);
packages.worker.on('failed', (job, err) =>
  log.warn(`review package ${job?.id} failed: ${err.message}`),
);
log.log(
  `analysis worker ${process.pid} listening on Redis ${cfg.redis.host}:${cfg.redis.port}, database ${cfg.db.database}`,
);
running.worker.on('completed', (job) => log.log(`analysis of version ${job.id} done`));
running.worker.on('failed', (job, err) =>
  log.warn(`analysis of version ${job?.id} failed: ${err.message}`),
);

let stopping = false;
const stop = () => {
  if (stopping) return;
  stopping = true;
  // finish (or hand back) the current job, then leave
  void Promise.all([running.close(), packages.close()]).then(() => process.exit(0));
  // a job cut short is taken up again by another worker once its lock expires: a bounded wait is safe
  setTimeout(() => process.exit(0), 5000).unref();
};
for (const signal of ['SIGINT', 'SIGTERM'] as const) process.on(signal, stop);
// Forked by the service (worker-supervisor.ts): leave with it, even if it was killed outright,
// so no worker outlives its service.
if (process.send) process.on('disconnect', stop);
