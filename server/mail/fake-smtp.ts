import type { AddressInfo } from 'node:net';
import type { Knex } from 'knex';
import { simpleParser } from 'mailparser';
import { SMTPServer } from 'smtp-server';

export interface FakeSmtp {
  port: number;
  url: string;
  close(): Promise<void>;
}

/**
 * A real SMTP server on loopback standing in for the mail service outside production. Whatever it
 * receives lands in `mail_outbox`, where the Outbox screen and the tests read it.
 */
export async function startFakeSmtp(db: Knex, port: number): Promise<FakeSmtp> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    onData(stream, _session, callback) {
      simpleParser(stream)
        .then(async (mail) => {
          const to = [mail.to]
            .flat()
            .filter(Boolean)
            .map((a) => (a && 'text' in a ? a.text : ''))
            .join(', ');
          await db('mail_outbox').insert({
            from: mail.from?.text ?? '',
            to,
            subject: mail.subject ?? '',
            text: mail.text ?? '',
            html: typeof mail.html === 'string' ? mail.html : null,
            received_at: new Date().toISOString(),
          });
          callback();
        })
        .catch((err: Error) => callback(err));
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => resolve());
  });
  const actual = (server.server.address() as AddressInfo).port;
  return {
    port: actual,
    url: `smtp://127.0.0.1:${actual}`,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
