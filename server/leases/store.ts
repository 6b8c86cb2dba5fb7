// Data access of job leases (Knex only here). Each statement decides on its own, so two instances that
// try at the same moment cannot both win: the database serialises the conflicting row.
import type { Knex } from 'knex';

type Db = Knex | Knex.Transaction;

export interface LeaseRow {
  name: string;
  holder: string;
  expires_at: number;
}

/** The rows a RETURNING statement gave back, as `pg` and better-sqlite3 each hand them to knex.raw. */
function returned(result: unknown): unknown[] {
  return Array.isArray(result) ? result : ((result as { rows?: unknown[] }).rows ?? []);
}

/**
 * Takes or renews the lease in one statement: inserted when nobody holds it, extended when `holder`
 * already does or the current lease has expired, untouched otherwise. True when `holder` holds it now.
 * (`INSERT … ON CONFLICT … DO UPDATE … WHERE` and RETURNING are spelled the same on SQLite ≥ 3.35 and PostgreSQL.)
 */
export async function takeLease(db: Db, name: string, holder: string, now: number, ttlMs: number): Promise<boolean> {
  const result = await db.raw(
    `INSERT INTO job_leases (name, holder, expires_at) VALUES (?, ?, ?)
       ON CONFLICT (name) DO UPDATE SET holder = excluded.holder, expires_at = excluded.expires_at
       WHERE job_leases.holder = excluded.holder OR job_leases.expires_at <= ?
     RETURNING holder`,
    [name, holder, now + ttlMs, now],
  );
  return returned(result).length === 1;
}

/** Takes the lease from `from` (a holder known to be gone), only if `from` still holds it. */
export async function takeLeaseFrom(db: Db, name: string, from: string, holder: string, now: number, ttlMs: number): Promise<boolean> {
  const changed = await db('job_leases')
    .where({ name, holder: from })
    .update({ holder, expires_at: now + ttlMs });
  return changed === 1;
}

export const findLease = (db: Db, name: string) => db<LeaseRow>('job_leases').where({ name }).first();

/** Gives the lease up (a clean shutdown), so another instance takes the job at once. */
export const releaseLease = (db: Db, name: string, holder: string) => db('job_leases').where({ name, holder }).delete();
