import { Router } from 'express';
import { decisionSchema, reviewCommentSchema } from '../../shared/schema/workflow';
import { confirmSignature } from '../auth/domain';
import { allow, currentUser } from '../auth/middleware';
import { clientAddress } from '../auth/throttle';
import type { AppContext } from '../context';
import { validationError } from '../errors';
import { parseId } from '../params';
import { addReviewComment, decideRevision, type ApprovalSigner } from './domain';

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

  // The reviewer's queue: everything awaiting review, with the ones this reviewer may not decide marked.
  router.get('/reviews', allow('reviewer', 'admin'), async (req, res) => {
    const user = currentUser(req);
    const rows = await ctx.db('revision')
      .join('dossier', 'dossier.id', 'revision.dossier_id')
      .join('product', 'product.id', 'dossier.product_id')
      .join('user', 'user.id', 'revision.author_id')
      .where('revision.status', 'in_review')
      .orderBy('revision.submitted_at', 'asc')
      .select('revision.id', 'revision.number', 'revision.results', 'revision.submitted_at', 'revision.author_id', 'dossier.id as dossier_id', 'dossier.title', 'product.name as product_name', 'user.name as author_name');
    res.json(
      rows.map((r) => ({
        id: r.id,
        number: r.number,
        verdict: JSON.parse(r.results).verdict,
        submittedAt: r.submitted_at,
        dossier: { id: r.dossier_id, title: r.title, productName: r.product_name },
        author: { id: r.author_id, name: r.author_name },
        mayDecide: user.role === 'reviewer' && r.author_id !== user.id,
      })),
    );
  });

  return router;
}
