import { createHash } from 'node:crypto';
import type { Knex } from 'knex';
import type { DesignDraft, DischargeResult, Requirement } from '../../shared/schema/discharge';
import type { EvidenceView, Person, ReturnNoteView, RevisionSummary, RevisionView } from '../../shared/schema/api';
import type { Page, PageQuery } from '../../shared/schema/lists';
import type { RevisionStatus } from '../../shared/schema/workflow';
import type { WaveformAnalysis } from '../../shared/schema/waveform';
import { decodeCursor, toPage } from '../db/paging';
import { notFound } from '../errors';

export type { Person } from '../../shared/schema/api';

/** The API's evidence view plus where the bytes are stored (server side only). */
export interface EvidenceRecord extends EvidenceView {
  storageKey: string;
}

export type Revision = RevisionView<EvidenceRecord>;

type Db = Knex | Knex.Transaction;

/** The columns that store a revision's results: the verdict has its own column so lists never parse the JSON. */
export function resultColumns(results: DischargeResult): { results: string; verdict: DischargeResult['verdict']; engine_version: string } {
  return { results: JSON.stringify(results), verdict: results.verdict, engine_version: results.engineVersion };
}

async function people(db: Db, ids: string[]): Promise<Map<string, Person>> {
  const rows = ids.length
    ? await db('user')
        .whereIn('id', [...new Set(ids)])
        .select('id', 'name', 'email')
    : [];
  return new Map(rows.map((r) => [r.id, { id: r.id, name: r.name, email: r.email }]));
}

const unknownPerson = (id: string): Person => ({ id, name: 'unknown user', email: '' });

export async function loadEvidence(db: Db, revisionId: number): Promise<EvidenceRecord[]> {
  const rows = await db('evidence').where({ revision_id: revisionId }).orderBy('id');
  const who = await people(
    db,
    rows.map((r) => r.uploaded_by),
  );
  return rows.map((r) => ({
    id: r.id,
    revisionId: r.revision_id,
    kind: r.kind,
    originalName: r.original_name,
    mediaType: r.media_type,
    size: r.size,
    sha256: r.sha256,
    storageKey: r.storage_key,
    analysis: r.analysis ? (JSON.parse(r.analysis) as WaveformAnalysis) : null,
    uploadedBy: who.get(r.uploaded_by) ?? unknownPerson(r.uploaded_by),
    uploadedAt: r.uploaded_at,
  }));
}

export async function loadRevision(db: Db, id: number): Promise<Revision> {
  const row = await db('revision').where({ id }).first();
  if (!row) throw notFound('Revision');
  const decisionRow = await db('review_decision').where({ revision_id: id }).first();
  const commentRows = await db('review_comment').where({ revision_id: id }).orderBy('id');
  const signed = await db('signed_dossier').where({ revision_id: id }).first();
  const who = await people(db, [row.author_id, decisionRow?.reviewer_id, ...commentRows.map((c) => c.author_id)].filter(Boolean));
  return {
    id: row.id,
    dossierId: row.dossier_id,
    number: row.number,
    status: row.status,
    version: row.version,
    design: JSON.parse(row.design) as DesignDraft,
    notes: row.notes,
    results: JSON.parse(row.results) as DischargeResult,
    engineVersion: row.engine_version,
    author: who.get(row.author_id) ?? unknownPerson(row.author_id),
    createdFrom: row.created_from,
    contentHash: row.content_hash,
    createdAt: row.created_at,
    updatedAt: row.updated_at,
    submittedAt: row.submitted_at,
    decidedAt: row.decided_at,
    evidence: await loadEvidence(db, id),
    decision: decisionRow
      ? {
          decision: decisionRow.decision,
          comment: decisionRow.comment,
          contentHash: decisionRow.content_hash,
          reviewer: who.get(decisionRow.reviewer_id) ?? unknownPerson(decisionRow.reviewer_id),
          at: decisionRow.created_at,
          signerName: decisionRow.signer_name,
          signerRole: decisionRow.signer_role,
          meaning: decisionRow.meaning,
        }
      : null,
    comments: commentRows.map((c) => ({ id: c.id, author: who.get(c.author_id) ?? unknownPerson(c.author_id), body: c.body, at: c.created_at })),
    signedPdf: signed ? { sha256: signed.sha256, size: signed.size, createdAt: signed.created_at, signerKind: signed.signer_kind } : null,
  };
}

