import { existsSync } from 'node:fs';
import { extname, join } from 'node:path';
import express, { type Express, type RequestHandler } from 'express';
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

const BODYLESS = new Set(['GET', 'HEAD', 'OPTIONS']);

/**
 * The headers that matter for JSON and file answers, set in one step: the API never serves a page,
 * so it needs no script or style policy, only "render nothing, embed nowhere, sniff nothing" — and,
 * since answers carry drafts, names and audit trails, "keep nothing" for browsers and proxies.
 */
function apiHeaders(production: boolean): RequestHandler {
  const headers = new Map(
    Object.entries({
      'Content-Security-Policy': "default-src 'none'; frame-ancestors 'none'",
      'X-Content-Type-Options': 'nosniff',
      'Cross-Origin-Resource-Policy': 'same-origin',
      'Referrer-Policy': 'no-referrer',
      'Cache-Control': 'no-store',
      ...(production ? { 'Strict-Transport-Security': 'max-age=31536000; includeSubDomains' } : {}),
    }),
  );
  return (_req, res, next) => {
    res.setHeaders(headers);
    next();
  };
}

/** Builds the Express app: the JSON API under /api and the web export with a deep-link fallback. */
export function createApp(ctx: AppContext, pdf: DossierPdfService): Express {
  const app = express();
  app.disable('x-powered-by');
  // Forwarded addresses and schemes are believed only from the proxies TRUST_PROXY names.
  app.set('trust proxy', ctx.config.trustProxy);

  const api = express.Router();
  api.use(requestLog(ctx.log));
  api.use(apiHeaders(ctx.config.production));
  // Only requests that carry a body go through the JSON parser (which refuses deep nesting unparsed).
  const json = express.json({ limit: '2mb', verify: rejectDeepJson() });
  api.use((req, res, next) => (BODYLESS.has(req.method) ? next() : json(req, res, next)));
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
