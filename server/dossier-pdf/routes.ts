import { Router } from 'express';
import { allow, currentUser } from '../auth/middleware';
import { assertMaySee } from '../auth/need-to-know';
import type { AppContext } from '../context';
import { notFound } from '../errors';
import { parseId } from '../params';
import type { DossierPdfService } from './domain';
import { findPdfSubject } from './store';

export function dossierPdfRoutes(ctx: AppContext, service: DossierPdfService): Router {
  const router = Router();
  router.get('/revisions/:id/dossier.pdf', allow(), async (req, res) => {
    const id = parseId(req.params.id);
    const rev = await findPdfSubject(ctx.db, id);
    if (!rev) throw notFound('Revision');
    assertMaySee(currentUser(req), rev.status);
    const name = `voltfall-dossier-${rev.dossier_id}-rev${rev.number}${rev.status === 'approved' ? '-signed' : '-not-approved'}.pdf`;
    res.setHeader('Content-Type', 'application/pdf');
    res.attachment(name);
    if (rev.status === 'approved') {
      const { pdf, sha256 } = await service.signedPdf(id);
      res.setHeader('X-Content-SHA256', sha256);
      res.send(pdf);
    } else {
      res.setHeader('Cache-Control', 'no-store');
      res.send(await service.renderDraft(id));
    }
  });
  return router;
}
