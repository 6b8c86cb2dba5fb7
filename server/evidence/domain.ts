import { z } from 'zod';
import { analysisOptionsSchema, channelRefSchema, probeResistanceFieldSchema, type WaveformAnalysis } from '../../shared/schema/waveform';
import { versionSchema } from '../../shared/schema/workflow';
import { appendAudit } from '../audit/chain';
import type { SignedInUser } from '../auth/middleware';
import type { AppContext } from '../context';
import { AppError, conflict, forbidden, notFound, validationError } from '../errors';
import { assertCanEdit, assertVersion, refreshDraftResults } from '../revisions/domain';
import { loadDossier, loadEvidence, loadRevision, type EvidenceRecord } from '../revisions/store';
import { analyseCaptureFile, WaveformError } from './waveform/reader';
import { sanitiseFileName, sniffMediaType, type EvidenceKind } from './sniff';
import type { ContentStore, HashedFile } from './storage';
import { fileIsReferenced, markFileReleased } from './store';

export const uploadFieldsSchema = z.object({
  kind: z.enum(['waveform', 'image', 'datasheet', 'report', 'other'], 'Choose waveform, image, datasheet, report or other.'),
  channel: z.preprocess((v) => (v === '' || v === undefined ? undefined : /^\d+$/.test(String(v)) ? Number(v) : v), channelRefSchema.optional()),
  markerChannel: z.preprocess(
    (v) => (v === '' || v === undefined ? undefined : /^\d+$/.test(String(v)) ? Number(v) : v),
    channelRefSchema.optional(),
  ),
  t0: z.preprocess((v) => (v === '' || v === undefined ? undefined : Number(v)), z.number().finite('t0 must be a number in seconds').optional()),
  /** Input resistance of the measuring chain across the capacitor, Ω: the measured τ is corrected for it. */
  probeResistance: probeResistanceFieldSchema,
  scale: z.preprocess(
    (v) => (v === '' || v === undefined ? undefined : Number(v)),
    z
      .number({ error: 'The voltage scale must be a number, e.g. 100 for probe-side volts of a 100:1 probe' })
      .finite('The voltage scale must be a finite number')
      .positive('The voltage scale must be greater than zero')
      .optional(),
  ),
  // Optional for uploads, checked when sent: the revision version the uploader last read.
  version: z.preprocess(
    (v) => (v === '' || v === undefined ? undefined : typeof v === 'string' && /^[1-9][0-9]{0,15}$/.test(v) ? Number(v) : v),
    versionSchema.optional(),
  ),
});

export type StoredEvidence = EvidenceRecord & { revisionVersion: number };

/** Before any byte is received: the revision must be a draft the user may change. */
export async function assertMayAttach(ctx: AppContext, user: SignedInUser, revisionId: number): Promise<void> {
  const rev = await loadRevision(ctx.db, revisionId);
  assertCanEdit(user, rev);
}

/**
 * attachEvidence: sniff the bytes, analyse a waveform, then in one transaction place the file under its
 * hash, add the evidence row, recompute the draft's results (a new version) and record the audit event.
 * Any failure leaves neither a row nor a new file behind.
 */