/** The reviewer's return of revision `number` of a dossier; null when that revision was not returned. */
export async function loadReturnNote(db: Db, dossierId: number, number: number): Promise<ReturnNoteView | null> {
  const row = await db('revision')
    .join('review_decision', 'review_decision.revision_id', 'revision.id')
    .where({ 'revision.dossier_id': dossierId, 'revision.number': number, 'review_decision.decision': 'return' })
    .first('revision.id', 'revision.number', 'review_decision.comment', 'review_decision.reviewer_id', 'review_decision.created_at');
  if (!row) return null;
  const who = await people(db, [row.reviewer_id]);
  return {
    revisionId: row.id,
    number: row.number,
    comment: row.comment,
    reviewer: who.get(row.reviewer_id) ?? unknownPerson(row.reviewer_id),
    at: row.created_at,
  };
}

/** The return a revision answers: that of the revision just before it, when it was returned. */
export const loadReturnAnswered = (db: Db, rev: Pick<Revision, 'dossierId' | 'number'>) =>
  rev.number > 1 ? loadReturnNote(db, rev.dossierId, rev.number - 1) : Promise.resolve(null);

export interface DossierSummary {
  id: number;
  productId: number;
  title: string;
  requirement: Requirement;
  createdBy: string;
  createdAt: string;
  product: { id: number; name: string; modelNumber: string };
}

export async function loadDossier(db: Db, id: number): Promise<DossierSummary> {
  const row = await db('dossier')
    .join('product', 'product.id', 'dossier.product_id')
    .where('dossier.id', id)
    .first('dossier.*', 'product.name as product_name', 'product.model_number as product_model');
  if (!row) throw notFound('Dossier');
  return {
    id: row.id,
    productId: row.product_id,
    title: row.title,
    requirement: JSON.parse(row.requirement) as Requirement,
    createdBy: row.created_by,
    createdAt: row.created_at,
    product: { id: row.product_id, name: row.product_name, modelNumber: row.product_model },
  };
}

export interface RevisionFilter {
  dossierId?: number;
  authorId?: string;
  notAuthorId?: string;
  /** Any of these statuses (a viewer's lists are the approved ones). */
  status?: readonly RevisionStatus[];
  /** Only revisions that no later revision of the same dossier has replaced. */
  latestOnly?: boolean;
}

/** Each order has an index behind it (migration 006); the revision id breaks ties in the same direction. */
const ORDERS = {
  'number-desc': { column: 'number', direction: 'desc' },
  'updated-desc': { column: 'updated_at', direction: 'desc' },
  'submitted-asc': { column: 'submitted_at', direction: 'asc' },
  'decided-desc': { column: 'decided_at', direction: 'desc' },
} as const;
export type RevisionOrder = keyof typeof ORDERS;

function whereRevisions(query: Knex.QueryBuilder, filter: RevisionFilter): Knex.QueryBuilder {
  if (filter.dossierId !== undefined) query.where('revision.dossier_id', filter.dossierId);
  if (filter.authorId !== undefined) query.where('revision.author_id', filter.authorId);
  if (filter.notAuthorId !== undefined) query.whereNot('revision.author_id', filter.notAuthorId);
  if (filter.status) query.whereIn('revision.status', filter.status);
  if (filter.latestOnly) {
    query.whereNotExists((later) =>
      later.from('revision as later').whereRaw('later.dossier_id = revision.dossier_id').andWhereRaw('later.number > revision.number'),
    );
  }
  return query;
}

/**
 * The one revision-list query: the overview, the review queue and a dossier's page all read revisions
 * through it. Reads the verdict column, never the results JSON; `page: null` answers every match.
 */
