import { appendAudit } from '../audit/chain';
import type { AppContext } from '../context';
import { AppError } from '../errors';
import { queueMail } from '../mail/mailer';
import { consumeLink, issueLink, linkState } from './links';
import { passwordProblem } from './password-policy';
import { dummyPasswordHash, hashPassword, verifyPassword } from './passwords';
import type { SessionUser } from './sessions';
import { findUserByEmail, findUserById, setPasswordHash } from './store';
import { tooManyAttempts, type ThrottleKey } from './throttle';

const badCredentials = () => new AppError(401, 'bad_credentials', 'E-mail or password is not correct.');

/**
 * signIn: count the attempt against the account and the address (refuse while either waits), verify
 * the password with the same Argon2id work whether or not the account exists, clear the account's
 * failures, open a session, audit.
 */
export async function signIn(ctx: AppContext, email: string, password: string, address: string): Promise<{ user: SessionUser; cookie: string }> {
  const keys = ctx.throttle.signInKeys(email, address);
  await reserveOrRefuse(ctx, keys, 'sign-in attempts');
  const user = await findUserByEmail(ctx.db, email);
  const valid = await verifyPassword(user?.password_hash ?? (await dummyPasswordHash()), password);
  if (!user || !user.password_hash || !valid || user.disabled_at) {
    ctx.log.info({ event: 'sign_in_failed', userId: user?.id ?? null }, 'sign-in refused');
    throw badCredentials();
  }
  await ctx.throttle.succeeded(keys);
  const { cookie } = await ctx.sessions.create(user.id);
  await appendAudit(ctx.db, { actorId: user.id, action: 'user.sign_in', subjectType: 'user', subjectId: user.id });
  return { user: { id: user.id, email: user.email, name: user.name, role: user.role }, cookie };
}

/**
 * confirmSignature: approving re-authenticates the reviewer (an electronic signature). A missing or
 * wrong password answers 401 on the password field and counts against the same throttle as sign-in.
 */
export async function confirmSignature(ctx: AppContext, user: SessionUser, password: string | undefined, address: string): Promise<void> {
  const keys = ctx.throttle.signInKeys(user.email, address);
  await reserveOrRefuse(ctx, keys, 'signing attempts');
  const row = await findUserById(ctx.db, user.id);
  const valid = !!password && !!row?.password_hash && (await verifyPassword(row.password_hash, password));
  if (!valid) {
    ctx.log.info({ event: 'signature_refused', userId: user.id }, 'approval signature refused');
    throw new AppError(401, 'signature_refused', 'Approving is a signature: enter your own password to sign.', [
      { path: 'password', message: password ? 'The password is not correct.' : 'Enter your password to sign.' },
    ]);
  }
  await ctx.throttle.succeeded(keys);
}

/** The forgot-password answer: the same whatever the e-mail, so it tells nobody which accounts exist. */
export const RESET_REQUESTED = {
  ok: true,
  message: 'If an active account has this e-mail address, a link to choose a new password is on its way. It works once, for one hour.',
} as const;

/** Refuses a client address that asks for reset links too often (429); the rest happens after the answer. */
export async function admitResetRequest(ctx: AppContext, address: string): Promise<void> {
  const verdict = await ctx.throttle.reserve([{ key: `reset-address:${address}`, rule: ctx.throttle.rules.address }]);
  if (!verdict.ok) throw tooManyAttempts(verdict.retryAfterMs, 'reset requests');
}

/**
 * sendResetLink: at most a few links an hour per account (the rest are dropped silently), and only
 * for an enabled account that has a password (a pending invitation is the admin's to resend); the new
 * link replaces any earlier reset link; queued with its audit event.
 */
export async function sendResetLink(ctx: AppContext, email: string): Promise<void> {
  const verdict = await ctx.throttle.reserve([{ key: `reset-account:${email}`, rule: ctx.throttle.rules.resetAccount }]);
  if (!verdict.ok) return;
  const user = await findUserByEmail(ctx.db, email);
  if (!user || user.disabled_at || !user.password_hash) return;
  await ctx.db.transaction(async (trx) => {
    const { token, expiresAt } = await issueLink(trx, ctx.clock, user.id, 'reset');
    await queueMail(trx, user.email, 'password-reset', {
      name: user.name,
      email: user.email,
      organisation: ctx.config.organisation,
      link: `${ctx.baseUrl}/set-password?token=${token}`,
      expires: expiresAt.toUTCString(),
    });
    await appendAudit(trx, { actorId: null, action: 'user.reset_requested', subjectType: 'user', subjectId: user.id });
  });
  ctx.kickMail();
}

/** What the set-password page shows before the password is chosen. */
export async function describeLink(ctx: AppContext, token: string) {
  const state = await linkState(ctx.db, ctx.clock, token);
  if (!state.ok) throw new AppError(410, 'link_unusable', state.reason);
  return { email: state.user.email, name: state.user.name, kind: state.link.kind };
}

/**
 * setPasswordWithLink: the link must still work, the password must be hard to guess for this account;
 * then the link is used (once), the password stored, every other open link withdrawn and every
 * session of the user ended.
 */
export async function setPasswordWithLink(ctx: AppContext, token: string, password: string): Promise<{ email: string }> {
  const state = await linkState(ctx.db, ctx.clock, token);
  if (!state.ok) throw new AppError(410, 'link_unusable', state.reason);
  const problem = passwordProblem(password, { name: state.user.name, email: state.user.email, organisation: ctx.config.organisation });
  if (problem) throw new AppError(400, 'weak_password', 'Choose a harder password.', [{ path: 'password', message: problem }]);
  const hash = await hashPassword(password);
  await ctx.db.transaction(async (trx) => {
    if (!(await consumeLink(trx, ctx.clock, state.link))) throw new AppError(410, 'link_unusable', 'This link was already used.');
    await setPasswordHash(trx, state.user.id, hash);
    await ctx.sessions.endAllFor(state.user.id, trx);
    await appendAudit(trx, {
      actorId: state.user.id,
      action: state.link.kind === 'reset' ? 'user.reset_password' : 'user.set_password',
      subjectType: 'user',
      subjectId: state.user.id,
    });
  });
  return { email: state.user.email };
}

async function reserveOrRefuse(ctx: AppContext, keys: ThrottleKey[], what: string): Promise<void> {
  const verdict = await ctx.throttle.reserve(keys);
  if (!verdict.ok) {
    ctx.log.warn({ event: 'throttled', what }, 'attempt refused by the throttle');
    throw tooManyAttempts(verdict.retryAfterMs, what);
  }
}
