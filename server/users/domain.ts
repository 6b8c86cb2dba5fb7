import { randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import type { InviteUserInput } from '../../shared/schema/auth';
import { appendAudit } from '../audit/chain';
import { issueLink } from '../auth/links';
import type { SignedInUser } from '../auth/middleware';
import { latestInvites, revokeOpenLinks, type LinkRow, type UserRow } from '../auth/store';
import type { AppContext } from '../context';
import { AppError, conflict, notFound } from '../errors';
import { queueMail } from '../mail/mailer';
import { findUser, findUserByEmail, insertUser, listUsers, updateUser } from './store';

/** Where a person's invitation stands: null once they chose a password. */
type InviteStatus = 'open' | 'expired' | 'revoked' | 'used' | null;

export interface TeamMember {
  id: string;
  email: string;
  name: string;
  role: UserRow['role'];
  disabled: boolean;
  invitePending: boolean;
  invite: { status: Exclude<InviteStatus, null>; expiresAt: string } | null;
  createdAt: string;
}

function toMember(row: UserRow, invite: LinkRow | undefined, now: string): TeamMember {
  const pending = row.password_hash === null;
  const status = !invite ? null : invite.used_at ? 'used' : invite.revoked_at ? 'revoked' : invite.expires_at <= now ? 'expired' : 'open';
  return {
    id: row.id,
    email: row.email,
    name: row.name,
    role: row.role,
    disabled: row.disabled_at !== null,
    invitePending: pending,
    invite: pending && status ? { status, expiresAt: invite!.expires_at } : null,
    createdAt: row.created_at,
  };
}

export async function listTeam(ctx: AppContext): Promise<TeamMember[]> {
  const rows = await listUsers(ctx.db);
  const invites = await latestInvites(
    ctx.db,
    rows.map((r) => r.id),
  );
  const now = new Date(ctx.clock.now()).toISOString();
  return rows.map((r) => toMember(r, invites.get(r.id), now));
}

async function teamMember(ctx: AppContext, id: string): Promise<TeamMember> {
  const row = await findUser(ctx.db, id);
  if (!row) throw notFound('User');
  const invites = await latestInvites(ctx.db, [id]);
  return toMember(row, invites.get(id), new Date(ctx.clock.now()).toISOString());
}

/** Issues an invitation link and queues its e-mail in the caller's transaction. */
async function sendInvite(
  ctx: AppContext,
  trx: Knex.Transaction,
  admin: SignedInUser,
  user: Pick<UserRow, 'id' | 'email' | 'name' | 'role'>,
): Promise<void> {
  const { token, expiresAt } = await issueLink(trx, ctx.clock, user.id, 'invite');
  await queueMail(trx, user.email, 'invite', {
    name: user.name,
    role: user.role,
    invitedBy: admin.name,
    organisation: ctx.config.organisation,
    link: `${ctx.baseUrl}/set-password?token=${token}`,
    expires: expiresAt.toUTCString(),
  });
}

/** inviteUser: a new account without a password, a one-time link by e-mail, audited. */
export async function inviteUser(ctx: AppContext, admin: SignedInUser, input: InviteUserInput): Promise<TeamMember> {
  if (await findUserByEmail(ctx.db, input.email)) {
    throw new AppError(409, 'conflict', 'An account with this e-mail already exists.', [{ path: 'email', message: 'already in use' }]);
  }
  const user = { id: randomUUID(), ...input };
  await ctx.db.transaction(async (trx) => {
    await insertUser(trx, { ...user, password_hash: null, disabled_at: null, created_at: new Date(ctx.clock.now()).toISOString() });
    await sendInvite(ctx, trx, admin, user);
    await appendAudit(trx, {
      actorId: admin.id,
      action: 'user.invite',
      subjectType: 'user',
      subjectId: user.id,
      payload: { email: input.email, role: input.role },
    });
  });
  ctx.kickMail();
  return teamMember(ctx, user.id);
}

async function pendingUser(ctx: AppContext, id: string): Promise<UserRow> {
  const user = await findUser(ctx.db, id);
  if (!user) throw notFound('User');
  if (user.password_hash !== null) throw conflict(`${user.name} has already chosen a password; they can use "Forgot password?" on the sign-in page.`);
  if (user.disabled_at) throw conflict(`${user.name}'s account is disabled; enable it before inviting again.`);
  return user;
}

/** resendInvite: a fresh one-time link by e-mail; the earlier link stops working. */
export async function resendInvite(ctx: AppContext, admin: SignedInUser, id: string): Promise<TeamMember> {
  const user = await pendingUser(ctx, id);
  await ctx.db.transaction(async (trx) => {
    await sendInvite(ctx, trx, admin, user);
    await appendAudit(trx, { actorId: admin.id, action: 'user.invite_resent', subjectType: 'user', subjectId: user.id });
  });
  ctx.kickMail();
  return teamMember(ctx, user.id);
}

/** revokeInvite: every open invitation link of the person stops working; the account stays, without a password. */
export async function revokeInvite(ctx: AppContext, admin: SignedInUser, id: string): Promise<TeamMember> {
  const user = await pendingUser(ctx, id);
  await ctx.db.transaction(async (trx) => {
    const revoked = await revokeOpenLinks(trx, user.id, new Date(ctx.clock.now()).toISOString(), 'invite');
    if (!revoked) throw conflict(`${user.name} has no open invitation to revoke.`);
    await appendAudit(trx, { actorId: admin.id, action: 'user.invite_revoked', subjectType: 'user', subjectId: user.id });
  });
  return teamMember(ctx, user.id);
}

/** updateMember: role or disabled; nobody disables themself or drops their own admin role; a disabled user's sessions end at once. */
export async function updateMember(
  ctx: AppContext,
  admin: SignedInUser,
  id: string,
  patch: { role?: UserRow['role']; disabled?: boolean },
): Promise<TeamMember> {
  const target = await findUser(ctx.db, id);
  if (!target) throw notFound('User');
  if (target.id === admin.id && (patch.disabled || (patch.role && patch.role !== 'admin'))) {
    throw conflict('You cannot disable yourself or remove your own admin role.');
  }
  const changes: Partial<Pick<UserRow, 'role' | 'disabled_at'>> = {};
  if (patch.role) changes.role = patch.role;
  if (patch.disabled !== undefined) changes.disabled_at = patch.disabled ? new Date(ctx.clock.now()).toISOString() : null;
  await ctx.db.transaction(async (trx) => {
    await updateUser(trx, target.id, changes);
    if (patch.disabled) await ctx.sessions.endAllFor(target.id, trx);
    await appendAudit(trx, { actorId: admin.id, action: 'user.update', subjectType: 'user', subjectId: target.id, payload: patch });
  });
  return teamMember(ctx, target.id);
}
