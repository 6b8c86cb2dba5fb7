import type { Knex } from 'knex';
import { readAuditChain } from '../audit/chain';
import type { AppContext } from '../context';
import { diffRevisions } from '../revisions/diff';
import { loadDossier, loadRevision, revisionContentHash } from '../revisions/store';
import type { SigningIdentity } from './certificate';
import type { DossierPdfModel } from './model';

/** Gathers everything the PDF prints about one revision, from the database, into the renderer's model. */
export async function buildPdfModel(ctx: AppContext, db: Knex | Knex.Transaction, revisionId: number, identity: SigningIdentity): Promise<DossierPdfModel> {
  const rev = await loadRevision(db, revisionId);
  const dossier = await loadDossier(db, rev.dossierId);
  const product = await db('product').where({ id: dossier.productId }).first();
  const previousId = rev.createdFrom ?? (await db('revision').where({ dossier_id: rev.dossierId }).where('number', '<', rev.number).orderBy('number', 'desc').first('id'))?.id;
  const previous = previousId ? await loadRevision(db, previousId) : null;
  const diff = previous ? diffRevisions(rev, previous) : null;

  const decisions = await db('review_decision')
    .join('revision', 'revision.id', 'review_decision.revision_id')
    .join('user', 'user.id', 'review_decision.reviewer_id')
    .where('revision.dossier_id', rev.dossierId)
    .where('revision.number', '<=', rev.number)
    .orderBy('review_decision.created_at')
    .select('revision.number', 'review_decision.decision', 'review_decision.comment', 'review_decision.content_hash', 'review_decision.created_at', 'user.name', 'user.email');
  const audit = await readAuditChain(db, rev.dossierId);

  return {
    organisation: ctx.config.organisation,
    product: { name: product.name, modelNumber: product.model_number, description: product.description },
    dossier: { id: dossier.id, title: dossier.title, requirement: dossier.requirement },
    revision: {
      id: rev.id,
      number: rev.number,
      status: rev.status,
      author: { name: rev.author.name, email: rev.author.email },
      createdAt: rev.createdAt,
      submittedAt: rev.submittedAt,
      decidedAt: rev.decidedAt,
      notes: rev.notes,
      design: rev.design,
      results: rev.results,
      contentHash: rev.contentHash ?? revisionContentHash(rev),
    },
    evidence: rev.evidence.map((e) => ({
      id: e.id,
      kind: e.kind,
      originalName: e.originalName,
      mediaType: e.mediaType,
      size: e.size,
      sha256: e.sha256,
      uploadedBy: { name: e.uploadedBy.name, email: e.uploadedBy.email },
      uploadedAt: e.uploadedAt,
      analysis: e.analysis,
    })),
    diff: diff
      ? {
          against: { id: diff.against.id, number: diff.against.number },
          inputs: diff.inputs.map((c) => ({ path: `design.${c.path}`, label: c.label, from: c.fromValue, to: c.toValue, unit: c.unit, changePct: c.changePct })),
          checks: diff.checks.map((c) => ({ id: c.id, label: c.label, fromPass: c.from?.pass ?? null, toPass: c.to?.pass ?? null, from: c.from?.value ?? null, to: c.to?.value ?? null, unit: (c.to ?? c.from)?.unit })),
          notesDiff: diff.notes.changed ? diff.notes.patch : '',
          evidenceAdded: diff.evidence.added.map((e) => ({ originalName: e.name, sha256: e.sha256 })),
          evidenceRemoved: diff.evidence.removed.map((e) => ({ originalName: e.name, sha256: e.sha256 })),
        }
      : null,
    reviews: decisions.map((d) => ({
      revisionNumber: d.number,
      reviewer: { name: d.name, email: d.email },
      decision: d.decision,
      comment: d.comment,
      contentHash: d.content_hash,
      at: d.created_at,
    })),
    audit: { verified: audit.verified, events: audit.events.length, firstBroken: audit.firstBroken },
    signer: { kind: identity.kind, subject: identity.subject, fingerprintSha256: identity.fingerprintSha256 },
    generatedAt: new Date().toISOString(),
  };
}
