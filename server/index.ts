import { startCluster } from './cluster';
import { loadConfig } from './config';
import { startServer } from './server';

// WEB_CONCURRENCY workers (default: one per CPU); with one, a single process does everything.
const config = loadConfig();
const running = config.webConcurrency > 1 ? await startCluster(process.env, config.webConcurrency) : await startServer(config);
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
  process.once(signal, () => {
    void running.close().then(() => process.exit(0));
  });
}
