// Data access of the auth component: sessions, throttle buckets and one-time links (Knex only here).
import type { Knex } from 'knex';
import type { Role } from './roles';

type Db = Knex | Knex.Transaction;

export interface UserRow {
  id: string;
  email: string;
  name: string;
  role: Role;
  password_hash: string | null;
  disabled_at: string | null;
  created_at: string;
}

export const findUserByEmail = (db: Db, email: string) => db<UserRow>('user').where({ email }).first();
export const findUserById = (db: Db, id: string) => db<UserRow>('user').where({ id }).first();
export const setPasswordHash = (db: Db, id: string, hash: string) => db('user').where({ id }).update({ password_hash: hash });

// --- sessions -------------------------------------------------------------------------------------

export interface SessionRow {
  id: string;
  user_id: string;
  created_at: number;
  expires_at: number;
  idle_expires_at: number;
}

export const insertSession = (db: Db, row: SessionRow) => db('session').insert(row);
export const userSessions = (db: Db, userId: string) => db<SessionRow>('session').where({ user_id: userId });

/** The session and its user in one indexed lookup: the check every signed-in request makes. */
export function findSessionWithUser(db: Db, id: string) {
  return db('session')
    .join('user', 'user.id', 'session.user_id')
    .where('session.id', id)
    .first<(SessionRow & Pick<UserRow, 'email' | 'name' | 'role' | 'disabled_at'>) | undefined>(
      'session.id',
      'session.user_id',
      'session.created_at',
      'session.expires_at',
      'session.idle_expires_at',
      'user.email',
      'user.name',
      'user.role',
      'user.disabled_at',
    );
}

export const touchSession = (db: Db, id: string, idleExpiresAt: number) => db('session').where({ id }).update({ idle_expires_at: idleExpiresAt });
export const deleteSession = (db: Db, id: string) => db('session').where({ id }).delete();
export const deleteUserSessions = (db: Db, userId: string) => db('session').where({ user_id: userId }).delete();

/** Ends the user's oldest sessions so that at most `keep` remain. */
export async function trimUserSessions(db: Db, userId: string, keep: number): Promise<number> {
  const keepIds = db('session')
    .where({ user_id: userId })
    .orderBy([
      { column: 'created_at', order: 'desc' },
      { column: 'id', order: 'desc' },
    ])
    .limit(keep)
    .select('id');
  return db('session').where({ user_id: userId }).whereNotIn('id', keepIds).delete();
}

export const deleteExpiredSessions = (db: Db, now: number) =>
  db('session').where('expires_at', '<=', now).orWhere('idle_expires_at', '<=', now).delete();

// --- throttle buckets -----------------------------------------------------------------------------

export interface BucketRow {
  key: string;
  failures: number;
  last_failure_at: number;
}

export const findBuckets = (db: Db, keys: string[]) => db<BucketRow>('throttle_bucket').whereIn('key', keys);

/**
 * Makes sure each key has a row. As the first statement of a transaction it is a write, so SQLite takes
 * the write lock before anything is read: another process counting the same key waits (busy timeout)
 * instead of reading a count that is about to change.
 */
export const ensureBuckets = (db: Db, keys: string[], now: number) =>
  db('throttle_bucket')
    .insert(keys.map((key) => ({ key, failures: 0, last_failure_at: now })))
    .onConflict('key')
    .ignore();

export const saveBucket = (db: Db, row: BucketRow) => db('throttle_bucket').insert(row).onConflict('key').merge();

export const deleteBucket = (db: Db, key: string) => db('throttle_bucket').where({ key }).delete();

/** Gives one counted attempt back to each key (one statement, so nothing can interleave). */
export const giveBackAttempt = (db: Db, keys: string[]) =>
  db('throttle_bucket').whereIn('key', keys).where('failures', '>', 0).decrement('failures', 1);

export const deleteBucketsOlderThan = (db: Db, before: number) => db('throttle_bucket').where('last_failure_at', '<', before).delete();

// --- one-time links (invitations and password resets) ---------------------------------------------

export type LinkKind = 'invite' | 'reset';

export interface LinkRow {
  id: number;
  user_id: string;
  kind: LinkKind;
  token_hash: string;
  expires_at: string;
  used_at: string | null;
  revoked_at: string | null;
  created_at: string;
}

export const findLinkByTokenHash = (db: Db, tokenHash: string) => db<LinkRow>('invite').where({ token_hash: tokenHash }).first();

export const insertLink = (db: Db, row: Omit<LinkRow, 'id' | 'used_at' | 'revoked_at'>) => db('invite').insert(row);

/** Marks a link used; the `used_at IS NULL` guard lets exactly one of two concurrent uses win. */
export const claimLink = (db: Db, id: number, at: string) =>
  db('invite').where({ id }).whereNull('used_at').whereNull('revoked_at').update({ used_at: at });

/** Withdraws every open link of a user (of one kind, or all kinds). */
export function revokeOpenLinks(db: Db, userId: string, at: string, kind?: LinkKind) {
  const q = db('invite').where({ user_id: userId }).whereNull('used_at').whereNull('revoked_at');
  return (kind ? q.where({ kind }) : q).update({ revoked_at: at });
}

/** The newest invitation of each listed user, to show its state on the Team screen. */
export async function latestInvites(db: Db, userIds: string[]): Promise<Map<string, LinkRow>> {
  if (!userIds.length) return new Map();
  const rows = await db<LinkRow>('invite').whereIn('user_id', userIds).where({ kind: 'invite' }).orderBy('id');
  return new Map(rows.map((r) => [r.user_id, r]));
}
