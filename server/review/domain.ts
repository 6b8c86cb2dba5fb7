import type { Decision } from '../../shared/schema/workflow';
import { appendAudit } from '../audit/chain';
import type { SignedInUser } from '../auth/middleware';
import type { AppContext } from '../context';
import type { PendingDecision } from '../dossier-pdf/build-model';
import type { PreparedDossier } from '../dossier-pdf/domain';
import { conflict, forbidden } from '../errors';
import { queueMail } from '../mail/mailer';
import { loadDossier, loadRevision, revisionContentHash, type Revision } from '../revisions/store';

/** Signs an approval's dossier ahead of the approval (implemented by the dossier PDF component). */
export interface ApprovalSigner {
  prepareApproval(revisionId: number, pending: PendingDecision): Promise<PreparedDossier>;
}

/** What a decision means, as recorded with it and printed on the dossier: "approved as reviewer". */
export const decisionMeaning = (decision: Decision['decision'], role: string) =>
  `${decision === 'approve' ? 'approved' : 'returned for changes'} as ${role}`;

/**
 * decideRevision: assert reviewer and not the author, and that an approval passes every check; for an
 * approval, render and sign the dossier with the pending decision outside the transaction; then in one
 * transaction move in_review → approved | returned with an optimistic status check (exactly one
 * concurrent decision wins, and a loser's signed PDF is thrown away), record the decision with the
 * content hash the reviewer saw and the signer's name, role and the meaning of the signature, store the
 * signed dossier, audit, e-mail the author. The route has re-authenticated an approving reviewer.
 */
export async function decideRevision(
  ctx: AppContext,
  user: SignedInUser,
  revisionId: number,
  decision: Omit<Decision, 'password'>,
  signer?: ApprovalSigner,
): Promise<Revision> {
  const rev = await loadRevision(ctx.db, revisionId);
  assertMayDecide(user, rev, decision);
  const pending: PendingDecision = {
    reviewer: { name: user.name, email: user.email },
    decision: decision.decision,
    comment: decision.comment,
    contentHash: rev.contentHash ?? revisionContentHash(rev),
    at: new Date().toISOString(),
    signerName: user.name,
    signerRole: user.role,
    meaning: decisionMeaning(decision.decision, user.role),
  };
  const dossierPdf = decision.decision === 'approve' && signer ? await signer.prepareApproval(revisionId, pending) : null;
  try {
    await ctx.db.transaction(async (trx) => {
      const status = decision.decision === 'approve' ? 'approved' : 'returned';
      const changed = await trx('revision')
        .where({ id: revisionId, status: 'in_review' })
        .update({ status, decided_at: pending.at, updated_at: pending.at });
      if (!changed) throw conflict('Another reviewer decided on this revision a moment ago.');
      await trx('review_decision').insert({
        revision_id: revisionId,
        reviewer_id: user.id,
        decision: decision.decision,
        comment: decision.comment,
        content_hash: pending.contentHash,
        created_at: pending.at,
        signer_name: pending.signerName,
        signer_role: pending.signerRole,
        meaning: pending.meaning,
      });
      await dossierPdf?.commit(trx);
      await appendAudit(trx, {
        actorId: user.id,
        action: `revision.${status}`,
        subjectType: 'revision',
        subjectId: revisionId,
        dossierId: rev.dossierId,
        // The chain records the signed file, as the file records the chain's head before it.
        payload: {
          number: rev.number,
          comment: decision.comment,
          contentHash: pending.contentHash,
          signerName: pending.signerName,
          signerRole: pending.signerRole,
          meaning: pending.meaning,
          ...(dossierPdf ? { signedDossierSha256: dossierPdf.sha256 } : {}),
        },
      });
      const dossier = await loadDossier(trx, rev.dossierId);
      await queueMail(trx, rev.author.email, 'review-decided', {
        authorName: rev.author.name,
        reviewerName: user.name,
        outcome: status,
        number: rev.number,
        dossierTitle: dossier.title,
        productName: dossier.product.name,
        comment: decision.comment || '(no comment)',
        link: `${ctx.baseUrl}/revisions/${revisionId}`,
      });
    });
  } catch (error) {
    await dossierPdf?.discard();
    throw error;
  }
  ctx.kickMail();
  return loadRevision(ctx.db, revisionId);
}

function assertMayDecide(user: SignedInUser, rev: Revision, decision: Omit<Decision, 'password'>): void {
  if (user.role !== 'reviewer') throw forbidden('Only reviewers decide on revisions.');
  if (rev.author.id === user.id) throw forbidden('You authored this revision; another reviewer must decide on it (separation of duties).');
  if (rev.status !== 'in_review') throw conflict(`Revision ${rev.number} is ${rev.status.replace('_', ' ')}, not awaiting review.`);
  if (decision.decision === 'approve' && rev.results.verdict !== 'meets') {
    const failing = rev.results.checks.filter((c) => !c.pass && !c.alternative && c.limit !== null).map((c) => c.label);
    throw conflict(
      rev.results.verdict === 'incomplete'
        ? `Revision ${rev.number} cannot be approved: its inputs are incomplete. Return it with a comment.`
        : `Revision ${rev.number} cannot be approved: it fails ${failing.join(', ')}. Return it with a comment.`,
    );
  }
}

/** addReviewComment: reviewers and the author may discuss a revision while it is in review, and only then. */
export async function addReviewComment(ctx: AppContext, user: SignedInUser, revisionId: number, body: string): Promise<Revision> {
  await ctx.db.transaction(async (trx) => {
    const rev = await loadRevision(trx, revisionId);
    if (user.role !== 'reviewer' && user.id !== rev.author.id) throw forbidden('Only reviewers and the author comment on a revision.');
    // A decided revision is a closed record, and a draft is not yet under review.
    if (rev.status !== 'in_review')
      throw conflict(`Revision ${rev.number} is ${rev.status.replace('_', ' ')}; comments are taken only while it awaits review.`);
    await trx('review_comment').insert({ revision_id: revisionId, author_id: user.id, body, created_at: new Date().toISOString() });
    await appendAudit(trx, {
      actorId: user.id,
      action: 'revision.comment',
      subjectType: 'revision',
      subjectId: revisionId,
      dossierId: rev.dossierId,
      payload: { body },
    });
  });
  return loadRevision(ctx.db, revisionId);
}
