import { Router, type NextFunction, type Request, type Response } from 'express';
import multer from 'multer';
import { allow, currentUser } from '../auth/middleware';
import { assertMaySee } from '../auth/need-to-know';
import type { AppContext } from '../context';
import { AppError, notFound } from '../errors';
import { parseId } from '../params';
import { assertMayAttach, attachEvidence, removeEvidence } from './domain';
import { EvidenceStore, hashingStorage, type HashedFile } from './storage';

// Multipart overhead allowed on top of the largest file when judging Content-Length up front.
const FORM_OVERHEAD = 64 * 1024;

export function evidenceRoutes(ctx: AppContext): Router {
  const router = Router();
  const store = new EvidenceStore(ctx.config.dataDir);
  const maxBytes = Math.max(ctx.config.uploadLimits.waveformBytes, ctx.config.uploadLimits.otherBytes);
  const upload = multer({ storage: hashingStorage(store), limits: { fileSize: maxBytes, files: 1, fields: 10, fieldSize: 1024 } });

  // Refuse what cannot be accepted before reading the body: too large by its own declaration, or a
  // revision that is not this user's draft.
  const precheck = async (req: Request, _res: Response, next: NextFunction) => {
    try {
      const declared = Number(req.headers['content-length'] ?? 0);
      if (declared > maxBytes + FORM_OVERHEAD) {
        throw new AppError(413, 'too_large', `The upload is larger than the ${Math.round(maxBytes / 1024 / 1024)} MB limit.`, [{ path: 'file', message: 'over the size limit' }]);
      }
      await assertMayAttach(ctx, currentUser(req), parseId(req.params.id));
      next();
    } catch (err) {
      // The client may still be sending; close the connection after answering instead of reading it all.
      _res.setHeader('Connection', 'close');
      next(err);
    }
  };

  router.post('/revisions/:id/evidence', allow('engineer', 'admin'), precheck, upload.single('file'), async (req, res) => {
    const file = req.file as (Express.Multer.File & HashedFile) | undefined;
    if (!file) throw new AppError(400, 'invalid_input', 'Attach a file in the "file" field.', [{ path: 'file', message: 'missing' }]);
    const record = await attachEvidence(ctx, store, currentUser(req), parseId(req.params.id), { path: file.path, size: file.size, sha256: file.sha256, originalName: file.originalname }, req.body);
    res.status(201).json(record);
  });

  router.get('/evidence/:id/file', allow(), async (req, res) => {
    const row = await ctx.db('evidence').join('revision', 'revision.id', 'evidence.revision_id').where('evidence.id', parseId(req.params.id)).first('evidence.*', 'revision.status as revision_status');
    if (!row) throw notFound('Evidence');
    assertMaySee(currentUser(req), row.revision_status, 'Evidence');
    res.setHeader('Content-Type', row.media_type);
    res.setHeader('X-Content-Type-Options', 'nosniff');
    res.attachment(row.original_name);
    res.sendFile(store.pathOf(row.storage_key));
  });

  router.delete('/evidence/:id', allow('engineer', 'admin'), async (req, res) => {
    await removeEvidence(ctx, currentUser(req), parseId(req.params.id));
    res.json({ ok: true });
  });

  return router;
}
