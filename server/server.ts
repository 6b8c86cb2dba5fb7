import { mkdirSync } from 'node:fs';
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import type { DestinationStream } from 'pino';
import { createApp } from './app';
import { Sessions } from './auth/sessions';
import { Throttle } from './auth/throttle';
import { Background } from './background';
import { systemClock, type Clock } from './clock';
import type { Config } from './config';
import type { AppContext } from './context';
import { openDatabase } from './db/knex';
import { seedDemo } from './db/seed';
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
  close(): Promise<void>;
}

export interface StartOptions {
  /** The time source for sessions, links and throttles (tests pass a fake one). */
  clock?: Clock;
  /** Where log lines go (standard output unless given). */
  logDestination?: DestinationStream;
}

/** Opens the data folder, migrates, seeds the demo outside production, starts mail and sweeps, and listens. */
export async function startServer(config: Config, options: StartOptions = {}): Promise<RunningServer> {
  const log = createLogger(config, options.logDestination);
  const clock = options.clock ?? systemClock;
  mkdirSync(config.dataDir, { recursive: true });
  const db = await openDatabase(config.dataDir);
  if (config.seedDemo) await seedDemo(db, log);

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
  const sweep = setInterval(() => ctx.background.run('sweep expired sessions and throttles', () => sweepExpired(ctx)), config.sessions.sweepMs);
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
    async close() {
      clearInterval(sweep);
      await new Promise<void>((resolve) => server.close(() => resolve()));
      server.closeAllConnections();
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
