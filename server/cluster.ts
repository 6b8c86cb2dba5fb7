import cluster, { type Worker } from 'node:cluster';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { pino } from 'pino';
import { startBackground } from './background';
import { loadConfig } from './config';
import { openDataFolder } from './server';

/** The message a worker sends when it queued mail: the primary, which owns delivery, sends it now. */
export const KICK_MAIL = 'voltfall:kick-mail';

export interface RunningCluster {
  url: string;
  port: number;
  workers: () => Worker[];
  close(): Promise<void>;
}

const WORKER_ENTRY = join(dirname(fileURLToPath(import.meta.url)), 'worker.ts');

/**
 * The primary of a cluster: it opens the data folder (migrate, seed), runs the background work once
 * (local mail server, mail delivery, sweeps) and forks `count` HTTP workers that share one port and
 * one SQLite file (WAL, immediate write transactions, a busy timeout). A worker that dies is replaced.
 */
export async function startCluster(env: Record<string, string | undefined>, count: number): Promise<RunningCluster> {
  const config = loadConfig(env);
  const log = pino({ level: config.logLevel });
  const db = await openDataFolder(config, log);
  const background = await startBackground(db, config, log);
  let stopping = false;

  cluster.setupPrimary({ exec: WORKER_ENTRY, execArgv: ['--import', 'tsx'] });
  const fork = () => {
    const worker = cluster.fork(env);
    worker.on('message', (message: unknown) => {
      if (message === KICK_MAIL) void background.mail.flush();
    });
    return worker;
  };
  const listening = (worker: Worker) =>
    new Promise<number>((resolve, reject) => {
      worker.once('listening', (address) => resolve(address.port));
      worker.once('exit', (code) => reject(new Error(`worker ${worker.id} exited with ${code} before it listened`)));
    });

  const ports = await Promise.all(Array.from({ length: count }, () => listening(fork())));
  const port = ports[0];
  cluster.on('exit', (worker, code, signal) => {
    if (stopping) return;
    log.error({ worker: worker.id, code, signal }, 'worker died; starting a new one');
    fork();
  });
  log.info({ port, workers: count, dataDir: config.dataDir, fakeSmtp: background.fakeSmtp?.url ?? null }, 'Voltfall is listening');

  return {
    url: `http://127.0.0.1:${port}`,
    port,
    workers: () => Object.values(cluster.workers ?? {}).filter((w): w is Worker => w !== undefined),
    async close() {
      stopping = true;
      const workers = Object.values(cluster.workers ?? {}).filter((w): w is Worker => w !== undefined);
      await Promise.all(
        workers.map(
          (w) =>
            new Promise<void>((resolve) => {
              if (w.isDead()) return resolve();
              w.once('exit', () => resolve());
              w.process.kill('SIGTERM');
            }),
        ),
      );
      await background.stop();
      await db.destroy();
    },
  };
}
