import type { Db } from '../db/knex';

/** The newest 200 messages the local mail server received. */
export const receivedMail = (db: Db) => db('mail_outbox').orderBy('id', 'desc').limit(200);

/** The newest 200 messages not yet delivered, with their attempts. */
export const queuedMail = (db: Db) =>
  db('mail_queue')
    .whereNot({ status: 'sent' })
    .orderBy('id', 'desc')
    .limit(200)
    .select('id', 'to', 'subject', 'status', 'attempts', 'last_error', 'next_attempt_at');
