import { Router } from 'express';
import { revisionPatchSchema, submitSchema } from '../../shared/schema/workflow';
import { allow, currentUser } from '../auth/middleware';
import { assertMaySee, maySee, visibleRevisions } from '../auth/need-to-know';
import type { AppContext } from '../context';
import { AppError, validationError } from '../errors';
import { parseId } from '../params';
import { diffRevisions } from './diff';
import { submitRevision, updateDraft } from './domain';
import { earlierRevisions, loadDossier, loadReturnAnswered, loadRevision, siblingRevisions } from './store';

export function revisionRoutes(ctx: AppContext): Router {
  const router = Router();
  const { db } = ctx;

  router.get('/:id', allow(), async (req, res) => {
    const user = currentUser(req);
    const rev = await loadRevision(db, parseId(req.params.id));
    assertMaySee(user, rev.status);
    const dossier = await loadDossier(db, rev.dossierId);
    const siblings = await visibleRevisions(user, siblingRevisions(db, rev.dossierId), 'status');
    // A viewer sees approved work only, so never the return a draft answers.
    const answersReturn = user.role === 'viewer' ? null : await loadReturnAnswered(db, rev);
    res.json({ ...rev, dossier, siblings, answersReturn });
  });

  router.patch('/:id', allow('engineer', 'admin'), async (req, res) => {
    // A change that does not say which version it was based on could overwrite a newer one.
    if (req.body?.version === undefined) {
      throw new AppError(428, 'version_required', 'Send the version of the revision you last read with every change.', [
        { path: 'version', message: 'required' },
      ]);
    }
    const parsed = revisionPatchSchema.safeParse(req.body);
    if (!parsed.success) throw validationError(parsed.error, 'Some design inputs are not valid.');
    res.json(await updateDraft(ctx, currentUser(req), parseId(req.params.id), parsed.data));
  });

  router.post('/:id/submit', allow('engineer', 'admin'), async (req, res) => {
    const parsed = submitSchema.safeParse(req.body ?? {});
    if (!parsed.success) throw validationError(parsed.error);
    res.json(await submitRevision(ctx, currentUser(req), parseId(req.params.id), parsed.data.version));
  });

  router.get('/:id/diff', allow(), async (req, res) => {
    const user = currentUser(req);
    const current = await loadRevision(db, parseId(req.params.id));
    assertMaySee(user, current.status);
    let againstId: number | null = req.query.against === undefined ? current.createdFrom : parseId(req.query.against, 'against');
    if (req.query.against === undefined && againstId !== null && !maySee(user, (await loadRevision(db, againstId)).status)) againstId = null;
    if (againstId === null) {
      const previous = await visibleRevisions(user, earlierRevisions(db, current.dossierId, current.number), 'status').first('id');
      againstId = previous?.id ?? null;
    }
    if (againstId === null) throw new AppError(404, 'not_found', 'This is the first revision; there is nothing to compare it with.');
    const previous = await loadRevision(db, againstId);
    assertMaySee(user, previous.status);
    if (previous.dossierId !== current.dossierId) {
      throw new AppError(400, 'invalid_input', 'Compare revisions of the same dossier only.', [{ path: 'against', message: 'another dossier' }]);
    }
    res.json(diffRevisions(current, previous));
  });

  return router;
}
