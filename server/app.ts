import { existsSync } from 'node:fs';
import { extname, join } from 'node:path';
import express, { type Express } from 'express';
import helmet from 'helmet';
import { authRoutes } from './auth/routes';
import { originCheck, sessionMiddleware } from './auth/middleware';
import type { AppContext } from './context';
import { writeGuard } from './data-folder';
import type { DossierPdfService } from './dossier-pdf/domain';
import { AppError, errorMiddleware } from './errors';
import { rejectDeepJson } from './json-depth';
import { requestLog } from './logging';
import { outboxRoutes } from './outbox/routes';
import { userRoutes } from './users/routes';
import { apiRoutes } from './routes';

/** Builds the Express app: the JSON API under /api and the web export with a deep-link fallback. */
export function createApp(ctx: AppContext, pdf: DossierPdfService): Express {
  const app = express();
  app.disable('x-powered-by');
  // Forwarded addresses and schemes are believed only from the proxies TRUST_PROXY names.
  app.set('trust proxy', ctx.config.trustProxy);
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          defaultSrc: ["'self'"],
          scriptSrc: ["'self'"],
          // react-native-web writes its styles into <style> elements at run time.
          styleSrc: ["'self'", "'unsafe-inline'"],
          imgSrc: ["'self'", 'data:', 'blob:'],
          fontSrc: ["'self'", 'data:'],
          connectSrc: ["'self'"],
          objectSrc: ["'none'"],
          frameAncestors: ["'none'"],
          upgradeInsecureRequests: ctx.config.production ? [] : null,
        },
      },
      hsts: ctx.config.production,
    }),
  );

  const api = express.Router();
  api.use(requestLog(ctx.log));
  // Answers carry drafts, names and audit trails: never kept by a browser or a proxy.
  api.use((_req, res, next) => {
    res.setHeader('Cache-Control', 'no-store');
    next();
  });
  api.use(express.json({ limit: '2mb', verify: rejectDeepJson() }));
  api.use(writeGuard(ctx.config.dataDir));
  api.use(originCheck(ctx.config.publicUrl));
  api.use(sessionMiddleware(ctx.sessions));
  api.get('/health', (_req, res) => {
    res.json({ ok: true });
  });
  api.use('/auth', authRoutes(ctx));
  api.use('/users', userRoutes(ctx));
  if (!ctx.config.production) api.use('/outbox', outboxRoutes(ctx));
  api.use(apiRoutes(ctx, pdf));
  api.use((req, _res, next) => next(new AppError(404, 'not_found', `No API route ${req.method} ${req.path}.`)));
  app.use('/api', api);

  const webDir = ctx.config.webDir;
  app.use(express.static(webDir, { index: false, maxAge: '1h' }));
  app.get('/{*splat}', (req, res, next) => {
    // Deep links get the app; a missing asset (with a file extension) stays a 404.
    const index = join(webDir, 'index.html');
    if (extname(req.path) || !req.accepts('html') || !existsSync(index)) return next();
    res.sendFile(index);
  });
  app.use(errorMiddleware);
  return app;
}
