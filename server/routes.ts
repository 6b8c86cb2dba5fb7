import { Router } from 'express';
import { auditRoutes } from './audit/routes';
import { calcRoutes } from './calc/routes';
import type { AppContext } from './context';
import { dossierRoutes } from './dossiers/routes';
import { evidenceRoutes } from './evidence/routes';
import { overviewRoutes } from './overview/routes';
import { productRoutes } from './products/routes';
import { reviewRoutes } from './review/routes';
import { revisionRoutes } from './revisions/routes';

/** The business components' routers, mounted under /api. */
export function apiRoutes(ctx: AppContext): Router {
  const router = Router();
  router.use('/calc', calcRoutes(ctx));
  router.use('/products', productRoutes(ctx));
  router.use('/dossiers', dossierRoutes(ctx));
  router.use('/revisions', revisionRoutes(ctx));
  router.use(reviewRoutes(ctx));
  router.use(evidenceRoutes(ctx));
  router.use('/audit', auditRoutes(ctx));
  router.use('/overview', overviewRoutes(ctx));
  return router;
}
