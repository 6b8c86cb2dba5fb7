import { createHash } from 'node:crypto';
import { mkdirSync } from 'node:fs';
import { readFile, rename, rm, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { Knex } from 'knex';
import type { AppContext } from '../context';
import { tempFileName } from '../housekeeping/temp-files';
import { buildPdfModel } from './build-model';
import { loadOrCreateSigningIdentity, type SigningIdentity } from './certificate';
import { renderDossierPdf } from './render';

/** Signed dossiers live beside the evidence, one file per SHA-256 under `<dataDir>/dossiers/`. */
export const signedDossierDir = (dataDir: string) => join(dataDir, 'dossiers');

export class DossierPdfService {
  private identity: Promise<SigningIdentity> | null = null;
  private readonly dir: string;

  constructor(private readonly ctx: AppContext) {
    this.dir = signedDossierDir(ctx.config.dataDir);
    mkdirSync(this.dir, { recursive: true });
  }

  signingIdentity(): Promise<SigningIdentity> {
    this.identity ??= loadOrCreateSigningIdentity({
      dataDir: this.ctx.config.dataDir,
      p12Path: this.ctx.config.signing.p12Path,
      p12Password: this.ctx.config.signing.p12Password,
      production: this.ctx.config.production,
    });
    return this.identity;
  }

  /** An unsigned PDF of a revision that is not approved, marked as such on every page. */
  async renderDraft(revisionId: number): Promise<Buffer> {
    const model = await buildPdfModel(this.ctx, this.ctx.db, revisionId, await this.signingIdentity());
    return renderDossierPdf(model);
  }

  /**
   * signAndStore: render and sign an approved revision's dossier once, write it to a temp name and
   * rename it to its hash, and record it; called inside the approval's transaction so an approval
   * never exists without its signed dossier.
   */
  async signAndStore(trx: Knex.Transaction, revisionId: number): Promise<{ sha256: string; size: number }> {
    const identity = await this.signingIdentity();
    const model = await buildPdfModel(this.ctx, trx, revisionId, identity);
    const pdf = await renderDossierPdf(model, { sign: { identity, reason: `Approval of revision ${model.revision.number}`, location: this.ctx.config.organisation } });
    const sha256 = createHash('sha256').update(pdf).digest('hex');
    const tmp = join(this.dir, tempFileName());
    await writeFile(tmp, pdf);
    try {
      // The row first: it takes the write lock, so the data-folder sweep never sees the file without it.
      await trx('signed_dossier').insert({
        revision_id: revisionId,
        sha256,
        storage_key: sha256,
        size: pdf.length,
        signer_subject: identity.subject,
        signer_kind: identity.kind,
        created_at: new Date().toISOString(),
      });
      await rename(tmp, join(this.dir, sha256));
    } finally {
      await rm(tmp, { force: true });
    }
    return { sha256, size: pdf.length };
  }

  /** The stored signed PDF of an approved revision (signed now if an older approval has none yet). */
  async signedPdf(revisionId: number): Promise<{ pdf: Buffer; sha256: string }> {
    let row = await this.ctx.db('signed_dossier').where({ revision_id: revisionId }).first();
    if (!row) {
      await this.ctx.db.transaction((trx) => this.signAndStore(trx, revisionId));
      row = await this.ctx.db('signed_dossier').where({ revision_id: revisionId }).first();
    }
    const pdf = await readFile(join(this.dir, row.storage_key));
    return { pdf, sha256: row.sha256 };
  }
}
