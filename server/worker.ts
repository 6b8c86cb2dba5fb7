// One HTTP worker of the cluster (forked by server/cluster.ts): serves the API and the app on the
// shared port. Migrations, seeding and background work belong to the primary.
import { pino } from 'pino';
import { KICK_MAIL } from './cluster';
import { loadConfig } from './config';
import { openDatabase } from './db/knex';
import { serveHttp } from './server';

const config = loadConfig();
const log = pino({ level: config.logLevel });
const db = await openDatabase(config.dataDir, { migrate: false });
const http = await serveHttp(config, db, log, () => process.send?.(KICK_MAIL));

process.once('SIGTERM', () => {
  void http.close().then(() => db.destroy()).then(() => process.exit(0));
});
