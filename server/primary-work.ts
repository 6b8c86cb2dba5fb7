// Work that runs once per instance, never once per worker: the local mail server, mail delivery and
// its retries, the data-folder sweep and the sweep of expired sessions and throttle buckets. A cluster's
// primary runs it; a single process runs it beside its HTTP server. Where several instances share one
// database, the periodic jobs take a lease (server/leases) so that one of them runs each at a time.
import type { Logger } from 'pino';
import { Sessions } from './auth/sessions';
import { Throttle } from './auth/throttle';
import { BackgroundLoop } from './background';
import type { Clock } from './clock';
import type { Config } from './config';
import type { Db } from './db/knex';
import { Housekeeping } from './housekeeping/sweep';
import { JobLease, leaseTtl } from './leases/lease';
import { startFakeSmtp, type FakeSmtp } from './mail/fake-smtp';
import { MailSender } from './mail/mailer';

interface PrimaryWork {
  fakeSmtp: FakeSmtp | null;
  mail: MailSender;
  housekeeping: Housekeeping;
  stop(): Promise<void>;
}

/** What the expiry sweep needs: the session and throttle stores and a log. */
interface Expiring {
  sessions: Sessions;
  throttle: Throttle;
  log: Logger;
}

/** The periodic sweep: expired sessions and long-quiet throttle buckets are deleted. */
export async function sweepExpired(ctx: Expiring): Promise<void> {
  const sessions = await ctx.sessions.sweep();
  const buckets = await ctx.throttle.sweep();
  if (sessions || buckets) ctx.log.info({ sessions, buckets }, 'swept expired sessions and throttle buckets');
}

export async function startPrimaryWork(db: Db, config: Config, log: Logger, clock: Clock): Promise<PrimaryWork> {
  // At start-up, before any worker writes, what interrupted uploads and approvals left behind goes.
  const housekeeping = new Housekeeping(db, config, config.orphanGraceMs, log);
  await housekeeping.startUp();
  const fakeSmtp = config.production ? null : await startFakeSmtp(db, config.smtp.fakePort);
  const mail = new MailSender(db, config.smtp.url ?? fakeSmtp!.url, config.smtp.from, log);
  mail.start();
  const expiring: Expiring = {
    sessions: new Sessions(db, clock, config.sessions, config.production),
    throttle: new Throttle(db, clock, config),
    log,
  };
  const sweepName = 'sweep of expired sessions and throttles';
  const sweep = new BackgroundLoop(
    sweepName,
    () => sweepExpired(expiring),
    log,
    config.sessions.sweepMs,
    new JobLease(db, sweepName, leaseTtl(config.sessions.sweepMs)),
  );
  sweep.start();
  return {
    fakeSmtp,
    mail,
    housekeeping,
    async stop() {
      await sweep.stop();
      await housekeeping.stop();
      await mail.stop();
      await fakeSmtp?.close();
    },
  };
}
