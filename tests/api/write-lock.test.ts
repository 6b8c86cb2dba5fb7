// Two connections on one SQLite file, as two cluster workers have: a transaction that finds the write
// lock taken waits for it with the event loop free, then commits; nothing fails with SQLITE_BUSY.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import knexFactory from 'knex';
import { describe, expect, it } from 'vitest';
import { databaseFile, knexConfig, openDatabase } from '../../server/db/knex';

describe('write transactions across connections', () => {
  it('when another connection holds the write lock, then a transaction waits without blocking the event loop and then commits', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'vf-lock-'));
    const first = await openDatabase(dir);
    const second = knexFactory(knexConfig(databaseFile(dir)));
    try {
      let release!: () => void;
      const held = new Promise<void>((resolve) => (release = resolve));
      let began!: () => void;
      const holding = new Promise<void>((resolve) => (began = resolve));
      const holder = first.transaction(async (trx) => {
        await trx('mail_outbox').insert({ from: 'a', to: 'b', subject: 'first', text: '', received_at: 'now' });
        began();
        await held;
      });
      await holding;

      let ticks = 0;
      const ticker = setInterval(() => (ticks += 1), 5);
      const waiter = second.transaction(async (trx) => {
        await trx('mail_outbox').insert({ from: 'a', to: 'b', subject: 'second', text: '', received_at: 'now' });
      });
      await new Promise((resolve) => setTimeout(resolve, 200));
      const ticksWhileLocked = ticks;
      release();
      await Promise.all([holder, waiter]);
      clearInterval(ticker);

      // A synchronous busy wait would have frozen the loop for the whole 200 ms.
      expect(ticksWhileLocked).toBeGreaterThan(3);
      expect(await first('mail_outbox').orderBy('id').pluck('subject')).toEqual(['first', 'second']);
    } finally {
      await second.destroy();
      await first.destroy();
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
