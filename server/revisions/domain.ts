import { ENGINE_VERSION } from '../../shared/engine';
import type { DesignDraft } from '../../shared/schema/discharge';
import type { RevisionPatch } from '../../shared/schema/workflow';
import { appendAudit } from '../audit/chain';
import type { SignedInUser } from '../auth/middleware';
import type { AppContext } from '../context';
import { AppError, conflict, forbidden } from '../errors';
import { queueMail } from '../mail/mailer';
import { computeRevisionResults } from './results';
import { loadDossier, loadEvidence, loadRevision, resultColumns, revisionContentHash, type Revision } from './store';

const VERDICT_WORDS = { meets: 'meets every check', fails: 'fails at least one check', incomplete: 'incomplete inputs' } as const;

export function assertCanEdit(user: SignedInUser, rev: Revision): void {
  if (rev.status !== 'draft') throw conflict(`Revision ${rev.number} is ${rev.status.replace('_', ' ')} and frozen; start a new draft to change it.`);
  if (user.role !== 'admin' && rev.author.id !== user.id) throw forbidden('Only the author of this draft (or an admin) may change it.');
}

/**
 * A write based on an older version would overwrite what someone else stored meanwhile: refused with
 * the revision as it is now, so the client can show what changed and let its user choose.
 */
export function assertVersion(rev: Revision, version: number | undefined): void {
  if (version === undefined || version === rev.version) return;
  throw new AppError(
    409,
    'stale_version',
    `Revision ${rev.number} was changed elsewhere (it is at version ${rev.version}, this change was based on version ${version}); nothing was saved.`,
    [{ path: 'version', message: `stale: the current version is ${rev.version}` }],
    { body: { current: rev } },
  );
}

/** createDraft: assert no open draft, copy inputs and notes (and evidence references) from the source, compute, audit. */
export async function createDraft(ctx: AppContext, user: SignedInUser, dossierId: number, fromRevisionId?: number): Promise<Revision> {
  const dossier = await loadDossier(ctx.db, dossierId);
  const id = await ctx.db.transaction(async (trx) => {
    const open = await trx('revision').where({ dossier_id: dossierId, status: 'draft' }).first('number');
    if (open) throw conflict(`Revision ${open.number} of this dossier is still a draft; finish or submit it first.`);
    const source = fromRevisionId
      ? await trx('revision').where({ id: fromRevisionId }).first()
      : await trx('revision').where({ dossier_id: dossierId }).orderBy('number', 'desc').first();
    if (fromRevisionId && (!source || source.dossier_id !== dossierId)) {
      throw new AppError(400, 'invalid_input', 'The revision to copy from is not part of this dossier.', [
        { path: 'fromRevisionId', message: 'not in this dossier' },
      ]);
    }
    const last = await trx('revision').where({ dossier_id: dossierId }).max({ n: 'number' }).first();
    const number = Number(last?.n ?? 0) + 1;
    const design: DesignDraft = source ? JSON.parse(source.design) : {};
    const now = new Date().toISOString();
    const [row] = await trx('revision')
      .insert({
        dossier_id: dossierId,
        number,
        status: 'draft',
        design: JSON.stringify(design),
        notes: source?.notes ?? '',
        results: '{}',
        engine_version: ENGINE_VERSION,
        author_id: user.id,
        created_from: source?.id ?? null,
        created_at: now,
        updated_at: now,
      })
      .returning('id');
    const newId = typeof row === 'object' ? row.id : row;
    if (source) {
      // Evidence is referenced, not copied: the new rows point at the same stored files.
      const evidence = await trx('evidence').where({ revision_id: source.id });
      for (const e of evidence) {
        const { id: _old, ...rest } = e;
        await trx('evidence').insert({ ...rest, revision_id: newId });
      }
    }
    const evidence = await loadEvidence(trx, newId);
    const results = computeRevisionResults(dossier.requirement, design, evidence);
    await trx('revision').where({ id: newId }).update(resultColumns(results));
    await appendAudit(trx, {
      actorId: user.id,
      action: 'revision.create',
      subjectType: 'revision',
      subjectId: newId,
      dossierId,
      payload: { number, createdFrom: source?.id ?? null },
    });
    return newId as number;
  });
  return loadRevision(ctx.db, id);
}

