import { mkdirSync } from 'node:fs';
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import { pino, type Logger } from 'pino';
import { createApp } from './app';
import { createLucia, openSessionReader } from './auth/lucia';
import { startBackground } from './background';
import type { Config } from './config';
import type { AppContext } from './context';
import { openDatabase, type Db } from './db/knex';
import { seedDemo } from './db/seed';
import type { FakeSmtp } from './mail/fake-smtp';
import type { MailSender } from './mail/mailer';

export interface RunningServer {
  ctx: AppContext;
  server: Server;
  url: string;
  fakeSmtp: FakeSmtp | null;
  mail: MailSender;
  close(): Promise<void>;
}

/** Opens the data folder: creates it, migrates, and seeds the demo outside production. */
export async function openDataFolder(config: Config, log: Logger): Promise<Db> {
  mkdirSync(config.dataDir, { recursive: true });
  const db = await openDatabase(config.dataDir);
  if (config.seedDemo) await seedDemo(db, log);
  return db;
}

export interface Http {
  ctx: AppContext;
  server: Server;
  port: number;
  /** Stops listening, lets requests under way finish, closes the session reader (the database stays open). */
  close(): Promise<void>;
}

/** Builds the app on an open database and listens; in a cluster every worker shares the port. */
export async function serveHttp(config: Config, db: Db, log: Logger, kickMail: () => void): Promise<Http> {
  const sessions = openSessionReader(config.dataDir);
  const ctx: AppContext = {
    config,
    db,
    lucia: createLucia(db, sessions, config.production),
    log,
    kickMail,
    baseUrl: config.publicUrl ?? `http://localhost:${config.port}`,
  };
  const app = createApp(ctx);
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
      // Requests under way may finish; idle keep-alive connections end now, the rest after a grace period.
      await new Promise<void>((resolve) => {
        const grace = setTimeout(() => server.closeAllConnections(), 3_000);
        server.close(() => {
          clearTimeout(grace);
          resolve();
        });
        server.closeIdleConnections();
      });
      sessions.close();
    },
  };
}

/** One process doing everything (tests, `node server/index.ts` with WEB_CONCURRENCY=1): data, background work and HTTP. */
export async function startServer(config: Config): Promise<RunningServer> {
  const log = pino({ level: config.logLevel });
  const db = await openDataFolder(config, log);
  const background = await startBackground(db, config, log);
  const http = await serveHttp(config, db, log, () => void background.mail.flush());
  const { ctx, server, port } = http;
  log.info({ port, dataDir: config.dataDir, fakeSmtp: background.fakeSmtp?.url ?? null }, 'Voltfall is listening');
  return {
    ctx,
    server,
    url: `http://127.0.0.1:${port}`,
    fakeSmtp: background.fakeSmtp,
    mail: background.mail,
    async close() {
      await http.close();
      await background.stop();
      await db.destroy();
    },
  };
}
