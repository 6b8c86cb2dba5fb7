import { Router } from 'express';
import { z } from 'zod';
import { forgotPasswordSchema, setPasswordSchema, signInSchema } from '../../shared/schema/auth';
import type { AppContext } from '../context';
import { AppError, validationError } from '../errors';
import { admitResetRequest, describeLink, RESET_REQUESTED, sendResetLink, setPasswordWithLink, signIn } from './domain';
import { allow, currentUser } from './middleware';
import { clientAddress } from './throttle';

export function authRoutes(ctx: AppContext): Router {
  const router = Router();

  router.post('/sign-in', async (req, res) => {
    const parsed = signInSchema.safeParse(req.body);
    if (!parsed.success) throw validationError(parsed.error);
    const { user, cookie } = await signIn(ctx, parsed.data.email, parsed.data.password, clientAddress(req));
    // A session the browser already held ends: a new sign-in always gets a new token.
    if (req.sessionId) await ctx.sessions.end(req.sessionId);
    res.appendHeader('Set-Cookie', cookie);
    res.json({ ...user, outbox: !ctx.config.production });
  });

  router.post('/sign-out', allow(), async (req, res) => {
    if (req.sessionId) await ctx.sessions.end(req.sessionId);
    res.appendHeader('Set-Cookie', ctx.sessions.blankCookie());
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

  router.post('/forgot-password', async (req, res) => {
    const parsed = forgotPasswordSchema.safeParse(req.body);
    if (!parsed.success) throw validationError(parsed.error);
    await admitResetRequest(ctx, clientAddress(req));
    res.status(202).json(RESET_REQUESTED);
    // After the answer, so neither its content nor its timing says whether the account exists.
    ctx.background.run('send reset link', () => sendResetLink(ctx, parsed.data.email));
  });

  // One-time links (invitation or reset): who the link is for, before the password is chosen.
  router.get('/invite', async (req, res) => {
    const token = z.string().min(10).max(200).safeParse(req.query.token);
    if (!token.success) throw new AppError(400, 'invalid_input', 'The link is incomplete.', [{ path: 'token', message: 'missing' }]);
    res.json(await describeLink(ctx, token.data));
  });

  router.post('/set-password', async (req, res) => {
    const parsed = setPasswordSchema.safeParse(req.body);
    if (!parsed.success) throw validationError(parsed.error);
    const { email } = await setPasswordWithLink(ctx, parsed.data.token, parsed.data.password);
    res.json({ ok: true, email });
  });

  return router;
}
