import { randomBytes, randomUUID } from 'node:crypto';
import { Router } from 'express';
import { z } from 'zod';
import { appendAudit } from '../audit/chain';
import { ROLE_NAMES, inviteUserSchema } from '../../shared/schema/auth';
import { allow, currentUser } from '../auth/middleware';
import { hashToken } from '../auth/routes';
import type { AppContext } from '../context';
import { AppError, notFound, validationError } from '../errors';
import { queueMail } from '../mail/mailer';

const INVITE_HOURS = 72;


const patchSchema = z
  .object({
    role: z.enum(ROLE_NAMES, 'Choose admin, engineer, reviewer or viewer.').optional(),
    disabled: z.boolean().optional(),
  })
  .refine((v) => v.role !== undefined || v.disabled !== undefined, 'Send a role or disabled.');

const toUser = (row: Record<string, string | null>) => ({
  id: row.id,
  email: row.email,
  name: row.name,
  role: row.role,
  disabled: row.disabled_at !== null,
  invitePending: row.password_hash === null,
  createdAt: row.created_at,
});

export function userRoutes(ctx: AppContext): Router {
  const router = Router();
  const { db } = ctx;

  router.get('/', allow('admin'), async (_req, res) => {
    const rows = await db('user').orderBy('name');
    res.json(rows.map(toUser));
  });

  router.post('/', allow('admin'), async (req, res) => {
    const admin = currentUser(req);
    const parsed = inviteUserSchema.safeParse(req.body);
    if (!parsed.success) throw validationError(parsed.error);
    const { email, name, role } = parsed.data;
    if (await db('user').where({ email }).first()) {
      throw new AppError(409, 'conflict', 'An account with this e-mail already exists.', [{ path: 'email', message: 'already in use' }]);
    }
    const id = randomUUID();
    const token = randomBytes(32).toString('base64url');
    const expires = new Date(Date.now() + INVITE_HOURS * 3600_000);
    await db.transaction(async (trx) => {
      const now = new Date().toISOString();
      await trx('user').insert({ id, email, name, role, password_hash: null, disabled_at: null, created_at: now });
      await trx('invite').insert({ user_id: id, token_hash: hashToken(token), expires_at: expires.toISOString(), created_at: now });
      await queueMail(trx, email, 'invite', {
        name,
        role,
        invitedBy: admin.name,
        organisation: ctx.config.organisation,
        link: `${ctx.baseUrl}/set-password?token=${token}`,
        expires: expires.toUTCString(),
      });
      await appendAudit(trx, { actorId: admin.id, action: 'user.invite', subjectType: 'user', subjectId: id, payload: { email, role } });
    });
    ctx.kickMail();
    res.status(201).json(toUser(await db('user').where({ id }).first()));
  });

  router.patch('/:id', allow('admin'), async (req, res) => {
    const admin = currentUser(req);
    const parsed = patchSchema.safeParse(req.body);
    if (!parsed.success) throw validationError(parsed.error);
    const target = await db('user').where({ id: req.params.id }).first();
    if (!target) throw notFound('User');
    if (target.id === admin.id && (parsed.data.disabled || (parsed.data.role && parsed.data.role !== 'admin'))) {
      throw new AppError(409, 'conflict', 'You cannot disable yourself or remove your own admin role.');
    }
    const changes: Record<string, string | null> = {};
    if (parsed.data.role) changes.role = parsed.data.role;
    if (parsed.data.disabled !== undefined) changes.disabled_at = parsed.data.disabled ? new Date().toISOString() : null;
    await db.transaction(async (trx) => {
      await trx('user').where({ id: target.id }).update(changes);
      // A disabled user's sessions end at once, not when the cookie expires.
      if (parsed.data.disabled) await trx('session').where({ user_id: target.id }).delete();
      await appendAudit(trx, { actorId: admin.id, action: 'user.update', subjectType: 'user', subjectId: target.id, payload: parsed.data });
    });
    res.json(toUser(await db('user').where({ id: target.id }).first()));
  });

  return router;
}
