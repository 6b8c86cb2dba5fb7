import type { Knex } from 'knex';
import type { Decision } from '../../shared/schema/workflow';
import { appendAudit } from '../audit/chain';
import type { SignedInUser } from '../auth/middleware';
import type { AppContext } from '../context';
import { conflict, forbidden } from '../errors';
import { queueMail } from '../mail/mailer';
import { loadDossier, loadRevision, type Revision } from '../revisions/store';

/**
 * decideRevision: assert reviewer and not the author, move in_review → approved | returned with an
 * optimistic status check (exactly one concurrent decision wins), record the decision with the content
 * hash the reviewer saw, audit, e-mail the author. `afterApprove` runs inside the same transaction.
 */
export async function decideRevision(
  ctx: AppContext,
  user: SignedInUser,
  revisionId: number,
  decision: Decision,
  afterApprove?: (trx: Knex.Transaction, rev: Revision) => Promise<void>,
): Promise<Revision> {
  await ctx.db.transaction(async (trx) => {
    const rev = await loadRevision(trx, revisionId);
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
    const status = decision.decision === 'approve' ? 'approved' : 'returned';
    const now = new Date().toISOString();
    const changed = await trx('revision').where({ id: revisionId, status: 'in_review' }).update({ status, decided_at: now, updated_at: now });
    if (!changed) throw conflict('Another reviewer decided on this revision a moment ago.');
    await trx('review_decision').insert({
      revision_id: revisionId,
      reviewer_id: user.id,
      decision: decision.decision,
      comment: decision.comment,
      content_hash: rev.contentHash,
      created_at: now,
    });
    await appendAudit(trx, {
      actorId: user.id,
      action: `revision.${status}`,
      subjectType: 'revision',
      subjectId: revisionId,
      dossierId: rev.dossierId,
      payload: { number: rev.number, comment: decision.comment, contentHash: rev.contentHash },
    });
    const dossier = await loadDossier(trx, rev.dossierId);
    await queueMail(trx, rev.author.email, 'review-decided', {
      authorName: rev.author.name,
      reviewerName: user.name,
      outcome: status === 'approved' ? 'approved' : 'returned',
      number: rev.number,
      dossierTitle: dossier.title,
      productName: dossier.product.name,
      comment: decision.comment || '(no comment)',
      link: `${ctx.baseUrl}/revisions/${revisionId}`,
    });
    if (status === 'approved' && afterApprove) await afterApprove(trx, await loadRevision(trx, revisionId));
  });
  ctx.kickMail();
  return loadRevision(ctx.db, revisionId);
}

/** addReviewComment: reviewers and the author may discuss a revision while it is in review, and only then. */
export async function addReviewComment(ctx: AppContext, user: SignedInUser, revisionId: number, body: string): Promise<Revision> {
  await ctx.db.transaction(async (trx) => {
    const rev = await loadRevision(trx, revisionId);
    if (user.role !== 'reviewer' && user.id !== rev.author.id) throw forbidden('Only reviewers and the author comment on a revision.');
    // A decided revision is a closed record, and a draft is not yet under review.
    if (rev.status !== 'in_review') throw conflict(`Revision ${rev.number} is ${rev.status.replace('_', ' ')}; comments are taken only while it awaits review.`);
    await trx('review_comment').insert({ revision_id: revisionId, author_id: user.id, body, created_at: new Date().toISOString() });
    await appendAudit(trx, { actorId: user.id, action: 'revision.comment', subjectType: 'revision', subjectId: revisionId, dossierId: rev.dossierId, payload: { body } });
  });
  return loadRevision(ctx.db, revisionId);
}
