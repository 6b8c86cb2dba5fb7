import { createHash } from 'node:crypto';
import type { Knex } from 'knex';
import type { AppContext } from '../context';
import { AppError, conflict } from '../errors';
import { openContentStore, readWhole, type ContentStore } from '../evidence/storage';
import { buildPdfModel, type PendingDecision } from './build-model';
import type { DossierPdfModel } from './model';
import { PdfRenderPool } from './render-pool';
import type { SignOptions } from './sign';

/** A signed dossier rendered ahead of its approval: stored with the decision, or thrown away. */
export interface PreparedDossier {
  sha256: string;
  size: number;
  /** Inside the approval's transaction: moves the file in place and records it. */
  commit(trx: Knex.Transaction): Promise<void>;
  /** After a lost race or any failure before the commit. */
  discard(): Promise<void>;
}

/** Signed dossiers live beside the evidence, one object per SHA-256 (`<dataDir>/dossiers/` or `dossiers/` in the bucket). */
export class DossierPdfService {
  private readonly store: ContentStore;
  private readonly pool = new PdfRenderPool();

  constructor(private readonly ctx: AppContext) {
    this.store = openContentStore(ctx.config, 'dossiers');
  }

  /** An unsigned PDF of a revision that is not approved, marked as such on every page. */
  async renderDraft(revisionId: number): Promise<Buffer> {
    const model = await buildPdfModel(this.ctx, this.ctx.db, revisionId, await this.ctx.signing.setup());
    return this.pool.render(model);
  }

  /**
   * prepareApproval: render the dossier as the pending approval will leave it and sign it in the
   * worker thread, before the approval's transaction, so the write lock is never held while signing.
   */
  async prepareApproval(revisionId: number, pending: PendingDecision): Promise<PreparedDossier> {
    const setup = await this.ctx.signing.setup();
    const model = await buildPdfModel(this.ctx, this.ctx.db, revisionId, setup, pending);
    return this.prepare(revisionId, model, setup);
  }

  /** The stored signed PDF of an approved revision (signed now if an older approval has none yet). */
  async signedPdf(revisionId: number): Promise<{ pdf: Buffer; sha256: string }> {
    let row = await this.ctx.db('signed_dossier').where({ revision_id: revisionId }).first();
    if (!row) {
      const setup = await this.ctx.signing.setup();
      const prepared = await this.prepare(revisionId, await buildPdfModel(this.ctx, this.ctx.db, revisionId, setup), setup);
      try {
        await this.ctx.db.transaction(async (trx) => {
          // Two first downloads at once: the first to commit wins, the other serves its file.
          if (await trx('signed_dossier').where({ revision_id: revisionId }).first()) throw conflict('already signed');
          await prepared.commit(trx);
        });
      } catch {
        await prepared.discard();
      }
      row = await this.ctx.db('signed_dossier').where({ revision_id: revisionId }).first();
    }
    const pdf = await readWhole(this.store, row.storage_key);
    if (!pdf) throw new AppError(404, 'file_missing', 'The stored signed dossier is missing; tell the administrator.');
    return { pdf, sha256: row.sha256 };
  }

  /** Loads the PDF worker ahead of the first render (a production server does this at start-up). */
  warm(): void {
    this.pool.warm();
  }

  close(): Promise<void> {
    return this.pool.close();
  }

  private async prepare(
    revisionId: number,
    model: DossierPdfModel,
    setup: Awaited<ReturnType<AppContext['signing']['setup']>>,
  ): Promise<PreparedDossier> {
    const sign: SignOptions = { setup, reason: `Approval of revision ${model.revision.number}`, location: this.ctx.config.organisation };
    let pdf: Buffer;
    try {
      pdf = await this.pool.render(model, sign);
    } catch (error) {
      // The time-stamping authority or a CRL server may be away; nothing has been recorded yet.
      this.ctx.log.error({ err: error, revisionId }, 'signing the dossier failed');
      throw new AppError(
        503,
        'signing_unavailable',
        `The dossier could not be signed, so nothing was recorded: ${(error as Error).message} Try again later.`,
      );
    }
    const sha256 = createHash('sha256').update(pdf).digest('hex');
    let placed = false;
    return {
      sha256,
      size: pdf.length,
      commit: async (trx) => {
        // The row first: it takes the write lock, so the sweep never sees the stored file without it.
        await trx('signed_dossier').insert({
          revision_id: revisionId,
          sha256,
          storage_key: sha256,
          size: pdf.length,
          signer_subject: setup.identity.subject,
          signer_kind: setup.identity.kind,
          created_at: new Date().toISOString(),
        });
        placed = (await this.store.putBytes(sha256, pdf)).created;
      },
      discard: async () => {
        if (placed) await this.store.remove(sha256);
      },
    };
  }
}
