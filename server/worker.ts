// One HTTP worker of the cluster (forked by server/cluster.ts): serves the API and the app on the
// shared port. Migrations, seeding and the work that runs once per data folder belong to the primary.
import { systemClock } from './clock';
import { KICK_MAIL } from './cluster';
import { loadConfig } from './config';
import { openDatabase } from './db/knex';
import { createLogger } from './logging';
import { guardProcess } from './process-guards';
import { serveHttp } from './server';
import { startSigning } from './signing/service';

const config = loadConfig();
const log = createLogger(config);
const db = await openDatabase(config.dataDir, { busyTimeoutMs: config.busyTimeoutMs, migrate: false, url: config.databaseUrl });
const signing = await startSigning(config, db);
const http = await serveHttp(config, { db, log, clock: systemClock, signing, kickMail: () => process.send?.(KICK_MAIL) });
guardProcess(log);

process.once('SIGTERM', () => {
  void http
    .close()
    .then(() => signing.close())
    .then(() => db.destroy())
    .then(() => process.exit(0));
});
