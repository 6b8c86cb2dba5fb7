import { createHash, randomBytes } from 'node:crypto';
import { Lucia, TimeSpan, type Adapter, type DatabaseSession, type DatabaseUser } from 'lucia';
import type { Clock } from '../clock';
import type { Config } from '../config';
import type { Db } from '../db/knex';
import type { Role } from './roles';
import {
  deleteExpiredSessions,
  deleteSession,
  deleteUserSessions,
  findSessionWithUser,
  insertSession,
  touchSession,
  trimUserSessions,
  userSessions,
} from './store';

export interface SessionUser {
  id: string;
  email: string;
  name: string;
  role: Role;
}

// The idle expiry is written at most once a minute per session, not on every request; the idle
// timeout is therefore exact to within this step.
const TOUCH_STEP_MS = 60_000;

const sha256 = (token: string) => createHash('sha256').update(token).digest('hex');

interface SessionAttributes {
  created_at: number;
  idle_expires_at: number;
}

interface UserAttributes {
  email: string;
  name: string;
  role: Role;
  disabled_at: string | null;
}

/**
 * lucia's storage through the app's Knex pool, with what ASVS level 2 asks beyond lucia's defaults:
 * - only the token's SHA-256 is stored, so a copy of the database holds no usable session;
 * - the lifetime is absolute: lucia's sliding extension is refused (`updateSessionExpiration` keeps the
 *   stored end), and an idle expiry travels in the session attributes;
 * - expiry is judged on the injected clock. lucia compares with the system clock, so the adapter hands it
 *   the remaining lifetime measured on ours, mapped onto the system clock.
 */
function knexAdapter(db: Db, clock: Clock, absoluteMs: number): Adapter {
  const onSystemClock = (at: number) => new Date(Date.now() + (at - clock.now()));
  return {
    async getSessionAndUser(token) {
      const row = await findSessionWithUser(db, sha256(token));
      if (!row) return [null, null];
      const session: DatabaseSession = {
        id: token,
        userId: row.user_id,
        expiresAt: onSystemClock(row.expires_at),
        attributes: { created_at: row.created_at, idle_expires_at: row.idle_expires_at },
      };
      const user: DatabaseUser = { id: row.user_id, attributes: { email: row.email, name: row.name, role: row.role, disabled_at: row.disabled_at } };
      return [session, user];
    },
    async getUserSessions(userId) {
      return (await userSessions(db, userId)).map((row) => ({
        id: row.id,
        userId: row.user_id,
        expiresAt: onSystemClock(row.expires_at),
        attributes: { created_at: row.created_at, idle_expires_at: row.idle_expires_at },
      }));
    },
    async setSession(session) {
      const { created_at, idle_expires_at } = session.attributes as SessionAttributes;
      await insertSession(db, { id: sha256(session.id), user_id: session.userId, created_at, expires_at: created_at + absoluteMs, idle_expires_at });
    },
    async updateSessionExpiration() {
      // The absolute lifetime never moves (ASVS 3.3.2); activity moves only the idle expiry.
    },
    async deleteSession(token) {
      await deleteSession(db, sha256(token));
    },
    async deleteUserSessions(userId) {
      await deleteUserSessions(db, userId);
    },
    async deleteExpiredSessions() {
      await deleteExpiredSessions(db, clock.now());
    },
  };
}

function createLucia(db: Db, clock: Clock, policy: Config['sessions'], secureCookie: boolean) {
  return new Lucia(knexAdapter(db, clock, policy.absoluteMs), {
    // The cookie's Max-Age is the absolute lifetime (lucia sets it from sessionExpiresIn).
    sessionExpiresIn: new TimeSpan(Math.floor(policy.absoluteMs / 1000), 's'),
    sessionCookie: {
      // The __Host- prefix (only valid with Secure) pins the cookie to this host and path "/".
      name: secureCookie ? '__Host-voltfall_session' : 'voltfall_session',
      attributes: { secure: secureCookie, sameSite: 'lax' },
    },
    getSessionAttributes: (attributes) => attributes,
    getUserAttributes: (attributes) => attributes,
  });
}

type AuthLucia = ReturnType<typeof createLucia>;

declare module 'lucia' {
  interface Register {
    Lucia: AuthLucia;
    DatabaseSessionAttributes: SessionAttributes;
    DatabaseUserAttributes: UserAttributes;
  }
}

/**
 * Cookie sessions (ASVS V3) on lucia: a random 256-bit token in an HttpOnly, SameSite=Lax cookie whose
 * Max-Age is the absolute lifetime; an idle expiry that activity moves forward; at most `perUser`
 * sessions a user, signing in again ends the oldest. `sessionId` handed to callers is the stored hash,
 * never the token.
 */
export class Sessions {
  readonly cookieName: string;
  private readonly lucia: AuthLucia;

  constructor(
    private readonly db: Db,
    private readonly clock: Clock,
    private readonly policy: Config['sessions'],
    secureCookie: boolean,
  ) {
    this.lucia = createLucia(db, clock, policy, secureCookie);
    this.cookieName = this.lucia.sessionCookieName;
  }

  async create(userId: string): Promise<{ token: string; cookie: string }> {
    const token = randomBytes(32).toString('base64url');
    const now = this.clock.now();
    await this.lucia.createSession(userId, { created_at: now, idle_expires_at: now + this.policy.idleMs }, { sessionId: token });
    await trimUserSessions(this.db, userId, this.policy.perUser);
    return { token, cookie: this.lucia.createSessionCookie(token).serialize() };
  }

  /** The signed-in user for a cookie token, or null when the session is unknown, expired, idle too long or its user disabled. */
  async validate(token: string): Promise<{ sessionId: string; user: SessionUser } | null> {
    const { session, user } = await this.lucia.validateSession(token);
    if (!session || !user) return null;
    const now = this.clock.now();
    if (now >= session.idle_expires_at || user.disabled_at) {
      await this.lucia.invalidateSession(token);
      return null;
    }
    const absoluteEnd = session.created_at + this.policy.absoluteMs;
    const idleExpiresAt = Math.min(now + this.policy.idleMs, absoluteEnd);
    const id = sha256(token);
    if (idleExpiresAt - session.idle_expires_at >= TOUCH_STEP_MS) await touchSession(this.db, id, idleExpiresAt);
    return { sessionId: id, user: { id: user.id, email: user.email, name: user.name, role: user.role } };
  }

  /** Ends one session, named by its stored hash (what `validate` hands out). */
  end(sessionId: string) {
    return deleteSession(this.db, sessionId);
  }

  endAllFor(userId: string, db: Db = this.db) {
    return deleteUserSessions(db, userId);
  }

  /** Deletes expired and idle sessions; the periodic sweep calls it. */
  sweep(): Promise<number> {
    return deleteExpiredSessions(this.db, this.clock.now());
  }

  readToken(cookieHeader: string | undefined): string | null {
    return this.lucia.readSessionCookie(cookieHeader ?? '');
  }

  blankCookie(): string {
    return this.lucia.createBlankSessionCookie().serialize();
  }
}