export async function revisionSummaries(
  db: Db,
  filter: RevisionFilter,
  order: RevisionOrder,
  page: PageQuery | null,
): Promise<Page<RevisionSummary>> {
  const { column, direction } = ORDERS[order];
  const query = whereRevisions(
    db('revision')
      .join('dossier', 'dossier.id', 'revision.dossier_id')
      .join('product', 'product.id', 'dossier.product_id')
      .join('user', 'user.id', 'revision.author_id')
      .leftJoin('signed_dossier', 'signed_dossier.revision_id', 'revision.id')
      .select(
        'revision.id',
        'revision.dossier_id',
        'revision.number',
        'revision.status',
        'revision.verdict',
        'revision.author_id',
        'revision.created_from',
        'revision.created_at',
        'revision.updated_at',
        'revision.submitted_at',
        'revision.decided_at',
        'user.name as author_name',
        'dossier.title',
        'dossier.product_id',
        'product.name as product_name',
        'signed_dossier.sha256 as pdf_sha256',
        'signed_dossier.size as pdf_size',
        'signed_dossier.created_at as pdf_created_at',
      ),
    filter,
  ).orderBy([
    { column: `revision.${column}`, order: direction },
    { column: 'revision.id', order: direction },
  ]);
  if (!page) {
    const rows: SummaryRow[] = await query;
    return { items: rows.map(summaryView), nextCursor: null, total: rows.length };
  }
  const after = decodeCursor(page.cursor);
  if (after) query.whereRaw(`(revision.${column}, revision.id) ${direction === 'asc' ? '>' : '<'} (?, ?)`, after);
  const [rows, count]: [SummaryRow[], { n: number } | undefined] = await Promise.all([
    query.limit(page.limit + 1),
    whereRevisions(db('revision'), filter).count({ n: '*' }).first(),
  ]);
  return toPage(rows, page.limit, Number(count?.n ?? 0), (r) => [r[column]!, r.id], summaryView);
}

interface SummaryRow {
  id: number;
  dossier_id: number;
  number: number;
  status: RevisionStatus;
  verdict: RevisionSummary['verdict'];
  author_id: string;
  created_from: number | null;
  created_at: string;
  updated_at: string;
  submitted_at: string | null;
  decided_at: string | null;
  author_name: string;
  title: string;
  product_id: number;
  product_name: string;
  pdf_sha256: string | null;
  pdf_size: number | null;
  pdf_created_at: string | null;
}

function summaryView(r: SummaryRow): RevisionSummary {
  return {
    id: r.id,
    dossierId: r.dossier_id,
    number: r.number,
    status: r.status,
    verdict: r.verdict,
    author: { id: r.author_id, name: r.author_name },
    createdFrom: r.created_from,
    createdAt: r.created_at,
    updatedAt: r.updated_at,
    submittedAt: r.submitted_at,
    decidedAt: r.decided_at,
    dossier: { id: r.dossier_id, title: r.title, productId: r.product_id, productName: r.product_name },
    signedPdf: r.pdf_sha256 ? { sha256: r.pdf_sha256, size: r.pdf_size!, createdAt: r.pdf_created_at! } : null,
  };
}

/**
 * SHA-256 of what a reviewer signs off: inputs, notes, results and the evidence list (by content
 * hash). Key order is fixed by sorting, so the same content always gives the same hash.
 */
export function revisionContentHash(rev: Pick<Revision, 'dossierId' | 'number' | 'design' | 'notes' | 'results' | 'evidence'>): string {
  const canonical = (v: unknown): unknown =>
    Array.isArray(v)
      ? v.map(canonical)
      : v && typeof v === 'object'
        ? Object.fromEntries(
            Object.keys(v)
              .sort()
              .map((k) => [k, canonical((v as Record<string, unknown>)[k])]),
          )
        : v;
  const material = canonical({
    dossierId: rev.dossierId,
    number: rev.number,
    design: rev.design,
    notes: rev.notes,
    results: rev.results,
    evidence: rev.evidence.map((e) => ({ sha256: e.sha256, name: e.originalName, kind: e.kind })),
  });
  return createHash('sha256').update(JSON.stringify(material)).digest('hex');
}

/** The revisions of a dossier, oldest first, as the revision screen lists them (filter with visibleRevisions). */
export const siblingRevisions = (db: Db, dossierId: number) =>
  db('revision').where({ dossier_id: dossierId }).orderBy('number').select('id', 'number', 'status');

/** The revisions of a dossier before `number`, newest first (filter with visibleRevisions). */
export const earlierRevisions = (db: Db, dossierId: number, number: number) =>
  db('revision').where({ dossier_id: dossierId }).where('number', '<', number).orderBy('number', 'desc');
