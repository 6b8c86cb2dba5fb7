import type { Knex } from 'knex';
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

export interface QueuedMailRow {
  id: number;
  to: string;
  subject: string;
  text: string;
  html: string;
  attempts: number;
}

/** Pending, due, and claimed by nobody (or by someone whose claim has run out). */
const claimable = (nowIso: string) => (q: Knex.QueryBuilder) =>
  q
    .where({ status: 'pending' })
    .andWhere('next_attempt_at', '<=', nowIso)
    .andWhere((c) => c.whereNull('claimed_until').orWhere('claimed_until', '<=', nowIso));

/**
 * Claims up to `limit` due messages for `holder` until `untilIso` by a conditional UPDATE that repeats
 * the read's condition: a row another instance claimed in between is skipped (PostgreSQL re-checks the WHERE of a row it
 * waited for; SQLite runs one writer at a time), so no message is claimed twice. Answers every message
 * `holder` holds a live claim on — the new ones and those an earlier run of its own left unfinished.
 */
export async function claimDueMail(db: Db, holder: string, nowIso: string, untilIso: string, limit: number): Promise<QueuedMailRow[]> {
  // Read first, so an idle queue costs a read, not a write lock, on every poll.
  const due = (await db('mail_queue').select('id').modify(claimable(nowIso)).orderBy('id').limit(limit)).map((r: { id: number }) => r.id);
  if (due.length) await db('mail_queue').whereIn('id', due).modify(claimable(nowIso)).update({ claimed_by: holder, claimed_until: untilIso });
  return db('mail_queue')
    .where({ status: 'pending', claimed_by: holder })
    .andWhere('claimed_until', '>', nowIso)
    .orderBy('id')
    .select('id', 'to', 'subject', 'text', 'html', 'attempts');
}

/** A delivered message keeps its envelope, not its body: bodies carry one-time links. */
export const markMailSent = (db: Db, id: number, attempts: number, atIso: string) =>
  db('mail_queue').where({ id }).update({ status: 'sent', sent_at: atIso, attempts, text: '', html: '', claimed_by: null, claimed_until: null });

/** A failed attempt: counted, retried at `nextIso` by whichever instance claims it then. */
export const markMailFailed = (
  db: Db,
  id: number,
  update: { attempts: number; status: 'pending' | 'failed'; last_error: string; next_attempt_at: string },
) =>
  db('mail_queue')
    .where({ id })
    .update({ ...update, claimed_by: null, claimed_until: null });
