import { Router } from 'express';
import { productCreateSchema } from '../../shared/schema/workflow';
import { allow, currentUser } from '../auth/middleware';
import { seesOnlyApproved } from '../auth/need-to-know';
import type { AppContext } from '../context';
import { notFound, validationError } from '../errors';
import { parseId } from '../params';
import { createProduct } from './domain';
import { findProduct, listProducts, productDossiers } from './store';

export function productRoutes(ctx: AppContext): Router {
  const router = Router();

  router.get('/', allow(), async (req, res) => {
    res.json(await listProducts(ctx.db, seesOnlyApproved(currentUser(req))));
  });

  router.post('/', allow('engineer', 'admin'), async (req, res) => {
    const parsed = productCreateSchema.safeParse(req.body);
    if (!parsed.success) throw validationError(parsed.error);
    res.status(201).json(await createProduct(ctx, currentUser(req), parsed.data));
  });

  router.get('/:id', allow(), async (req, res) => {
    const product = await findProduct(ctx.db, parseId(req.params.id));
    if (!product) throw notFound('Product');
    res.json({ ...product, dossiers: await productDossiers(ctx.db, product.id, seesOnlyApproved(currentUser(req))) });
  });

  return router;
}
