import Database from 'better-sqlite3';
import { Lucia, type Adapter, type DatabaseSession, type DatabaseUser } from 'lucia';
import { BUSY_TIMEOUT_MS, databaseFile, type Db } from '../db/knex';
import type { ROLE_NAMES } from '../../shared/schema/auth';

export type Role = (typeof ROLE_NAMES)[number];

interface UserRow {
  id: string;
  email: string;
  name: string;
  role: Role;
  disabled_at: string | null;
}

interface SessionRow extends Omit<UserRow, 'id'> {
  session_id: string;
  user_id: string;
  expires_at: number;
}

/**
 * Every API request looks its session up, so that one read is a single prepared statement over both
 * primary keys on a read-only connection of its own: through Knex, building the query cost about ten
 * times the lookup (measured). In WAL mode it reads the last commit without waiting for a writer.
 */
export interface SessionReader {
  read(sessionId: string): SessionRow | undefined;
  close(): void;
}

export function openSessionReader(dataDir: string): SessionReader {
  const conn = new Database(databaseFile(dataDir), { readonly: true, fileMustExist: true });
  conn.pragma(`busy_timeout = ${BUSY_TIMEOUT_MS}`);
  const statement = conn.prepare<[string], SessionRow>(
    `SELECT session.id AS session_id, session.user_id, session.expires_at, user.email, user.name, user.role, user.disabled_at
     FROM session JOIN user ON user.id = session.user_id WHERE session.id = ?`,
  );
  return { read: (sessionId) => statement.get(sessionId), close: () => conn.close() };
}

/**
 * Session storage: writes through the app's own Knex pool, the lookup through the session reader. The
 * packaged SQLite adapter writes on a second better-sqlite3 connection; a synchronous write there while
 * a Knex transaction is open on the first would block the only thread until the busy timeout, so every
 * write goes through the one pool, and only the read-only lookup (which never waits for the write lock
 * in WAL mode) has its own connection.
 */
function knexAdapter(db: Db, sessions: SessionReader): Adapter {
  const toSession = (row: { id: string; user_id: string; expires_at: number }): DatabaseSession => ({
    id: row.id,
    userId: row.user_id,
    expiresAt: new Date(row.expires_at * 1000),
    attributes: {},
  });
  const toUser = (row: UserRow): DatabaseUser => ({
    id: row.id,
    attributes: { email: row.email, name: row.name, role: row.role, disabled_at: row.disabled_at },
  });
  return {
    async getSessionAndUser(sessionId) {
      const row = sessions.read(sessionId);
      if (!row) return [null, null];
      return [toSession({ id: row.session_id, user_id: row.user_id, expires_at: row.expires_at }), toUser({ id: row.user_id, ...row })];
    },
    async getUserSessions(userId) {
      return (await db('session').where({ user_id: userId })).map(toSession);
    },
    async setSession(session) {
      await db('session').insert({
        id: session.id,
        user_id: session.userId,
        expires_at: Math.floor(session.expiresAt.getTime() / 1000),
      });
    },
    async updateSessionExpiration(sessionId, expiresAt) {
      await db('session').where({ id: sessionId }).update({ expires_at: Math.floor(expiresAt.getTime() / 1000) });
    },
    async deleteSession(sessionId) {
      await db('session').where({ id: sessionId }).delete();
    },
    async deleteUserSessions(userId) {
      await db('session').where({ user_id: userId }).delete();
    },
    async deleteExpiredSessions() {
      await db('session').where('expires_at', '<=', Math.floor(Date.now() / 1000)).delete();
    },
  };
}

export function createLucia(db: Db, sessions: SessionReader, secureCookie: boolean) {
  return new Lucia(knexAdapter(db, sessions), {
    sessionCookie: { name: 'voltfall_session', attributes: { secure: secureCookie, sameSite: 'lax' } },
    getUserAttributes: (attributes) => ({
      email: attributes.email,
      name: attributes.name,
      role: attributes.role,
      disabled: attributes.disabled_at !== null,
    }),
  });
}

export type AuthLucia = ReturnType<typeof createLucia>;

declare module 'lucia' {
  interface Register {
    Lucia: AuthLucia;
    DatabaseUserAttributes: Omit<UserRow, 'id'>;
  }
}
