import type { Logger } from 'pino';
import type { Config } from './config';
import type { Db } from './db/knex';
import { startFakeSmtp, type FakeSmtp } from './mail/fake-smtp';
import { MailSender } from './mail/mailer';

/**
 * Work that runs once per data folder, never once per worker: the local mail server, the mail
 * delivery and retry loop, and periodic sweeps of the data folder (start them here).
 */
export interface Background {
  fakeSmtp: FakeSmtp | null;
  mail: MailSender;
  stop(): Promise<void>;
}

export async function startBackground(db: Db, config: Config, log: Logger): Promise<Background> {
  const fakeSmtp = config.production ? null : await startFakeSmtp(db, config.smtp.fakePort);
  const mail = new MailSender(db, config.smtp.url ?? fakeSmtp!.url, config.smtp.from, log);
  mail.start();
  return {
    fakeSmtp,
    mail,
    async stop() {
      await mail.stop();
      await fakeSmtp?.close();
    },
  };
}
