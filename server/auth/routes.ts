import { createHash } from 'node:crypto';
import { Router } from 'express';
import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import { z } from 'zod';
import { setPasswordSchema, signInSchema } from '../../shared/schema/auth';
import { appendAudit } from '../audit/chain';
import type { AppContext } from '../context';
import { AppError, validationError } from '../errors';
import { allow, currentUser } from './middleware';
import { dummyPasswordHash, hashPassword, verifyPassword } from './passwords';


export const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

type InviteState = { ok: true; userId: string; inviteId: number; email: string; name: string } | { ok: false; reason: string };

async function inviteState(ctx: AppContext, token: string): Promise<InviteState> {
  const invite = await ctx.db('invite').where({ token_hash: hashToken(token) }).first();
  if (!invite) return { ok: false, reason: 'This link is not valid. Ask your administrator for a new invitation.' };
  if (invite.used_at) return { ok: false, reason: 'This link was already used. Sign in with the password you chose, or ask for a new invitation.' };
  if (invite.expires_at < new Date().toISOString()) return { ok: false, reason: 'This link has expired. Ask your administrator for a new invitation.' };
  const user = await ctx.db('user').where({ id: invite.user_id }).first();
  if (!user || user.disabled_at) return { ok: false, reason: 'This account is disabled.' };
  return { ok: true, userId: user.id, inviteId: invite.id, email: user.email, name: user.name };
}

export function authRoutes(ctx: AppContext): Router {
  const router = Router();
  const { lucia, db } = ctx;

  const signInLimit = rateLimit({
    windowMs: 15 * 60_000,
    limit: ctx.config.signInLimitPer15Min,
    standardHeaders: 'draft-7',
    legacyHeaders: false,
    keyGenerator: (req) => `${ipKeyGenerator(req.ip ?? '')}|${String(req.body?.email ?? '').toLowerCase()}`,
    handler: (_req, res) => {
      res.status(429).json({
        error: { code: 'too_many_attempts', message: 'Too many sign-in attempts. Wait 15 minutes, then try again.' },
      });
    },
  });

  router.post('/sign-in', signInLimit, async (req, res) => {
    const parsed = signInSchema.safeParse(req.body);
    if (!parsed.success) throw validationError(parsed.error);
    const { email, password } = parsed.data;
    const user = await db('user').where({ email }).first();
    // Same Argon2id work whether or not the account exists, so timing does not reveal accounts.
    const valid = await verifyPassword(user?.password_hash ?? (await dummyPasswordHash()), password);
    if (!user || !user.password_hash || !valid || user.disabled_at) {
      throw new AppError(401, 'bad_credentials', 'E-mail or password is not correct.');
    }
    const session = await lucia.createSession(user.id, {});
    res.appendHeader('Set-Cookie', lucia.createSessionCookie(session.id).serialize());
    await appendAudit(db, { actorId: user.id, action: 'user.sign_in', subjectType: 'user', subjectId: user.id });
    res.json({ id: user.id, email: user.email, name: user.name, role: user.role, outbox: !ctx.config.production });
  });

  router.post('/sign-out', allow(), async (req, res) => {
    if (req.sessionId) await lucia.invalidateSession(req.sessionId);
    res.appendHeader('Set-Cookie', lucia.createBlankSessionCookie().serialize());
    res.json({ ok: true });
  });

  router.get('/me', allow(), (req, res) => {
    res.json(currentUser(req));
  });

  // The app's start-up probe: 200 either way, so a signed-out visit is not an error in the browser.
  router.get('/session', (req, res) => {
    // The local mail server's Outbox exists only outside production; the app hides its link there.
    res.json({ user: req.user ? { ...req.user, outbox: !ctx.config.production } : null });
  });

  router.get('/invite', async (req, res) => {
    const token = z.string().min(10).max(200).safeParse(req.query.token);
    if (!token.success) throw new AppError(400, 'invalid_input', 'The link is incomplete.', [{ path: 'token', message: 'missing' }]);
    const state = await inviteState(ctx, token.data);
    if (!state.ok) throw new AppError(410, 'invite_unusable', state.reason);
    res.json({ email: state.email, name: state.name });
  });

  router.post('/set-password', async (req, res) => {
    const parsed = setPasswordSchema.safeParse(req.body);
    if (!parsed.success) throw validationError(parsed.error);
    const state = await inviteState(ctx, parsed.data.token);
    if (!state.ok) throw new AppError(410, 'invite_unusable', state.reason);
    const hash = await hashPassword(parsed.data.password);
    await db.transaction(async (trx) => {
      // The used_at guard makes a second concurrent use of the same link fail.
      const claimed = await trx('invite').where({ id: state.inviteId }).whereNull('used_at').update({ used_at: new Date().toISOString() });
      if (!claimed) throw new AppError(410, 'invite_unusable', 'This link was already used.');
      await trx('user').where({ id: state.userId }).update({ password_hash: hash });
      await appendAudit(trx, { actorId: state.userId, action: 'user.set_password', subjectType: 'user', subjectId: state.userId });
    });
    await lucia.invalidateUserSessions(state.userId);
    res.json({ ok: true, email: state.email });
  });

  return router;
}
