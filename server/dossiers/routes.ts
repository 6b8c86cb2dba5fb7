import { Router } from 'express';
import { dossierListQuerySchema } from '../../shared/schema/lists';
import { dossierCreateSchema, revisionCreateSchema } from '../../shared/schema/workflow';
import { allow, currentUser } from '../auth/middleware';
import { seesOnlyApproved } from '../auth/need-to-know';
import type { AppContext } from '../context';
import { notFound, validationError } from '../errors';
import { parseId } from '../params';
import { createDraft } from '../revisions/domain';
import { createDossier } from './domain';
import { dossierExists, dossierWithRevisions, listDossiers } from './store';

export function dossierRoutes(ctx: AppContext): Router {
  const router = Router();

  router.get('/', allow(), async (req, res) => {
    const parsed = dossierListQuerySchema.safeParse(req.query);
    if (!parsed.success) throw validationError(parsed.error, 'The list query is not valid.');
    res.json(await listDossiers(ctx.db, parsed.data, { approvedOnly: seesOnlyApproved(currentUser(req)) }));
  });

  router.post('/', allow('engineer', 'admin'), async (req, res) => {
    const parsed = dossierCreateSchema.safeParse(req.body);
    if (!parsed.success) throw validationError(parsed.error);
    res.status(201).json(await createDossier(ctx, currentUser(req), parsed.data));
  });

  router.get('/:id', allow(), async (req, res) => {
    res.json(await dossierWithRevisions(ctx.db, parseId(req.params.id), { approvedOnly: seesOnlyApproved(currentUser(req)) }));
  });

  router.post('/:id/revisions', allow('engineer', 'admin'), async (req, res) => {
    const parsed = revisionCreateSchema.safeParse(req.body ?? {});
    if (!parsed.success) throw validationError(parsed.error);
    const dossierId = parseId(req.params.id);
    if (!(await dossierExists(ctx.db, dossierId))) throw notFound('Dossier');
    res.status(201).json(await createDraft(ctx, currentUser(req), dossierId, parsed.data.fromRevisionId));
  });

  return router;
}
