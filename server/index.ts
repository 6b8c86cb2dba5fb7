import { startCluster } from './cluster';
import { loadConfig } from './config';
import { createLogger } from './logging';
import { guardProcess, startOrExplain } from './process-guards';
import { startServer } from './server';

const config = await startOrExplain(async () => loadConfig());
guardProcess(createLogger(config));
// WEB_CONCURRENCY workers (default: one per CPU); with one, a single process does everything.
const running = await startOrExplain<{ close(): Promise<void> }>(() =>
  config.webConcurrency > 1 ? startCluster(process.env, config.webConcurrency) : startServer(config),
);
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
  process.once(signal, () => {
    void running.close().then(() => process.exit(0));
  });
}
