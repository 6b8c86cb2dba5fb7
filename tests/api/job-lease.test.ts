// Job leases on both databases: one holder at a time, renewed by its holder, taken over once it expires
// (or at once when the holder was a process of this machine that is gone), and never won twice by
// holders that try at the same moment.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openDatabase, type Db } from '../../server/db/knex';
import { JobLease } from '../../server/leases/lease';
import { createDatabase, startPostgres, type PostgresServer } from '../support/postgres';

let pg: PostgresServer;
const dir = mkdtempSync(join(tmpdir(), 'vf-lease-'));
const dbs: Record<'sqlite' | 'postgres', Db> = {} as Record<'sqlite' | 'postgres', Db>;

beforeAll(async () => {
  pg = await startPostgres();
  await createDatabase(pg, 'leases');
  dbs.sqlite = await openDatabase(dir);
  dbs.postgres = await openDatabase(dir, { url: pg.urlOf('leases') });
}, 60_000);

afterAll(async () => {
  await Promise.all(Object.values(dbs).map((db) => db.destroy()));
  await pg.stop();
  rmSync(dir, { recursive: true, force: true });
});

const TTL = 60_000;

describe.each(['sqlite', 'postgres'] as const)('job leases on %s', (kind) => {
  it('when two instances ask for one lease, then the first holds it, the second is refused, and the holder renews it', async () => {
    let now = 1_000_000;
    const a = new JobLease(dbs[kind], `${kind} renew`, TTL, 'machine-a/1/x', () => now);
    const b = new JobLease(dbs[kind], `${kind} renew`, TTL, 'machine-b/2/y', () => now);
    expect(await a.take()).toBe(true);
    expect(await b.take()).toBe(false);
    // Past half the lease the holder's run extends it; the other instance is still refused after the first end.
    now += 0.75 * TTL;
    expect(await a.take()).toBe(true);
    now += 0.5 * TTL;
    expect(await b.take()).toBe(false);
    expect(
      (
        await dbs[kind]('job_leases')
          .where({ name: `${kind} renew` })
          .first()
      ).holder,
    ).toBe('machine-a/1/x');
  });

  it('when the holder on another machine stops renewing, then the lease is taken over once it has expired, not before', async () => {
    let now = 5_000_000;
    const gone = new JobLease(dbs[kind], `${kind} expiry`, TTL, 'machine-gone/1/x', () => now);
    const survivor = new JobLease(dbs[kind], `${kind} expiry`, TTL, 'machine-b/2/y', () => now);
    expect(await gone.take()).toBe(true);
    now += TTL - 1;
    expect(await survivor.take()).toBe(false);
    now += 1;
    expect(await survivor.take()).toBe(true);
    expect(await gone.take()).toBe(false);
  });

  it('when the holder was a process of this machine that no longer runs, then the lease is taken over at once', async () => {
    const name = `${kind} dead pid`;
    // A pid far above any Linux pid_max: no such process.
    await dbs[kind]('job_leases').insert({ name, holder: `${(await import('node:os')).hostname()}/99999999/dead`, expires_at: Date.now() + TTL });
    expect(await new JobLease(dbs[kind], name, TTL).take()).toBe(true);
  });

  it('when twenty holders ask at the same moment, then exactly one wins', async () => {
    const name = `${kind} race`;
    const wins = await Promise.all(Array.from({ length: 20 }, (_, i) => new JobLease(dbs[kind], name, TTL, `machine-${i}/1/x`).take()));
    expect(wins.filter(Boolean)).toHaveLength(1);
    const holder = (await dbs[kind]('job_leases').where({ name }).first()).holder;
    expect(holder).toBe(`machine-${wins.indexOf(true)}/1/x`);
  });

  it('when the holder releases the lease (a clean stop), then another takes it at once', async () => {
    const name = `${kind} release`;
    const a = new JobLease(dbs[kind], name, TTL, 'machine-a/1/x');
    const b = new JobLease(dbs[kind], name, TTL, 'machine-b/2/y');
    expect(await a.take()).toBe(true);
    await a.release();
    expect(await b.take()).toBe(true);
  });
});
