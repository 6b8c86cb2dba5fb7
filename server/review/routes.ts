import { Router } from 'express';
import type { Knex } from 'knex';
import { pageQuerySchema } from '../../shared/schema/lists';
import { decisionSchema, reviewCommentSchema } from '../../shared/schema/workflow';
import { allow, currentUser } from '../auth/middleware';
import type { AppContext } from '../context';
import { validationError } from '../errors';
import { parseId } from '../params';
import type { Revision } from '../revisions/store';
import { addReviewComment, decideRevision } from './domain';
import { reviewQueue } from './store';

export function reviewRoutes(ctx: AppContext, afterApprove?: (trx: Knex.Transaction, rev: Revision) => Promise<void>): Router {
  const router = Router();

  router.post('/revisions/:id/decision', allow('reviewer'), async (req, res) => {
    const parsed = decisionSchema.safeParse(req.body);
    if (!parsed.success) throw validationError(parsed.error);
    res.json(await decideRevision(ctx, currentUser(req), parseId(req.params.id), parsed.data, afterApprove));
  });

  router.post('/revisions/:id/comments', allow('reviewer', 'engineer', 'admin'), async (req, res) => {
    const parsed = reviewCommentSchema.safeParse(req.body);
    if (!parsed.success) throw validationError(parsed.error);
    res.status(201).json(await addReviewComment(ctx, currentUser(req), parseId(req.params.id), parsed.data.body));
  });

  // The reviewer's queue: everything awaiting review, oldest first, with the ones this reviewer may not decide marked.
  router.get('/reviews', allow('reviewer', 'admin'), async (req, res) => {
    const parsed = pageQuerySchema.safeParse(req.query);
    if (!parsed.success) throw validationError(parsed.error, 'The list query is not valid.');
    res.json(await reviewQueue(ctx.db, currentUser(req), parsed.data));
  });

  return router;
}
