import type { Knex } from 'knex';
import nodemailer, { type Transporter } from 'nodemailer';
import type { Logger } from 'pino';
import { BackgroundLoop } from '../background';
import { JobLease, leaseTtl, PROCESS_HOLDER } from '../leases/lease';
import { claimDueMail, markMailFailed, markMailSent, type QueuedMailRow } from '../outbox/store';
import { renderMail, type TemplateName } from './templates';

/** Queues a message in the same transaction as the change it reports; the sender delivers it later. */
export async function queueMail(trx: Knex | Knex.Transaction, to: string, template: TemplateName, data: Record<string, unknown>): Promise<void> {
  const mail = renderMail(template, data);
  const now = new Date().toISOString();
  await trx('mail_queue').insert({ to, ...mail, status: 'pending', attempts: 0, next_attempt_at: now, created_at: now });
}

const MAX_ATTEMPTS = 8;
/** Messages claimed in one go, and how long a claim holds: a claimant that died is retried by another after it. */
const CLAIM_BATCH = 10;
export const MAIL_CLAIM_MS = 10 * 60_000;

/**
 * Delivers queued mail through SMTP. A failed send stays in the queue with a growing delay, so a mail
 * outage never undoes or blocks the state change that queued the message; a database that is busy or
 * full when the outcome is recorded makes the loop pause and retry, never ends the process. Several
 * instances may deliver from one queue: each sends only the messages it claimed, and the periodic
 * poll runs on the instance holding the job's lease.
 */
export class MailSender {
  private readonly transport: Transporter;
  private readonly loop: BackgroundLoop;
  // Handed to the relay but not yet marked sent (the database was busy): marked first on the next run
  // and never sent twice by this process (its claim keeps the others off the message meanwhile).
  private readonly delivered = new Set<number>();

  constructor(
    private readonly db: Knex,
    smtpUrl: string,
    private readonly from: string,
    private readonly log: Logger,
    intervalMs = 5_000,
    private readonly holder = PROCESS_HOLDER,
  ) {
    this.transport = nodemailer.createTransport(smtpUrl);
    this.loop = new BackgroundLoop(
      'mail delivery',
      () => this.sendDue(),
      log,
      intervalMs,
      new JobLease(db, 'mail delivery', leaseTtl(intervalMs), holder),
    );
  }

  start(): void {
    this.loop.start();
  }

  async stop(): Promise<void> {
    await this.loop.stop();
    this.transport.close();
  }

  /** Sends every message that is due, here and now (claims keep other instances off them); concurrent calls share one run; never rejects. */
  flush(): Promise<void> {
    return this.loop.runNow();
  }

  private async markSent(id: number, attempts: number): Promise<void> {
    await markMailSent(this.db, id, attempts, new Date().toISOString());
    this.delivered.delete(id);
  }

  private async sendDue(): Promise<void> {
    for (;;) {
      const now = Date.now();
      const claimed = await claimDueMail(this.db, this.holder, new Date(now).toISOString(), new Date(now + MAIL_CLAIM_MS).toISOString(), CLAIM_BATCH);
      if (!claimed.length) return;
      for (const mail of claimed) await this.deliver(mail);
    }
  }

  private async deliver(mail: QueuedMailRow): Promise<void> {
    if (this.delivered.has(mail.id)) return this.markSent(mail.id, mail.attempts + 1);
    try {
      await this.transport.sendMail({ from: this.from, to: mail.to, subject: mail.subject, text: mail.text, html: mail.html });
    } catch (err) {
      const attempts = mail.attempts + 1;
      const delayMs = Math.min(2 ** attempts * 1_000, 15 * 60_000);
      this.log.warn({ err, mailId: mail.id, attempts }, 'mail delivery failed; will retry');
      await markMailFailed(this.db, mail.id, {
        attempts,
        status: attempts >= MAX_ATTEMPTS ? 'failed' : 'pending',
        last_error: String((err as Error).message ?? err),
        next_attempt_at: new Date(Date.now() + delayMs).toISOString(),
      });
      return;
    }
    this.delivered.add(mail.id);
    await this.markSent(mail.id, mail.attempts + 1);
  }
}
