import type { Knex } from 'knex';
import nodemailer, { type Transporter } from 'nodemailer';
import type { Logger } from 'pino';
import { renderMail, type TemplateName } from './templates';

/** Queues a message in the same transaction as the change it reports; the sender delivers it later. */
export async function queueMail(
  trx: Knex | Knex.Transaction,
  to: string,
  template: TemplateName,
  data: Record<string, unknown>,
): Promise<void> {
  const mail = renderMail(template, data);
  const now = new Date().toISOString();
  await trx('mail_queue').insert({ to, ...mail, status: 'pending', attempts: 0, next_attempt_at: now, created_at: now });
}

const MAX_ATTEMPTS = 8;

/**
 * Delivers queued mail through SMTP. A failed send stays in the queue with a growing delay, so a mail
 * outage never undoes or blocks the state change that queued the message.
 */
export class MailSender {
  private readonly transport: Transporter;
  private timer: ReturnType<typeof setInterval> | null = null;
  private running: Promise<void> | null = null;

  constructor(
    private readonly db: Knex,
    smtpUrl: string,
    private readonly from: string,
    private readonly log: Logger,
  ) {
    this.transport = nodemailer.createTransport(smtpUrl);
  }

  start(intervalMs = 5_000): void {
    this.timer = setInterval(() => void this.flush(), intervalMs);
  }

  async stop(): Promise<void> {
    if (this.timer) clearInterval(this.timer);
    await this.running;
    this.transport.close();
  }

  /** Sends every message that is due; concurrent calls share one run. */
  flush(): Promise<void> {
    this.running ??= this.sendDue().finally(() => {
      this.running = null;
    });
    return this.running;
  }

  private async sendDue(): Promise<void> {
    const due = await this.db('mail_queue')
      .where({ status: 'pending' })
      .andWhere('next_attempt_at', '<=', new Date().toISOString())
      .orderBy('id')
      .limit(50);
    for (const mail of due) {
      try {
        await this.transport.sendMail({ from: this.from, to: mail.to, subject: mail.subject, text: mail.text, html: mail.html });
        // A delivered message keeps its envelope, not its body: bodies carry one-time links.
        await this.db('mail_queue').where({ id: mail.id }).update({ status: 'sent', sent_at: new Date().toISOString(), attempts: mail.attempts + 1, text: '', html: '' });
      } catch (err) {
        const attempts = mail.attempts + 1;
        const delayMs = Math.min(2 ** attempts * 1_000, 15 * 60_000);
        this.log.warn({ err, mailId: mail.id, attempts }, 'mail delivery failed; will retry');
        await this.db('mail_queue').where({ id: mail.id }).update({
          attempts,
          status: attempts >= MAX_ATTEMPTS ? 'failed' : 'pending',
          last_error: String((err as Error).message ?? err),
          next_attempt_at: new Date(Date.now() + delayMs).toISOString(),
        });
      }
    }
  }
}
