import { Router } from 'express';
import { allow } from '../auth/middleware';
import type { AppContext } from '../context';

export function signingRoutes(ctx: AppContext): Router {
  const router = Router();
  // The roots the signing and time-stamping chains end in, for an assessor's validator.
  router.get('/trust', allow(), async (_req, res) => {
    res
      .attachment('voltfall-trust-anchors.pem')
      .type('application/pem-certificate-chain')
      .send(await ctx.signing.trustPem());
  });
  return router;
}
