import cluster, { type Worker } from 'node:cluster';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { systemClock } from './clock';
import { loadConfig } from './config';
import { createLogger } from './logging';
import { startPrimaryWork } from './primary-work';
import { openDataFolder } from './server';
import { startSigning } from './signing/service';

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
 * The primary of a cluster: it opens the data folder (check, migrate, seed), runs the work that belongs
 * to the folder once (local mail server, mail delivery, sweeps, outside production the local
 * time-stamping authority) and forks `count` HTTP workers that share one port and one SQLite file (WAL,
 * immediate write transactions, a busy timeout). A worker that dies is replaced.
 */
export async function startCluster(env: Record<string, string | undefined>, count: number): Promise<RunningCluster> {
  const config = loadConfig(env);
  const log = createLogger(config);
  const db = await openDataFolder(config, log);
  const primary = await startPrimaryWork(db, config, log, systemClock);
  // The workers time-stamp through the primary's authority (or the configured one).
  const signing = await startSigning(config, db);
  const workerEnv = { ...env, ...(signing.localTsaUrl ? { TSA_URL: signing.localTsaUrl } : {}) };
  let stopping = false;

  cluster.setupPrimary({ exec: WORKER_ENTRY, execArgv: ['--import', 'tsx'] });
  const fork = () => {
    const worker = cluster.fork(workerEnv);
    worker.on('message', (message: unknown) => {
      if (message === KICK_MAIL) void primary.mail.flush();
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
  log.info(
    { port, workers: count, dataDir: config.dataDir, fakeSmtp: primary.fakeSmtp?.url ?? null, localTsa: signing.localTsaUrl },
    'Voltfall is listening',
  );

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
      await primary.stop();
      await signing.close();
      await db.destroy();
    },
  };
}
