import type { Logger } from 'pino';
import { StartupError } from './errors';

/**
 * Every request and background job catches its own failures; a rejection that still escapes is logged
 * and the process keeps serving (the work it belonged to rolled back with its transaction). An uncaught
 * exception leaves the process in an unknown state: it is logged and the process exits for its
 * supervisor (the cluster primary, systemd, the container runtime) to start it again.
 */
export function guardProcess(log: Logger): void {
  process.on('unhandledRejection', (reason) => {
    log.error({ err: reason }, 'unexpected rejection; still serving');
  });
  process.on('uncaughtException', (err) => {
    log.fatal({ err }, 'uncaught exception; exiting for a restart');
    process.exit(1);
  });
}

/** Runs start-up; a reason the operator can fix (a missing or read-only data folder, a bad setting) is one line and exit 1. */
export async function startOrExplain<T>(start: () => Promise<T>): Promise<T> {
  try {
    return await start();
  } catch (err) {
    if (!(err instanceof StartupError)) throw err;
    process.stderr.write(`Voltfall cannot start: ${err.message}\n`);
    process.exit(1);
  }
}
