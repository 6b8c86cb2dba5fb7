import { Router } from 'express';
import { productCreateSchema } from '../../shared/schema/workflow';
import { appendAudit } from '../audit/chain';
import { allow, currentUser } from '../auth/middleware';
import { visibleDossiers } from '../auth/need-to-know';
import type { AppContext } from '../context';
import { notFound, validationError } from '../errors';
import { parseId } from '../params';

const toProduct = (r: Record<string, unknown>) => ({ id: r.id, name: r.name, modelNumber: r.model_number, description: r.description, createdAt: r.created_at });

export function productRoutes(ctx: AppContext): Router {
  const router = Router();
  const { db } = ctx;

  router.get('/', allow(), async (req, res) => {
    const rows = await db('product').orderBy('name');
    const counts: Array<{ product_id: number; n: number }> = await visibleDossiers(db, currentUser(req), db('dossier').groupBy('product_id').select('product_id').count({ n: '*' }));
    const byProduct = new Map(counts.map((c) => [c.product_id, Number(c.n)]));
    res.json(rows.map((r) => ({ ...toProduct(r), dossierCount: byProduct.get(r.id) ?? 0 })));
  });

  router.post('/', allow('engineer', 'admin'), async (req, res) => {
    const user = currentUser(req);
    const parsed = productCreateSchema.safeParse(req.body);
    if (!parsed.success) throw validationError(parsed.error);
    const id = await db.transaction(async (trx) => {
      const [row] = await trx('product')
        .insert({ name: parsed.data.name, model_number: parsed.data.modelNumber, description: parsed.data.description, created_by: user.id, created_at: new Date().toISOString() })
        .returning('id');
      await appendAudit(trx, { actorId: user.id, action: 'product.create', subjectType: 'product', subjectId: row.id, payload: parsed.data });
      return row.id as number;
    });
    res.status(201).json(toProduct(await db('product').where({ id }).first()));
  });

  router.get('/:id', allow(), async (req, res) => {
    const row = await db('product').where({ id: parseId(req.params.id) }).first();
    if (!row) throw notFound('Product');
    const dossiers = await visibleDossiers(db, currentUser(req), db('dossier').where({ product_id: row.id }).orderBy('id').select('id', 'title'));
    res.json({ ...toProduct(row), dossiers });
  });

  return router;
}
