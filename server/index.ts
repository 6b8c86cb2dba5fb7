import { loadConfig } from './config';
import { StartupError } from './errors';
import { startServer, type RunningServer } from './server';

let running: RunningServer;
try {
  running = await startServer(loadConfig());
} catch (err) {
  // A reason the operator can fix (a missing or read-only data folder, a bad setting) is one line.
  if (!(err instanceof StartupError)) throw err;
  process.stderr.write(`Voltfall cannot start: ${err.message}\n`);
  process.exit(1);
}

// Every request and background job catches its own failures; a rejection that still escapes is logged
// and the server keeps serving (the work it belonged to rolled back with its transaction). An uncaught
// exception leaves the process in an unknown state: it is logged and the process exits for the
// supervisor (systemd, the container runtime) to restart it.
process.on('unhandledRejection', (reason) => {
  running.ctx.log.error({ err: reason }, 'unexpected rejection; still serving');
});
process.on('uncaughtException', (err) => {
  running.ctx.log.fatal({ err }, 'uncaught exception; exiting for a restart');
  process.exit(1);
});
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
  process.once(signal, () => {
    void running.close().then(() => process.exit(0));
  });
}
