import type { Knex } from 'knex';
import nodemailer, { type Transporter } from 'nodemailer';
import type { Logger } from 'pino';
import { BackgroundLoop } from '../background';
import { renderMail, type TemplateName } from './templates';

/** Queues a message in the same transaction as the change it reports; the sender delivers it later. */
export async function queueMail(trx: Knex | Knex.Transaction, to: string, template: TemplateName, data: Record<string, unknown>): Promise<void> {
  const mail = renderMail(template, data);
  const now = new Date().toISOString();
  await trx('mail_queue').insert({ to, ...mail, status: 'pending', attempts: 0, next_attempt_at: now, created_at: now });
}

const MAX_ATTEMPTS = 8;

/**
 * Delivers queued mail through SMTP. A failed send stays in the queue with a growing delay, so a mail
 * outage never undoes or blocks the state change that queued the message; a database that is busy or
 * full when the outcome is recorded makes the loop pause and retry, never ends the process.
 */
export class MailSender {
  private readonly transport: Transporter;
  private readonly loop: BackgroundLoop;
  // Handed to the relay but not yet marked sent (the database was busy): marked first on the next run
  // and never sent twice by this process.
  private readonly delivered = new Set<number>();

  constructor(
    private readonly db: Knex,
    smtpUrl: string,
    private readonly from: string,
    private readonly log: Logger,
    intervalMs = 5_000,
  ) {
    this.transport = nodemailer.createTransport(smtpUrl);
    this.loop = new BackgroundLoop('mail delivery', () => this.sendDue(), log, intervalMs);
  }

  start(): void {
    this.loop.start();
  }

  async stop(): Promise<void> {
    await this.loop.stop();
    this.transport.close();
  }

  /** Sends every message that is due; concurrent calls share one run; never rejects. */
  flush(): Promise<void> {
    return this.loop.runNow();
  }

  private async markSent(id: number, attempts: number): Promise<void> {
    // A delivered message keeps its envelope, not its body: bodies carry one-time links.
    await this.db('mail_queue').where({ id }).update({ status: 'sent', sent_at: new Date().toISOString(), attempts, text: '', html: '' });
    this.delivered.delete(id);
  }

  private async sendDue(): Promise<void> {
    const due = await this.db('mail_queue')
      .where({ status: 'pending' })
      .andWhere('next_attempt_at', '<=', new Date().toISOString())
      .orderBy('id')
      .limit(50);
    for (const mail of due) {
      if (this.delivered.has(mail.id)) {
        await this.markSent(mail.id, mail.attempts + 1);
        continue;
      }
      try {
        await this.transport.sendMail({ from: this.from, to: mail.to, subject: mail.subject, text: mail.text, html: mail.html });
      } catch (err) {
        const attempts = mail.attempts + 1;
        const delayMs = Math.min(2 ** attempts * 1_000, 15 * 60_000);
        this.log.warn({ err, mailId: mail.id, attempts }, 'mail delivery failed; will retry');
        await this.db('mail_queue')
          .where({ id: mail.id })
          .update({
            attempts,
            status: attempts >= MAX_ATTEMPTS ? 'failed' : 'pending',
            last_error: String((err as Error).message ?? err),
            next_attempt_at: new Date(Date.now() + delayMs).toISOString(),
          });
        continue;
      }
      this.delivered.add(mail.id);
      await this.markSent(mail.id, mail.attempts + 1);
    }
  }
}
