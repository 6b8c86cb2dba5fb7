import { Router } from 'express';
import { pageQuerySchema } from '../../shared/schema/lists';
import { decisionSchema, reviewCommentSchema } from '../../shared/schema/workflow';
import { confirmSignature } from '../auth/domain';
import { allow, currentUser } from '../auth/middleware';
import { clientAddress } from '../auth/throttle';
import type { AppContext } from '../context';
import { validationError } from '../errors';
import { parseId } from '../params';
import { addReviewComment, decideRevision, type ApprovalSigner } from './domain';
import { reviewQueue } from './store';

export function reviewRoutes(ctx: AppContext, signer?: ApprovalSigner): Router {
  const router = Router();

  router.post('/revisions/:id/decision', allow('reviewer'), async (req, res) => {
    const parsed = decisionSchema.safeParse(req.body);
    if (!parsed.success) throw validationError(parsed.error);
    const { password, ...decision } = parsed.data;
    const user = currentUser(req);
    if (decision.decision === 'approve') await confirmSignature(ctx, user, password, clientAddress(req));
    res.json(await decideRevision(ctx, user, parseId(req.params.id), decision, signer));
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
