import { Router } from 'express';
import { z } from 'zod';
import { computeDischarge } from '../../shared/engine';
import { sizeFromRinging } from '../../shared/engine/snubber';
import { dischargeInputSchema } from '../../shared/schema/discharge';
import { ringingInputSchema } from '../../shared/schema/snubber';
import { allow } from '../auth/middleware';
import type { AppContext } from '../context';
import { validationError } from '../errors';

const calcQuerySchema = z.object({ curve: z.enum(['chart', 'full'], 'Ask for curve=chart or curve=full.').default('chart') });

/** Stateless calculations: the engine without a dossier. */
export function calcRoutes(_ctx: AppContext): Router {
  const router = Router();
  // The live check answers the curve at the chart's resolution; `?curve=full` asks for every point.
  router.post('/discharge', allow(), (req, res) => {
    const query = calcQuerySchema.safeParse(req.query);
    if (!query.success) throw validationError(query.error, 'The query is not valid.');
    const parsed = dischargeInputSchema.safeParse(req.body);
    if (!parsed.success) throw validationError(parsed.error, 'Some inputs are not valid.');
    res.json(computeDischarge(parsed.data, { curve: query.data.curve }));
  });
  router.post('/snubber', allow(), (req, res) => {
    const parsed = ringingInputSchema.safeParse(req.body);
    if (!parsed.success) throw validationError(parsed.error, 'Some ringing measurements are not valid.');
    res.json(sizeFromRinging(parsed.data));
  });
  return router;
}
