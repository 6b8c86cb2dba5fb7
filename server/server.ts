import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import { pino } from 'pino';
import { createApp } from './app';
import { createLucia } from './auth/lucia';
import type { Config } from './config';
import type { AppContext } from './context';
import { assertDataFolderUsable } from './data-folder';
import { openDatabase } from './db/knex';
import { seedDemo } from './db/seed';
import { Housekeeping } from './housekeeping/sweep';
import { startFakeSmtp, type FakeSmtp } from './mail/fake-smtp';
import { MailSender } from './mail/mailer';

export interface RunningServer {
  ctx: AppContext;
  server: Server;
  url: string;
  fakeSmtp: FakeSmtp | null;
  mail: MailSender;
  housekeeping: Housekeeping;
  close(): Promise<void>;
}

/**
 * Checks the data folder, migrates, seeds the demo outside production, clears what interrupted uploads
 * and approvals left behind, starts mail and the periodic sweep, and listens.
 */
export async function startServer(config: Config): Promise<RunningServer> {
  const log = pino({ level: config.logLevel });
  assertDataFolderUsable(config.dataDir, config.createDataDir);
  const db = await openDatabase(config.dataDir, config.busyTimeoutMs);
  if (config.seedDemo) await seedDemo(db, log);
  const housekeeping = new Housekeeping(db, config.dataDir, config.orphanGraceMs, log);
  await housekeeping.startUp();

  const fakeSmtp = config.production ? null : await startFakeSmtp(db, config.smtp.fakePort);
  const smtpUrl = config.smtp.url ?? fakeSmtp!.url;
  const mail = new MailSender(db, smtpUrl, config.smtp.from, log);
  mail.start();

  const ctx: AppContext = {
    config,
    db,
    lucia: createLucia(db, config.production),
    log,
    kickMail: () => void mail.flush(),
    baseUrl: config.publicUrl ?? `http://localhost:${config.port}`,
  };
  const app = createApp(ctx);
  const server = await new Promise<Server>((resolve) => {
    const s = app.listen(config.port, config.host, () => resolve(s));
  });
  const port = (server.address() as AddressInfo).port;
  if (!config.publicUrl) ctx.baseUrl = `http://localhost:${port}`;
  log.info({ port, dataDir: config.dataDir, fakeSmtp: fakeSmtp?.url ?? null }, 'Voltfall is listening');
  return {
    ctx,
    server,
    url: `http://127.0.0.1:${port}`,
    fakeSmtp,
    mail,
    housekeeping,
    async close() {
      // Open connections (an upload in progress) are cut, which removes their temporary files.
      const closed = new Promise<void>((resolve) => server.close(() => resolve()));
      server.closeAllConnections();
      await closed;
      await housekeeping.stop();
      await mail.stop();
      await fakeSmtp?.close();
      await db.destroy();
    },
  };
}
