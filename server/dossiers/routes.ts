import { Router } from 'express';
import { dossierCreateSchema, revisionCreateSchema } from '../../shared/schema/workflow';
import { appendAudit } from '../audit/chain';
import { allow, currentUser } from '../auth/middleware';
import { seesOnlyApproved, visibleDossiers, visibleRevisions } from '../auth/need-to-know';
import type { SignedInUser } from '../auth/middleware';
import type { AppContext } from '../context';
import { AppError, notFound, validationError } from '../errors';
import { parseId } from '../params';
import { createDraft } from '../revisions/domain';
import { loadDossier } from '../revisions/store';

export function dossierRoutes(ctx: AppContext): Router {
  const router = Router();
  const { db } = ctx;

  router.get('/', allow(), async (req, res) => {
    const user = currentUser(req);
    const rows = await visibleDossiers(db, user, db('dossier')
      .join('product', 'product.id', 'dossier.product_id')
      .select('dossier.*', 'product.name as product_name', 'product.model_number as product_model')
      .orderBy('dossier.id', 'desc'));
    // A viewer's "latest" is the latest approved revision.
    const revisions = await visibleRevisions(user, db('revision').select('id', 'dossier_id', 'number', 'status', 'updated_at', 'results', 'author_id'), 'status');
    const latest = new Map<number, (typeof revisions)[number]>();
    for (const r of revisions) {
      const cur = latest.get(r.dossier_id);
      if (!cur || r.number > cur.number) latest.set(r.dossier_id, r);
    }
    res.json(
      rows.map((d) => {
        const rev = latest.get(d.id);
        return {
          id: d.id,
          productId: d.product_id,
          title: d.title,
          requirement: JSON.parse(d.requirement),
          product: { id: d.product_id, name: d.product_name, modelNumber: d.product_model },
          latest: rev
            ? { id: rev.id, number: rev.number, status: rev.status, updatedAt: rev.updated_at, verdict: JSON.parse(rev.results).verdict ?? 'incomplete' }
            : null,
        };
      }),
    );
  });

  router.post('/', allow('engineer', 'admin'), async (req, res) => {
    const user = currentUser(req);
    const parsed = dossierCreateSchema.safeParse(req.body);
    if (!parsed.success) throw validationError(parsed.error);
    const product = await db('product').where({ id: parsed.data.productId }).first();
    if (!product) throw new AppError(400, 'invalid_input', 'The product does not exist.', [{ path: 'productId', message: 'no such product' }]);
    const id = await db.transaction(async (trx) => {
      const [row] = await trx('dossier')
        .insert({ product_id: product.id, title: parsed.data.title, requirement: JSON.stringify(parsed.data.requirement), created_by: user.id, created_at: new Date().toISOString() })
        .returning('id');
      await appendAudit(trx, { actorId: user.id, action: 'dossier.create', subjectType: 'dossier', subjectId: row.id, dossierId: row.id, payload: parsed.data });
      return row.id as number;
    });
    // Revision 1 starts as an empty draft so the author can go straight to the design.
    await createDraft(ctx, user, id);
    res.status(201).json(await dossierWithRevisions(ctx, user, id));
  });

  router.get('/:id', allow(), async (req, res) => {
    res.json(await dossierWithRevisions(ctx, currentUser(req), parseId(req.params.id)));
  });

  router.post('/:id/revisions', allow('engineer', 'admin'), async (req, res) => {
    const parsed = revisionCreateSchema.safeParse(req.body ?? {});
    if (!parsed.success) throw validationError(parsed.error);
    const dossierId = parseId(req.params.id);
    if (!(await db('dossier').where({ id: dossierId }).first())) throw notFound('Dossier');
    const rev = await createDraft(ctx, currentUser(req), dossierId, parsed.data.fromRevisionId);
    res.status(201).json(rev);
  });

  return router;
}

async function dossierWithRevisions(ctx: AppContext, user: SignedInUser, id: number) {
  const dossier = await loadDossier(ctx.db, id);
  const revisions = await visibleRevisions(user, ctx.db('revision'))
    .join('user', 'user.id', 'revision.author_id')
    .where({ 'revision.dossier_id': id })
    .orderBy('revision.number', 'desc')
    .select('revision.id', 'revision.number', 'revision.status', 'revision.results', 'revision.created_from', 'revision.created_at', 'revision.updated_at', 'revision.submitted_at', 'revision.decided_at', 'user.name as author_name', 'user.id as author_id');
  // A dossier with nothing this user may see does not exist for them.
  if (!revisions.length && seesOnlyApproved(user)) throw notFound('Dossier');
  const signed = await ctx.db('signed_dossier').whereIn('revision_id', revisions.map((r) => r.id)).select('revision_id', 'sha256', 'size', 'created_at');
  const signedBy = new Map(signed.map((s) => [s.revision_id, s]));
  return {
    ...dossier,
    revisions: revisions.map((r) => ({
      id: r.id,
      number: r.number,
      status: r.status,
      verdict: JSON.parse(r.results).verdict ?? 'incomplete',
      author: { id: r.author_id, name: r.author_name },
      createdFrom: r.created_from,
      createdAt: r.created_at,
      updatedAt: r.updated_at,
      submittedAt: r.submitted_at,
      decidedAt: r.decided_at,
      signedPdf: signedBy.has(r.id) ? { sha256: signedBy.get(r.id)!.sha256, size: signedBy.get(r.id)!.size, createdAt: signedBy.get(r.id)!.created_at } : null,
    })),
  };
}
