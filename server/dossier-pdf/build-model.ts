import type { Knex } from 'knex';
import { auditSentence } from '../../shared/audit-sentences';
import { readAuditChain } from '../audit/chain';
import type { AppContext } from '../context';
import { diffRevisions } from '../revisions/diff';
import { loadDossier, loadRevision, revisionContentHash } from '../revisions/store';
import type { SigningSetup } from '../signing/identity';
import type { AuditEntry, DossierPdfModel, ReviewEntry } from './model';

/** A decision about to be committed: the approval's dossier is rendered and signed before its transaction. */
export interface PendingDecision {
  reviewer: { name: string; email: string };
  decision: 'approve' | 'return';
  comment: string;
  contentHash: string;
  /** ISO 8601; the same instant is stored with the decision. */
  at: string;
  signerName: string;
  signerRole: string;
  meaning: string;
}

/**
 * Gathers everything the PDF prints about one revision, from the database, into the renderer's model.
 * With `pending`, the revision is shown as approved by that decision, which is not yet stored.
 */
export async function buildPdfModel(
  ctx: AppContext,
  db: Knex | Knex.Transaction,
  revisionId: number,
  setup: SigningSetup,
  pending: PendingDecision | null = null,
): Promise<DossierPdfModel> {
  const rev = await loadRevision(db, revisionId);
  const dossier = await loadDossier(db, rev.dossierId);
  const product = await db('product').where({ id: dossier.productId }).first();
  const previousId =
    rev.createdFrom ??
    (await db('revision').where({ dossier_id: rev.dossierId }).where('number', '<', rev.number).orderBy('number', 'desc').first('id'))?.id;
  const previous = previousId ? await loadRevision(db, previousId) : null;
  const diff = previous ? diffRevisions(rev, previous) : null;

  // select * so the signer columns are read where the schema has them.
  const decisions = await db('review_decision')
    .join('revision', 'revision.id', 'review_decision.revision_id')
    .join('user', 'user.id', 'review_decision.reviewer_id')
    .where('revision.dossier_id', rev.dossierId)
    .where('revision.number', '<=', rev.number)
    .orderBy('review_decision.created_at')
    .select('review_decision.*', 'revision.number', 'user.name', 'user.email');
  const reviews: ReviewEntry[] = decisions.map((d) => ({
    revisionNumber: d.number,
    reviewer: { name: d.name, email: d.email },
    decision: d.decision,
    comment: d.comment,
    contentHash: d.content_hash,
    at: d.created_at,
    signerName: d.signer_name ?? null,
    signerRole: d.signer_role ?? null,
    meaning: d.meaning ?? null,
  }));
  if (pending) reviews.push({ revisionNumber: rev.number, ...pending });

  return {
    organisation: ctx.config.organisation,
    product: { name: product.name, modelNumber: product.model_number, description: product.description },
    dossier: { id: dossier.id, title: dossier.title, requirement: dossier.requirement },
    revision: {
      id: rev.id,
      number: rev.number,
      status: pending ? (pending.decision === 'approve' ? 'approved' : 'returned') : rev.status,
      author: { name: rev.author.name, email: rev.author.email },
      createdAt: rev.createdAt,
      submittedAt: rev.submittedAt,
      decidedAt: pending ? pending.at : rev.decidedAt,
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
          inputs: diff.inputs.map((c) => ({
            path: `design.${c.path}`,
            label: c.label,
            from: c.fromValue,
            to: c.toValue,
            unit: c.unit,
            changePct: c.changePct,
          })),
          checks: diff.checks.map((c) => ({
            id: c.id,
            label: c.label,
            evidence: c.evidence ?? null,
            fromPass: c.from?.pass ?? null,
            toPass: c.to?.pass ?? null,
            from: c.from?.value ?? null,
            to: c.to?.value ?? null,
            unit: (c.to ?? c.from)?.unit,
          })),
          notesDiff: diff.notes.changed ? diff.notes.patch : '',
          evidenceAdded: diff.evidence.added.map((e) => ({ originalName: e.name, sha256: e.sha256 })),
          evidenceRemoved: diff.evidence.removed.map((e) => ({ originalName: e.name, sha256: e.sha256 })),
        }
      : null,
    reviews,
    audit: await auditOf(db, rev.dossierId),
    signer: {
      kind: setup.identity.kind,
      subject: setup.identity.subject,
      fingerprintSha256: setup.identity.fingerprintSha256,
      timestampAuthority: setup.tsaUrl,
    },
    generatedAt: new Date().toISOString(),
  };
}

/** The dossier's audit events with the actors' names and revision numbers, and the chain's head. */
async function auditOf(db: Knex | Knex.Transaction, dossierId: number): Promise<DossierPdfModel['audit']> {
  const chain = await readAuditChain(db as Knex, dossierId);
  const actorIds = [...new Set(chain.events.map((e) => e.actorId).filter((id): id is string => id !== null))];
  const names = new Map<string, string>((await db('user').whereIn('id', actorIds).select('id', 'name')).map((u) => [u.id, u.name]));
  const numbers = new Map<string, number>(
    (await db('revision').where({ dossier_id: dossierId }).select('id', 'number')).map((r) => [String(r.id), r.number]),
  );
  const head = await db('audit_event').orderBy('id', 'desc').first('hash');
  const events: AuditEntry[] = chain.events.map((e) => {
    const payload = (e.payload ?? {}) as Record<string, unknown>;
    const revisionId = e.subjectType === 'revision' ? e.subjectId : payload.revisionId !== undefined ? String(payload.revisionId) : null;
    const actor = e.actorId ? (names.get(e.actorId) ?? e.actorId) : null;
    return {
      id: e.id,
      at: e.createdAt,
      actor,
      action: e.action,
      revisionNumber: revisionId ? (numbers.get(revisionId) ?? null) : null,
      payload,
      sentence: auditSentence(
        { action: e.action, actorName: actor, subjectType: e.subjectType, subjectId: e.subjectId, payload },
        { revisionNumber: (id) => numbers.get(String(id)) },
      ),
      hash: e.hash,
    };
  });
  return { verified: chain.verified, events, headHash: head?.hash ?? null, firstBroken: chain.firstBroken };
}
