import contentDisposition from 'content-disposition';
import { Router, type NextFunction, type Request, type Response } from 'express';
import { pipeline } from 'node:stream/promises';
import multer from 'multer';
import { allow, currentUser } from '../auth/middleware';
import { assertMaySee } from '../auth/need-to-know';
import type { AppContext } from '../context';
import { findEvidenceWithStatus } from './store';
import { AppError, notFound, storageFault } from '../errors';
import { parseId } from '../params';
import { assertMayAttach, attachEvidence, removeEvidence } from './domain';
import { servedMediaType } from './sniff';
import { hashingStorage, openContentStore, type HashedFile } from './storage';

// Multipart overhead allowed on top of the largest file when judging Content-Length up front.
const FORM_OVERHEAD = 64 * 1024;

/**
 * A form that breaks off, has no boundary or malformed part headers is the request's fault (400); a
 * disk that is full or read-only while the bytes are written is the server's (507 / 503).
 */
function uploadFault(err: unknown): unknown {
  if (err instanceof multer.MulterError || err instanceof AppError || storageFault(err)) return err;
  const reason = err instanceof Error ? err.message : String(err);
  return new AppError(400, 'invalid_upload', `The upload is not a complete multipart form (${reason}); nothing was stored.`, [
    { path: 'file', message: reason },
  ]);
}

/** An ASCII stand-in for old clients: accents dropped, anything else outside printable ASCII as "_". */
const asciiFallback = (name: string) =>
  name
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .replace(/[^\x20-\x7e]/gu, '_');

export function evidenceRoutes(ctx: AppContext): Router {
  const router = Router();
  const store = openContentStore(ctx.config, 'evidence');
  const maxBytes = Math.max(ctx.config.uploadLimits.waveformBytes, ctx.config.uploadLimits.otherBytes);
  const upload = multer({
    storage: hashingStorage(store),
    // File names arrive as UTF-8 from browsers; busboy's default would read them as Latin-1.
    defParamCharset: 'utf8',
    limits: { fileSize: maxBytes, files: 1, fields: 10, fieldSize: 1024, parts: 12 },
  });
  const receive = (req: Request, res: Response, next: NextFunction) =>
    upload.single('file')(req, res, (err?: unknown) => next(err ? uploadFault(err) : undefined));

  // Refuse what cannot be accepted before reading the body: too large by its own declaration, or a
  // revision that is not this user's draft.
  const precheck = async (req: Request, res: Response, next: NextFunction) => {
    try {
      const declared = Number(req.headers['content-length'] ?? 0);
      if (declared > maxBytes + FORM_OVERHEAD) {
        throw new AppError(413, 'too_large', `The upload is larger than the ${Math.round(maxBytes / 1024 / 1024)} MB limit.`, [
          { path: 'file', message: 'over the size limit' },
        ]);
      }
      await assertMayAttach(ctx, currentUser(req), parseId(req.params.id));
      next();
    } catch (err) {
      // The client may still be sending; close the connection after answering instead of reading it all.
      res.setHeader('Connection', 'close');
      next(err);
    }
  };

  router.post('/revisions/:id/evidence', allow('engineer', 'admin'), precheck, receive, async (req, res) => {
    const file = req.file as (Express.Multer.File & HashedFile) | undefined;
    if (!file) throw new AppError(400, 'invalid_input', 'Attach a file in the "file" field.', [{ path: 'file', message: 'missing' }]);
    const record = await attachEvidence(
      ctx,
      store,
      currentUser(req),
      parseId(req.params.id),
      { path: file.path, size: file.size, sha256: file.sha256, originalName: file.originalname },
      req.body,
    );
    res.status(201).json(record);
  });

  router.get('/evidence/:id/file', allow(), async (req, res, next) => {
    const row = await findEvidenceWithStatus(ctx.db, parseId(req.params.id));
    if (!row) throw notFound('Evidence');
    assertMaySee(currentUser(req), row.revision_status, 'Evidence');
    // Always a download, typed from the bytes sniffed at upload (never from the name), and never
    // anything a browser would run: an uploaded page or script stays inert bytes.
    res.setHeader('Content-Type', servedMediaType(row.media_type));
    res.setHeader('X-Content-Type-Options', 'nosniff');
    res.setHeader('Content-Security-Policy', "default-src 'none'; sandbox");
    res.setHeader('Content-Disposition', contentDisposition.create(row.original_name, { fallback: asciiFallback(row.original_name) }));
    const stored = await store.open(row.storage_key);
    if (!stored) throw new AppError(404, 'file_missing', 'The stored bytes of this evidence are missing; tell the administrator.');
    res.setHeader('Content-Length', String(stored.size));
    // Streamed from the folder or the bucket as it is sent; a failure half-way cuts the answer off.
    pipeline(stored.stream, res).catch((err: unknown) => next(storageFault(err) ?? err));
  });

  router.delete('/evidence/:id', allow('engineer', 'admin'), async (req, res) => {
    const version = req.query.version === undefined ? undefined : parseId(req.query.version, 'version');
    const revisionVersion = await removeEvidence(ctx, currentUser(req), parseId(req.params.id), version);
    res.json({ ok: true, revisionVersion });
  });

  return router;
}
