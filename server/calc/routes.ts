import { Router } from 'express';
import { computeDischarge } from '../../shared/engine';
import { sizeFromRinging } from '../../shared/engine/snubber';
import { dischargeInputSchema } from '../../shared/schema/discharge';
import { ringingInputSchema } from '../../shared/schema/snubber';
import { allow } from '../auth/middleware';
import type { AppContext } from '../context';
import { validationError } from '../errors';

/** Stateless calculations: the engine without a dossier. */
export function calcRoutes(_ctx: AppContext): Router {
  const router = Router();
  router.post('/discharge', allow(), (req, res) => {
    const parsed = dischargeInputSchema.safeParse(req.body);
    if (!parsed.success) throw validationError(parsed.error, 'Some inputs are not valid.');
    res.json(computeDischarge(parsed.data));
  });
  router.post('/snubber', allow(), (req, res) => {
    const parsed = ringingInputSchema.safeParse(req.body);
    if (!parsed.success) throw validationError(parsed.error, 'Some ringing measurements are not valid.');
    res.json(sizeFromRinging(parsed.data));
  });
  return router;
}
