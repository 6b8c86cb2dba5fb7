import { Router } from 'express';
import { auditRoutes } from './audit/routes';
import { calcRoutes } from './calc/routes';
import type { AppContext } from './context';
import { DossierPdfService } from './dossier-pdf/domain';
import { dossierPdfRoutes } from './dossier-pdf/routes';
import { dossierRoutes } from './dossiers/routes';
import { evidenceRoutes } from './evidence/routes';
import { overviewRoutes } from './overview/routes';
import { productRoutes } from './products/routes';
import { reviewRoutes } from './review/routes';
import { revisionRoutes } from './revisions/routes';

/** The business components' routers, mounted under /api. */
export function apiRoutes(ctx: AppContext): Router {
  const router = Router();
  const pdf = new DossierPdfService(ctx);
  router.use('/calc', calcRoutes(ctx));
  router.use('/products', productRoutes(ctx));
  router.use('/dossiers', dossierRoutes(ctx));
  router.use('/revisions', revisionRoutes(ctx));
  // Approval and the signed dossier commit together.
  router.use(reviewRoutes(ctx, async (trx, rev) => {
    await pdf.signAndStore(trx, rev.id);
  }));
  router.use(dossierPdfRoutes(ctx, pdf));
  router.use(evidenceRoutes(ctx));
  router.use('/audit', auditRoutes(ctx));
  router.use('/overview', overviewRoutes(ctx));
  return router;
}
