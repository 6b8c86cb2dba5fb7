import { Router } from 'express';
import { allow } from '../auth/middleware';
import type { AppContext } from '../context';
import { parseId } from '../params';
import { readAuditChain } from './chain';
import { userNames } from './store';

export function auditRoutes(ctx: AppContext): Router {
  const router = Router();
  router.get('/', allow('reviewer', 'admin'), async (req, res) => {
    const dossierId = req.query.dossierId === undefined ? undefined : parseId(req.query.dossierId, 'dossierId');
    const report = await readAuditChain(ctx.db, dossierId);
    const names = await userNames(ctx.db);
    res.json({ ...report, events: report.events.map((e) => ({ ...e, actorName: e.actorId ? (names.get(e.actorId) ?? null) : null })) });
  });
  return router;
}