export async function attachEvidence(
  ctx: AppContext,
  store: ContentStore,
  user: SignedInUser,
  revisionId: number,
  upload: HashedFile & { originalName: string },
  fields: unknown,
): Promise<StoredEvidence> {
  // Whether this upload put a new file in place (set inside the transaction, read by the cleanup below).
  const placement = { created: false };
  try {
    const parsed = uploadFieldsSchema.safeParse(fields);
    if (!parsed.success) throw validationError(parsed.error);
    const { kind, channel, markerChannel, t0, probeResistance, scale, version } = parsed.data;
    const limit = kind === 'waveform' ? ctx.config.uploadLimits.waveformBytes : ctx.config.uploadLimits.otherBytes;
    if (upload.size > limit) {
      throw new AppError(413, 'too_large', `A ${kind} file may be at most ${Math.round(limit / 1024 / 1024)} MB.`, [
        { path: 'file', message: 'over the size limit' },
      ]);
    }
    if (upload.size === 0) throw new AppError(422, 'empty_file', 'The file is empty.', [{ path: 'file', message: 'empty' }]);
    const name = sanitiseFileName(upload.originalName);
    const mediaType = await sniffMediaType(upload.path, kind as EvidenceKind, name);

    const rev = await loadRevision(ctx.db, revisionId);
    assertCanEdit(user, rev);
    // Before a long analysis, not only at the end.
    assertVersion(rev, version);
    const dossier = await loadDossier(ctx.db, rev.dossierId);
    let analysis: WaveformAnalysis | null = null;
    const options = analysisOptionsSchema.parse({
      safeVoltage: dossier.requirement.safeVoltage,
      maxTime: dossier.requirement.maxTime,
      channel,
      markerChannel,
      t0,
      scale,
    });
    if (kind === 'waveform') {
      try {
        // Kept with the analysis so the measured checks can refer the capture to the unloaded circuit.
        analysis = { ...(await analyseCaptureFile(upload.path, options)), probeResistance: probeResistance ?? null };
      } catch (err) {
        if (err instanceof WaveformError)
          throw new AppError(422, `capture_${err.code.toLowerCase()}`, err.message, [{ path: 'file', message: err.message }]);
        throw err;
      }
    }

    const { id, revisionVersion } = await ctx.db.transaction(async (trx) => {
      const current = await loadRevision(trx, revisionId);
      if (current.status !== 'draft') throw conflict('The revision was submitted meanwhile; its evidence list is frozen.');
      assertVersion(current, version);
      const [row] = await trx('evidence')
        .insert({
          revision_id: revisionId,
          kind,
          original_name: name,
          media_type: mediaType,
          size: upload.size,
          sha256: upload.sha256,
          storage_key: upload.sha256,
          analysis: analysis ? JSON.stringify(analysis) : null,
          analysis_options: analysis ? JSON.stringify(options) : null,
          uploaded_by: user.id,
          uploaded_at: new Date().toISOString(),
        })
        .returning('id');
      // After the row's insert has taken the write lock: the data-folder sweep never sees the file without it.
      placement.created = (await store.place(upload.path, upload.sha256)).created;
      const newVersion = await refreshDraftResults(trx, revisionId);
      await appendAudit(trx, {
        actorId: user.id,
        action: 'evidence.add',
        subjectType: 'evidence',
        subjectId: row.id,
        dossierId: rev.dossierId,
        payload: { revisionId, name, kind, sha256: upload.sha256, size: upload.size, version: newVersion },
      });
      return { id: row.id as number, revisionVersion: newVersion };
    });
    const record = (await loadEvidence(ctx.db, revisionId)).find((e) => e.id === id)!;
    return { ...record, revisionVersion };
  } catch (err) {
    await store.discard(upload.path);
    // A file this upload created and no row refers to is removed again.
    if (placement.created && !(await fileIsReferenced(ctx.db, upload.sha256))) {
      await store.remove(upload.sha256);
    }
    throw err;
  }
}

/**
 * removeEvidence: only from a draft, only by its author (or an admin), and (when sent) only from the
 * version the user last read; answers the revision's new version. The stored file stays while other
 * revisions refer to it; otherwise its grace period starts and the sweep removes it later.
 */
export async function removeEvidence(ctx: AppContext, user: SignedInUser, evidenceId: number, version?: number): Promise<number> {
  const row = await ctx.db('evidence').where({ id: evidenceId }).first();
  if (!row) throw notFound('Evidence');
  return ctx.db.transaction(async (trx) => {
    const rev = await loadRevision(trx, row.revision_id);
    if (rev.status !== 'draft') throw conflict(`Revision ${rev.number} is frozen; its evidence cannot be removed.`);
    if (user.role !== 'admin' && rev.author.id !== user.id) throw forbidden('Only the author of this draft (or an admin) may remove its evidence.');
    assertVersion(rev, version);
    await trx('evidence').where({ id: evidenceId }).delete();
    if (!(await fileIsReferenced(trx, row.storage_key))) await markFileReleased(trx, row.storage_key);
    const newVersion = await refreshDraftResults(trx, rev.id);
    await appendAudit(trx, {
      actorId: user.id,
      action: 'evidence.remove',
      subjectType: 'evidence',
      subjectId: evidenceId,
      dossierId: rev.dossierId,
      payload: { revisionId: rev.id, name: row.original_name, sha256: row.sha256, version: newVersion },
    });
    return newVersion;
  });
}
