import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import type { DestinationStream } from 'pino';
import { createApp } from './app';
import { Sessions } from './auth/sessions';
import { Throttle } from './auth/throttle';
import { Background, BackgroundLoop } from './background';
import { systemClock, type Clock } from './clock';
import type { Config } from './config';
import type { AppContext } from './context';
import { assertDataFolderUsable } from './data-folder';
import { openDatabase } from './db/knex';
import { seedDemo } from './db/seed';
import { Housekeeping } from './housekeeping/sweep';
import { createLogger } from './logging';
import { startFakeSmtp, type FakeSmtp } from './mail/fake-smtp';
import { MailSender } from './mail/mailer';
import { DossierPdfService } from './dossier-pdf/domain';
import { startSigning } from './signing/service';

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

/**
 * Checks the data folder, migrates, seeds the demo outside production, clears what interrupted uploads
 * and approvals left behind, starts mail, the signing services and the periodic sweeps, and listens.
 */
export async function startServer(config: Config, options: StartOptions = {}): Promise<RunningServer> {
  const log = createLogger(config, options.logDestination);
  const clock = options.clock ?? systemClock;
  assertDataFolderUsable(config.dataDir, config.createDataDir);
  const db = await openDatabase(config.dataDir, config.busyTimeoutMs);
  if (config.seedDemo) await seedDemo(db, log);
  const housekeeping = new Housekeeping(db, config.dataDir, config.orphanGraceMs, log);
  await housekeeping.startUp();

  const fakeSmtp = config.production ? null : await startFakeSmtp(db, config.smtp.fakePort);
  const smtpUrl = config.smtp.url ?? fakeSmtp!.url;
  const mail = new MailSender(db, smtpUrl, config.smtp.from, log);
  mail.start();
  // Outside production this also starts the local time-stamping authority on loopback.
  const signing = await startSigning(config);

  const ctx: AppContext = {
    config,
    db,
    clock,
    sessions: new Sessions(db, clock, config.sessions, config.production),
    throttle: new Throttle(db, clock, config),
    log,
    background: new Background(log),
    kickMail: () => void mail.flush(),
    signing,
    baseUrl: config.publicUrl ?? `http://localhost:${config.port}`,
  };
  const sweep = new BackgroundLoop('sweep of expired sessions and throttles', () => sweepExpired(ctx), log, config.sessions.sweepMs);
  sweep.start();
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
  log.info({ port, dataDir: config.dataDir, fakeSmtp: fakeSmtp?.url ?? null, localTsa: signing.localTsaUrl }, 'Voltfall is listening');
  return {
    ctx,
    server,
    url: `http://127.0.0.1:${port}`,
    fakeSmtp,
    mail,
    housekeeping,
    async close() {
      await sweep.stop();
      // Open connections (an upload in progress) are cut, which removes their temporary files.
      const closed = new Promise<void>((resolve) => server.close(() => resolve()));
      server.closeAllConnections();
      await closed;
      await housekeeping.stop();
      await ctx.background.settled();
      await mail.stop();
      await fakeSmtp?.close();
      await pdf.close();
      await signing.close();
      await db.destroy();
    },
  };
}

/** The periodic sweep: expired sessions and long-quiet throttle buckets are deleted. */
export async function sweepExpired(ctx: AppContext): Promise<void> {
  const sessions = await ctx.sessions.sweep();
  const buckets = await ctx.throttle.sweep();
  if (sessions || buckets) ctx.log.info({ sessions, buckets }, 'swept expired sessions and throttle buckets');
}
