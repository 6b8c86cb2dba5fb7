import { Router } from 'express';
import type { AppContext } from './context';

/** The business components' routers, mounted under /api. */
export function apiRoutes(_ctx: AppContext): Router {
  const router = Router();
  return router;
}
