import { Router } from 'express';
import { allow, currentUser } from '../auth/middleware';
import { visibleRevisions } from '../auth/need-to-know';
import type { AppContext } from '../context';
import { loadReturnAnswered, loadReturnNote } from '../revisions/store';

/** The Overview screen's lists: my drafts, returned to me, awaiting my review, recently approved. */
export function overviewRoutes(ctx: AppContext): Router {
  const router = Router();
  router.get('/', allow(), async (req, res) => {
    const user = currentUser(req);
    const base = () =>
      visibleRevisions(user, ctx.db('revision'))
        .join('dossier', 'dossier.id', 'revision.dossier_id')
        .join('product', 'product.id', 'dossier.product_id')
        .join('user', 'user.id', 'revision.author_id')
        .select('revision.id', 'revision.number', 'revision.status', 'revision.results', 'revision.updated_at', 'dossier.id as dossier_id', 'dossier.title', 'product.name as product_name', 'user.name as author_name');
    const brief = (r: Record<string, unknown>) => ({
      id: r.id,
      number: r.number,
      status: r.status,
      verdict: JSON.parse(String(r.results)).verdict ?? 'incomplete',
      updatedAt: r.updated_at,
      dossier: { id: r.dossier_id, title: r.title, productName: r.product_name },
      authorName: r.author_name,
    });
    const shape = (rows: Array<Record<string, unknown>>) => rows.map(brief);
    const myDrafts = await base().where({ 'revision.author_id': user.id, 'revision.status': 'draft' }).orderBy('revision.updated_at', 'desc');
    // A returned revision stays "returned to me" until a newer revision of that dossier exists.
    const returned = await base()
      .where({ 'revision.author_id': user.id, 'revision.status': 'returned' })
      .whereNotExists(ctx.db('revision as later').whereRaw('later.dossier_id = revision.dossier_id').andWhereRaw('later.number > revision.number'))
      .orderBy('revision.updated_at', 'desc');
    const awaiting = user.role === 'reviewer'
      ? await base().where('revision.status', 'in_review').whereNot('revision.author_id', user.id).orderBy('revision.submitted_at', 'asc')
      : [];
    const approved = await base().where('revision.status', 'approved').orderBy('revision.decided_at', 'desc').limit(10);
    // The reviewer's reason travels with the returned revision and with the draft that answers it.
    const drafts = await Promise.all(
      myDrafts.map(async (r) => ({ ...brief(r), returnNote: await loadReturnAnswered(ctx.db, { dossierId: Number(r.dossier_id), number: Number(r.number) }) })),
    );
    const returnedToMe = await Promise.all(
      returned.map(async (r) => ({ ...brief(r), returnNote: await loadReturnNote(ctx.db, Number(r.dossier_id), Number(r.number)) })),
    );
    res.json({ myDrafts: drafts, returnedToMe, awaitingMyReview: shape(awaiting), recentlyApproved: shape(approved) });
  });
  return router;
}
