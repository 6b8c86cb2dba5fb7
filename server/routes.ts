import { Router } from 'express';
import { auditRoutes } from './audit/routes';
import { calcRoutes } from './calc/routes';
import type { AppContext } from './context';
import type { DossierPdfService } from './dossier-pdf/domain';
import { dossierPdfRoutes } from './dossier-pdf/routes';
import { dossierRoutes } from './dossiers/routes';
import { evidenceRoutes } from './evidence/routes';
import { overviewRoutes } from './overview/routes';
import { productRoutes } from './products/routes';
import { reviewRoutes } from './review/routes';
import { revisionRoutes } from './revisions/routes';
import { signingRoutes } from './signing/routes';

/** The business components' routers, mounted under /api. */
export function apiRoutes(ctx: AppContext, pdf: DossierPdfService): Router {
  const router = Router();
  router.use('/calc', calcRoutes(ctx));
  router.use('/products', productRoutes(ctx));
  router.use('/dossiers', dossierRoutes(ctx));
  router.use('/revisions', revisionRoutes(ctx));
  // The approval's dossier is signed before its transaction and committed with it.
  router.use(reviewRoutes(ctx, pdf));
  router.use(dossierPdfRoutes(ctx, pdf));
  router.use(evidenceRoutes(ctx));
  router.use('/audit', auditRoutes(ctx));
  router.use('/signing', signingRoutes(ctx));
  router.use('/overview', overviewRoutes(ctx));
  return router;
}
