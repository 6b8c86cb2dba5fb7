import { createHash, randomBytes } from 'node:crypto';
import type { Knex } from 'knex';
import type { Clock } from '../clock';
import { claimLink, findLinkByTokenHash, findUserById, insertLink, revokeOpenLinks, type LinkKind, type LinkRow } from './store';

type Db = Knex | Knex.Transaction;

/** How long a one-time link works: an invitation a week, a password reset an hour. */
const LINK_LIFETIME_MS: Record<LinkKind, number> = { invite: 7 * 24 * 3600_000, reset: 3600_000 };

const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

/** A fresh one-time link for the user; any earlier open link of the same kind stops working. */
export async function issueLink(trx: Db, clock: Clock, userId: string, kind: LinkKind): Promise<{ token: string; expiresAt: Date }> {
  const token = randomBytes(32).toString('base64url');
  const now = new Date(clock.now());
  const expiresAt = new Date(now.getTime() + LINK_LIFETIME_MS[kind]);
  await revokeOpenLinks(trx, userId, now.toISOString(), kind);
  await insertLink(trx, { user_id: userId, kind, token_hash: hashToken(token), expires_at: expiresAt.toISOString(), created_at: now.toISOString() });
  return { token, expiresAt };
}

type LinkState = { ok: true; link: LinkRow; user: { id: string; email: string; name: string } } | { ok: false; reason: string };

const ASK_AGAIN: Record<LinkKind, string> = {
  invite: 'Ask your administrator for a new invitation.',
  reset: 'Ask for a new link with "Forgot password?" on the sign-in page.',
};

/** Whether a link's token still works, and if not, why (the token is the secret, so saying why leaks nothing). */
export async function linkState(db: Db, clock: Clock, token: string): Promise<LinkState> {
  const link = await findLinkByTokenHash(db, hashToken(token));
  if (!link) return { ok: false, reason: 'This link is not valid. Check that it was copied whole, or ask for a new one.' };
  if (link.used_at) return { ok: false, reason: `This link was already used. Sign in with the password you chose, or: ${ASK_AGAIN[link.kind]}` };
  if (link.revoked_at)
    return { ok: false, reason: `This link was withdrawn (a newer one was sent, or the invitation was revoked). ${ASK_AGAIN[link.kind]}` };
  if (link.expires_at <= new Date(clock.now()).toISOString()) return { ok: false, reason: `This link has expired. ${ASK_AGAIN[link.kind]}` };
  const user = await findUserById(db, link.user_id);
  if (!user || user.disabled_at) return { ok: false, reason: 'This account is disabled.' };
  return { ok: true, link, user: { id: user.id, email: user.email, name: user.name } };
}

/** Uses a link once: exactly one of two concurrent uses wins; every other open link of the user dies with it. */
export async function consumeLink(trx: Knex.Transaction, clock: Clock, link: LinkRow): Promise<boolean> {
  const at = new Date(clock.now()).toISOString();
  if (!(await claimLink(trx, link.id, at))) return false;
  await revokeOpenLinks(trx, link.user_id, at);
  return true;
}
