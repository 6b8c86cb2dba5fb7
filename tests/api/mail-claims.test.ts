// The mail queue shared by several instances, on both databases: a message is claimed by one sender at
// a time, senders racing over one queue send each message once, and a claim whose holder died runs out
// so another sender delivers the message.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import pino from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openDatabase, type Db } from '../../server/db/knex';
import { startFakeSmtp, type FakeSmtp } from '../../server/mail/fake-smtp';
import { MailSender } from '../../server/mail/mailer';
import { claimDueMail } from '../../server/outbox/store';
import { pendingMailRow } from '../support/fixtures';
import { createDatabase, startPostgres, type PostgresServer } from '../support/postgres';

let pg: PostgresServer;
const dir = mkdtempSync(join(tmpdir(), 'vf-claims-'));
const dbs = {} as Record<'sqlite' | 'postgres', Db>;
const smtp = {} as Record<'sqlite' | 'postgres', FakeSmtp>;
const log = pino({ level: 'silent' });

beforeAll(async () => {
  pg = await startPostgres();
  await createDatabase(pg, 'claims');
  dbs.sqlite = await openDatabase(dir);
  dbs.postgres = await openDatabase(dir, { url: pg.urlOf('claims') });
  for (const kind of ['sqlite', 'postgres'] as const) smtp[kind] = await startFakeSmtp(dbs[kind], 0);
}, 60_000);

afterAll(async () => {
  for (const kind of ['sqlite', 'postgres'] as const) {
    await smtp[kind].close();
    await dbs[kind].destroy();
  }
  await pg.stop();
  rmSync(dir, { recursive: true, force: true });
});

const iso = (ms: number) => new Date(ms).toISOString();

async function queue(db: Db, subjects: string[], extra: Record<string, unknown> = {}): Promise<void> {
  const now = iso(Date.now() - 1_000);
  await db('mail_queue').insert(subjects.map((subject) => ({ ...pendingMailRow(subject, now), ...extra })));
}

describe.each(['sqlite', 'postgres'] as const)('mail claims on %s', (kind) => {
  it('when one sender holds a claim, then another gets nothing until the claim runs out', async () => {
    const db = dbs[kind];
    await queue(db, ['claim A']);
    const now = Date.now();
    const first = await claimDueMail(db, 'host-a/1/x', iso(now), iso(now + 60_000), 10);
    expect(first.map((m) => m.subject)).toEqual(['claim A']);
    expect(await claimDueMail(db, 'host-b/2/y', iso(now + 59_999), iso(now + 120_000), 10)).toEqual([]);
    const taken = await claimDueMail(db, 'host-b/2/y', iso(now + 60_000), iso(now + 120_000), 10);
    expect(taken.map((m) => m.subject)).toEqual(['claim A']);
    await db('mail_queue').where({ subject: 'claim A' }).update({ status: 'sent' });
  });

  it('when ten senders claim from one queue at once, then every message is claimed by exactly one', async () => {
    const db = dbs[kind];
    const subjects = Array.from({ length: 40 }, (_, i) => `race ${i}`);
    await queue(db, subjects);
    const now = Date.now();
    const claims = await Promise.all(Array.from({ length: 10 }, (_, i) => claimDueMail(db, `host-${i}/1/x`, iso(now), iso(now + 60_000), 40)));
    const claimed = claims.flat().map((m) => m.subject);
    expect(claimed.sort()).toEqual([...subjects].sort());
    await db('mail_queue').whereIn('subject', subjects).update({ status: 'sent' });
  });

  it('when two senders deliver from one queue at the same moments, then each message reaches the relay once, a dead claimant’s too', async () => {
    const db = dbs[kind];
    const subjects = Array.from({ length: 30 }, (_, i) => `${kind} deliver ${i}`);
    await queue(db, subjects);
    await queue(db, [`${kind} deliver dead`], { claimed_by: 'gone-host/1/dead', claimed_until: iso(Date.now() - 1) });
    const senders = ['host-a/1/x', 'host-b/2/y'].map((holder) => new MailSender(db, smtp[kind].url, 'Voltfall <v@fennel.test>', log, 60_000, holder));
    try {
      for (let round = 0; round < 3; round += 1) await Promise.all(senders.map((s) => s.flush()));
    } finally {
      await Promise.all(senders.map((s) => s.stop()));
    }
    const all = [...subjects, `${kind} deliver dead`];
    expect((await db('mail_queue').whereIn('subject', all).where({ status: 'sent' })).length).toBe(all.length);
    const received = (await db('mail_outbox').whereIn('subject', all)).map((m: { subject: string }) => m.subject);
    expect(received.sort()).toEqual([...all].sort());
  });
});
