import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import type { DestinationStream, Logger } from 'pino';
import { createApp } from './app';
import { Sessions } from './auth/sessions';
import { Throttle } from './auth/throttle';
import { Background } from './background';
import { systemClock, type Clock } from './clock';
import type { Config } from './config';
import type { AppContext } from './context';
import { assertDataFolderUsable } from './data-folder';
import { openDatabase, type Db } from './db/knex';
import { seedDemo } from './db/seed';
import { DossierPdfService } from './dossier-pdf/domain';
import type { Housekeeping } from './housekeeping/sweep';
import { createLogger } from './logging';
import type { FakeSmtp } from './mail/fake-smtp';
import type { MailSender } from './mail/mailer';
import { startPrimaryWork } from './primary-work';
import { startSigning, type Signing } from './signing/service';

export { sweepExpired } from './primary-work';

export interface RunningServer {
  ctx: AppContext;
  server: Server;
  url: string;
  fakeSmtp: FakeSmtp | null;
  mail: MailSender;
  housekeeping: Housekeeping;
  close(): Promise<void>;
}

export interface StartOptions {
  /** The time source for sessions, links and throttles (tests pass a fake one). */
  clock?: Clock;
  /** Where log lines go (standard output unless given). */
  logDestination?: DestinationStream;
}

/** Opens the data folder: checks it is usable, migrates, and seeds the demo outside production. */
export async function openDataFolder(config: Config, log: Logger): Promise<Db> {
  assertDataFolderUsable(config.dataDir, config.createDataDir);
  const db = await openDatabase(config.dataDir, { busyTimeoutMs: config.busyTimeoutMs, url: config.databaseUrl });
  if (config.seedDemo) await seedDemo(db, log);
  return db;
}

interface Http {
  ctx: AppContext;
  server: Server;
  port: number;
  /** Stops listening, lets requests under way finish, stops the PDF worker (the database stays open). */
  close(): Promise<void>;
}

interface HttpParts {
  db: Db;
  log: Logger;
  clock: Clock;
  signing: Signing;
  kickMail: () => void;
}

/** Builds the app on an open database and listens; in a cluster every worker shares the port. */
export async function serveHttp(config: Config, { db, log, clock, signing, kickMail }: HttpParts): Promise<Http> {
  const ctx: AppContext = {
    config,
    db,
    clock,
    sessions: new Sessions(db, clock, config.sessions, config.production),
    throttle: new Throttle(db, clock, config),
    log,
    background: new Background(log),
    kickMail,
    signing,
    baseUrl: config.publicUrl ?? `http://localhost:${config.port}`,
  };
  const pdf = new DossierPdfService(ctx);
  // Tests start many servers and most never render a PDF; a production server should not make its first
  // approval wait for the worker to load.
  if (config.production) pdf.warm();
  const app = createApp(ctx, pdf);
  const server = await new Promise<Server>((resolve) => {
    const s = app.listen(config.port, config.host, () => resolve(s));
  });
  const port = (server.address() as AddressInfo).port;
  if (!config.publicUrl) ctx.baseUrl = `http://localhost:${port}`;
  return {
    ctx,
    server,
    port,
    async close() {
      // Requests under way may finish; open connections (an upload in progress) are cut after a grace
      // period, which removes their temporary files.
      await new Promise<void>((resolve) => {
        const grace = setTimeout(() => server.closeAllConnections(), 3_000);
        server.close(() => {
          clearTimeout(grace);
          resolve();
        });
        server.closeIdleConnections();
      });
      await ctx.background.settled();
      await pdf.close();
    },
  };
}

/**
 * One process doing everything (tests, and `server/index.ts` with WEB_CONCURRENCY=1): checks and opens
 * the data folder, starts the work that runs once per folder (mail, sweeps), the signing services
 * (outside production a local time-stamping authority on loopback) and the HTTP server.
 */
export async function startServer(config: Config, options: StartOptions = {}): Promise<RunningServer> {
  const log = createLogger(config, options.logDestination);
  const clock = options.clock ?? systemClock;
  const db = await openDataFolder(config, log);
  const primary = await startPrimaryWork(db, config, log, clock);
  const signing = await startSigning(config, db);
  const http = await serveHttp(config, { db, log, clock, signing, kickMail: () => void primary.mail.flush() });
  const { ctx, server, port } = http;
  log.info({ port, dataDir: config.dataDir, fakeSmtp: primary.fakeSmtp?.url ?? null, localTsa: signing.localTsaUrl }, 'Voltfall is listening');
  return {
    ctx,
    server,
    url: `http://127.0.0.1:${port}`,
    fakeSmtp: primary.fakeSmtp,
    mail: primary.mail,
    housekeeping: primary.housekeeping,
    async close() {
      await http.close();
      await primary.stop();
      await signing.close();
      await db.destroy();
    },
  };
}
