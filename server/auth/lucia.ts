import { Lucia, type Adapter, type DatabaseSession, type DatabaseUser } from 'lucia';
import type { Db } from '../db/knex';

import type { ROLE_NAMES } from '../../shared/schema/auth';

export type Role = (typeof ROLE_NAMES)[number];

interface UserRow {
  id: string;
  email: string;
  name: string;
  role: Role;
  disabled_at: string | null;
}

/**
 * Session storage through the app's own Knex pool. The packaged SQLite adapter wants a second
 * better-sqlite3 connection; a synchronous write there while a Knex transaction is open on the
 * first would block the only thread until the busy timeout, so everything goes through one pool.
 */
function knexAdapter(db: Db): Adapter {
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
    // Every API request asks this: one query over both primary keys.
    async getSessionAndUser(sessionId) {
      const row = await db('session')
        .join('user', 'user.id', 'session.user_id')
        .where('session.id', sessionId)
        .first('session.id as session_id', 'session.user_id', 'session.expires_at', 'user.email', 'user.name', 'user.role', 'user.disabled_at');
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

export function createLucia(db: Db, secureCookie: boolean) {
  return new Lucia(knexAdapter(db), {
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
