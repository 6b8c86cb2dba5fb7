import { Router } from 'express';
import { z } from 'zod';
import { OVERVIEW_LISTS } from '../../shared/schema/api';
import { pageQuerySchema } from '../../shared/schema/lists';
import { allow, currentUser } from '../auth/middleware';
import type { AppContext } from '../context';
import { validationError } from '../errors';
import { overview, overviewList } from './store';

const OVERVIEW_PAGE = 10;
const firstPagesSchema = pageQuerySchema.pick({ limit: true }).extend({ limit: pageQuerySchema.shape.limit.removeDefault().default(OVERVIEW_PAGE) });
const listSchema = z.object({ list: z.enum(OVERVIEW_LISTS, `Choose one of ${OVERVIEW_LISTS.join(', ')}.`) });

/** The Overview screen's lists: my drafts, returned to me, awaiting my review, recently approved; each paged. */
export function overviewRoutes(ctx: AppContext): Router {
  const router = Router();

  router.get('/', allow(), async (req, res) => {
    const parsed = firstPagesSchema.safeParse(req.query);
    if (!parsed.success) throw validationError(parsed.error, 'The list query is not valid.');
    res.json(await overview(ctx.db, currentUser(req), parsed.data.limit));
  });

  router.get('/:list', allow(), async (req, res) => {
    const list = listSchema.safeParse(req.params);
    if (!list.success) throw validationError(list.error, 'There is no such Overview list.');
    const page = pageQuerySchema.safeParse(req.query);
    if (!page.success) throw validationError(page.error, 'The list query is not valid.');
    res.json(await overviewList(ctx.db, currentUser(req), list.data.list, page.data));
  });

  return router;
}
