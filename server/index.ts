import { loadConfig } from './config';
import { startServer } from './server';

const running = await startServer(loadConfig());
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
  process.once(signal, () => {
    void running.close().then(() => process.exit(0));
  });
}
