import { Router } from 'express';
import { z } from 'zod';
import { ROLE_NAMES, inviteUserSchema } from '../../shared/schema/auth';
import { allow, currentUser } from '../auth/middleware';
import type { AppContext } from '../context';
import { validationError } from '../errors';
import { inviteUser, listTeam, resendInvite, revokeInvite, updateMember } from './domain';

const patchSchema = z
  .object({
    role: z.enum(ROLE_NAMES, 'Choose admin, engineer, reviewer or viewer.').optional(),
    disabled: z.boolean().optional(),
  })
  .refine((v) => v.role !== undefined || v.disabled !== undefined, 'Send a role or disabled.');

export function userRoutes(ctx: AppContext): Router {
  const router = Router();

  router.get('/', allow('admin'), async (_req, res) => {
    res.json(await listTeam(ctx));
  });

  router.post('/', allow('admin'), async (req, res) => {
    const parsed = inviteUserSchema.safeParse(req.body);
    if (!parsed.success) throw validationError(parsed.error);
    res.status(201).json(await inviteUser(ctx, currentUser(req), parsed.data));
  });

  router.patch('/:id', allow('admin'), async (req, res) => {
    const parsed = patchSchema.safeParse(req.body);
    if (!parsed.success) throw validationError(parsed.error);
    res.json(await updateMember(ctx, currentUser(req), String(req.params.id), parsed.data));
  });

  // A fresh one-time invitation link (the previous one dies) …
  router.post('/:id/invite', allow('admin'), async (req, res) => {
    res.json(await resendInvite(ctx, currentUser(req), String(req.params.id)));
  });

  // … or none: the pending invitation is withdrawn.
  router.delete('/:id/invite', allow('admin'), async (req, res) => {
    res.json(await revokeInvite(ctx, currentUser(req), String(req.params.id)));
  });

  return router;
}