/** updateDraft: assert draft and author, store the new inputs and notes, recompute the results, audit. */
export async function updateDraft(ctx: AppContext, user: SignedInUser, revisionId: number, patch: RevisionPatch): Promise<Revision> {
  await ctx.db.transaction(async (trx) => {
    const rev = await loadRevision(trx, revisionId);
    assertCanEdit(user, rev);
    assertVersion(rev, patch.version);
    const dossier = await loadDossier(trx, rev.dossierId);
    const design = patch.design ?? rev.design;
    const notes = patch.notes ?? rev.notes;
    const results = computeRevisionResults(dossier.requirement, design, rev.evidence);
    // The status and version guards make a save that races a submit or another writer fail instead of
    // changing a frozen revision or overwriting a newer one.
    const changed = await trx('revision')
      .where({ id: revisionId, status: 'draft', version: patch.version })
      .update({
        design: JSON.stringify(design),
        notes,
        ...resultColumns(results),
        version: patch.version + 1,
        updated_at: new Date().toISOString(),
      });
    if (!changed) throw conflict('This revision changed meanwhile; reload it.');
    await appendAudit(trx, {
      actorId: user.id,
      action: 'revision.update',
      subjectType: 'revision',
      subjectId: revisionId,
      dossierId: rev.dossierId,
      payload: { fields: Object.keys(patch).filter((k) => k !== 'version'), version: patch.version + 1, verdict: results.verdict },
    });
  });
  return loadRevision(ctx.db, revisionId);
}

/** Recomputes a draft's results after its evidence changed and counts the change (inside the caller's transaction); answers the new version. */
export async function refreshDraftResults(trx: Parameters<typeof loadRevision>[0], revisionId: number): Promise<number> {
  const rev = await loadRevision(trx, revisionId);
  const dossier = await loadDossier(trx, rev.dossierId);
  const results = computeRevisionResults(dossier.requirement, rev.design, rev.evidence);
  const changed = await trx('revision')
    .where({ id: revisionId, status: 'draft', version: rev.version })
    .update({ ...resultColumns(results), version: rev.version + 1, updated_at: new Date().toISOString() });
  if (!changed) throw conflict('This revision changed meanwhile; reload it.');
  return rev.version + 1;
}

/**
 * submitRevision: assert draft and author (and, when sent, that the author saw the current version),
 * freeze the content with its hash, audit, notify every reviewer.
 */
export async function submitRevision(ctx: AppContext, user: SignedInUser, revisionId: number, version?: number): Promise<Revision> {
  await ctx.db.transaction(async (trx) => {
    const rev = await loadRevision(trx, revisionId);
    if (rev.author.id !== user.id) throw forbidden('Only the author may submit this revision.');
    if (rev.status !== 'draft') throw conflict(`Revision ${rev.number} is already ${rev.status.replace('_', ' ')}.`);
    assertVersion(rev, version);
    const dossier = await loadDossier(trx, rev.dossierId);
    // Results are recomputed at submission so the frozen record matches the current engine.
    const results = computeRevisionResults(dossier.requirement, rev.design, rev.evidence);
    const contentHash = revisionContentHash({ ...rev, results });
    const now = new Date().toISOString();
    const changed = await trx('revision')
      .where({ id: revisionId, status: 'draft', version: rev.version })
      .update({
        ...resultColumns(results),
        content_hash: contentHash,
        version: rev.version + 1,
        status: 'in_review',
        submitted_at: now,
        updated_at: now,
      });
    if (!changed) throw conflict('This revision was submitted meanwhile.');
    await appendAudit(trx, {
      actorId: user.id,
      action: 'revision.submit',
      subjectType: 'revision',
      subjectId: revisionId,
      dossierId: rev.dossierId,
      payload: { number: rev.number, contentHash, verdict: results.verdict },
    });
    const reviewers = await trx('user').where({ role: 'reviewer' }).whereNull('disabled_at').whereNot({ id: user.id });
    for (const reviewer of reviewers) {
      await queueMail(trx, reviewer.email, 'review-requested', {
        reviewerName: reviewer.name,
        authorName: rev.author.name,
        number: rev.number,
        dossierTitle: dossier.title,
        productName: dossier.product.name,
        verdict: VERDICT_WORDS[results.verdict],
        link: `${ctx.baseUrl}/revisions/${revisionId}`,
      });
    }
  });
  ctx.kickMail();
  return loadRevision(ctx.db, revisionId);
}
