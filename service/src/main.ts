import { Logger } from '@nestjs/common';
import { createApp } from './app.js';
import { loadConfig } from './config/app-config.js';
import { DemoSeedService } from './seed/demo-seed.service.js';
import { superviseWorkers } from './analyses/worker-supervisor.js';

async function main(): Promise<void> {
  const cfg = loadConfig();
  const app = await createApp(cfg);
  if (cfg.seedDemo) await app.get(DemoSeedService).seed();
  await app.listen(cfg.port, '127.0.0.1');
  // analysis workers run as separate processes (FOLDFOLIO_WORKERS, default 1)
  const stopWorkers = superviseWorkers();
  process.once('exit', stopWorkers);
  // Nest's shutdown hooks end the process by re-raising the signal, so 'exit' alone would leave
  // the workers running after Ctrl-C or `kill`.
  for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP'] as const) process.once(signal, stopWorkers);
  const url = `http://127.0.0.1:${cfg.port}`;
  new Logger('Foldfolio').log(`ready: ${url}  (API ${url}/api, OpenAPI ${url}/api/docs)`);
}

main().catch((err: Error) => {
  console.error(`Foldfolio could not start: ${err.message}`);
  process.exit(1);
});
