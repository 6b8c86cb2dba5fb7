import { createHash, randomBytes } from 'node:crypto';
import { parseCookies, serializeCookie } from 'oslo/cookie';
import type { Clock } from '../clock';
import type { Config } from '../config';
import type { Db } from '../db/knex';
import type { Role } from './roles';
import { deleteExpiredSessions, deleteSession, deleteUserSessions, findSessionWithUser, insertSession, touchSession, trimUserSessions } from './store';

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

/**
 * Cookie sessions (ASVS V3): a random 256-bit token in an HttpOnly, SameSite=Lax cookie whose Max-Age is
 * the absolute lifetime; the database keeps only the token's SHA-256, an absolute expiry and an idle
 * expiry that activity moves forward. A user holds at most `perUser` sessions; signing in again ends
 * the oldest.
 */
export class Sessions {
  readonly cookieName: string;

  constructor(
    private readonly db: Db,
    private readonly clock: Clock,
    private readonly policy: Config['sessions'],
    private readonly secureCookie: boolean,
  ) {
    // The __Host- prefix (only valid with Secure) pins the cookie to this host and path "/".
    this.cookieName = secureCookie ? '__Host-voltfall_session' : 'voltfall_session';
  }

  async create(userId: string): Promise<{ token: string; cookie: string }> {
    const token = randomBytes(32).toString('base64url');
    const now = this.clock.now();
    await this.db.transaction(async (trx) => {
      await insertSession(trx, {
        id: sha256(token),
        user_id: userId,
        created_at: now,
        expires_at: now + this.policy.absoluteMs,
        idle_expires_at: now + this.policy.idleMs,
      });
      await trimUserSessions(trx, userId, this.policy.perUser);
    });
    return { token, cookie: this.cookie(token, Math.floor(this.policy.absoluteMs / 1000)) };
  }

  /** The signed-in user for a cookie token, or null when the session is unknown, expired or its user disabled. */
  async validate(token: string): Promise<{ sessionId: string; user: SessionUser } | null> {
    const id = sha256(token);
    const row = await findSessionWithUser(this.db, id);
    if (!row) return null;
    const now = this.clock.now();
    if (now >= row.expires_at || now >= row.idle_expires_at || row.disabled_at) {
      await deleteSession(this.db, id);
      return null;
    }
    const idleExpiresAt = Math.min(now + this.policy.idleMs, row.expires_at);
    if (idleExpiresAt - row.idle_expires_at >= TOUCH_STEP_MS) await touchSession(this.db, id, idleExpiresAt);
    return { sessionId: id, user: { id: row.user_id, email: row.email, name: row.name, role: row.role } };
  }

  end(sessionId: string) {
    return deleteSession(this.db, sessionId);
  }

  endAllFor(userId: string, db: Db = this.db) {
    return deleteUserSessions(db, userId);
  }

  /** Deletes expired sessions; the periodic sweep calls it. */
  sweep(): Promise<number> {
    return deleteExpiredSessions(this.db, this.clock.now());
  }

  readToken(cookieHeader: string | undefined): string | null {
    if (!cookieHeader) return null;
    return parseCookies(cookieHeader).get(this.cookieName) ?? null;
  }

  blankCookie(): string {
    return this.cookie('', 0);
  }

  private cookie(value: string, maxAgeSeconds: number): string {
    return serializeCookie(this.cookieName, value, { httpOnly: true, secure: this.secureCookie, sameSite: 'lax', path: '/', maxAge: maxAgeSeconds });
  }
}
