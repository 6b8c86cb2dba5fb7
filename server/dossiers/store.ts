import type { Knex } from 'knex';
import type { DossierListItem } from '../../shared/schema/api';
import type { DischargeResult, Requirement } from '../../shared/schema/discharge';
import type { DossierListQuery, Page } from '../../shared/schema/lists';
import type { RevisionStatus } from '../../shared/schema/workflow';
import { dialectOf, type Dialect } from '../db/knex';
import { decodeCursor, toPage } from '../db/paging';
import { notFound } from '../errors';
import { loadDossier, revisionSummaries } from '../revisions/store';

type Db = Knex | Knex.Transaction;

// The latest revision of each dossier: one seek on the (dossier_id, number) unique index. A viewer's
// latest is the latest approved one (they see approved work only).
const LATEST_REVISION = '(SELECT r.id FROM revision r WHERE r.dossier_id = dossier.id ORDER BY r.number DESC LIMIT 1)';
const LATEST_APPROVED = "(SELECT r.id FROM revision r WHERE r.dossier_id = dossier.id AND r.status = 'approved' ORDER BY r.number DESC LIMIT 1)";

/** Who is listing: a viewer sees only dossiers with an approved revision, and that revision as the latest. */
export interface DossierAudience {
  approvedOnly: boolean;
}

/** LIKE with the user's % and _ taken literally. */
const containing = (text: string) => `%${text.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;

interface DossierRow {
  id: number;
  product_id: number;
  title: string;
  requirement: string;
  product_name: string;
  product_model: string;
  latest_id: number | null;
  latest_number: number | null;
  latest_status: RevisionStatus | null;
  latest_updated_at: string | null;
  latest_verdict: DischargeResult['verdict'] | null;
}

function whereDossiers(query: Knex.QueryBuilder, filter: DossierListQuery, audience: DossierAudience, dialect: Dialect): Knex.QueryBuilder {
  if (filter.productId !== undefined) query.where('dossier.product_id', filter.productId);
  if (audience.approvedOnly) {
    query.whereExists((seen) => seen.from('revision as seen').whereRaw('seen.dossier_id = dossier.id').where('seen.status', 'approved'));
    // Their latest is always an approved revision: any other status matches nothing.
    if (filter.status !== undefined && filter.status !== 'approved') query.whereRaw('0 = 1');
  } else if (filter.status !== undefined) {
    // Driven from the revision side: the status index finds the candidates, the unique (dossier, number)
    // index keeps only each dossier's latest, so the cost follows the matches, not the dossier count.
    query.whereIn('dossier.id', (sub) =>
      sub
        .from('revision as r')
        .select('r.dossier_id')
        .where('r.status', filter.status!)
        .whereNotExists((later) => later.from('revision as l').whereRaw('l.dossier_id = r.dossier_id').andWhereRaw('l.number > r.number')),
    );
  }
  if (filter.q !== undefined) {
    const like = containing(filter.q);
    // SQLite's LIKE ignores ASCII case; PostgreSQL's ILIKE does the same there.
    const [op, reference] =
      dialect === 'pg' ? ['ILIKE', "dossier.requirement->>'reference'"] : ['LIKE', "json_extract(dossier.requirement, '$.reference')"];
    query.whereRaw(
      `(dossier.title ${op} ? ESCAPE '\\' OR product.name ${op} ? ESCAPE '\\' OR product.model_number ${op} ? ESCAPE '\\'
        OR ${reference} ${op} ? ESCAPE '\\')`,
      [like, like, like, like],
    );
  }
  return query;
}

/** The dossier list, newest first, filtered and paged in SQL; each row carries its latest revision's status and verdict. */
export async function listDossiers(db: Db, filter: DossierListQuery, audience: DossierAudience): Promise<Page<DossierListItem>> {
  const listed = db('dossier')
    .join('product', 'product.id', 'dossier.product_id')
    .leftJoin('revision as latest', 'latest.id', db.raw(audience.approvedOnly ? LATEST_APPROVED : LATEST_REVISION));
  const page = whereDossiers(listed, filter, audience, dialectOf(db))
    .select(
      'dossier.id',
      'dossier.product_id',
      'dossier.title',
      'dossier.requirement',
      'product.name as product_name',
      'product.model_number as product_model',
      'latest.id as latest_id',
      'latest.number as latest_number',
      'latest.status as latest_status',
      'latest.updated_at as latest_updated_at',
      'latest.verdict as latest_verdict',
    )
    .orderBy('dossier.id', 'desc')
    .limit(filter.limit + 1);
  const after = decodeCursor(filter.cursor);
  if (after) page.where('dossier.id', '<', after[1]);
  // The count joins only what its filters need, so the unfiltered total is a plain count.
  const counted = filter.q !== undefined ? db('dossier').join('product', 'product.id', 'dossier.product_id') : db('dossier');
  const [rows, count]: [DossierRow[], { n: number } | undefined] = await Promise.all([
    page,
    whereDossiers(counted, filter, audience, dialectOf(db)).count({ n: '*' }).first(),
  ]);
  return toPage(rows, filter.limit, Number(count?.n ?? 0), (r) => [r.id, r.id], dossierView);
}

function dossierView(d: DossierRow): DossierListItem {
  return {
    id: d.id,
    productId: d.product_id,
    title: d.title,
    requirement: JSON.parse(d.requirement) as Requirement,
    product: { id: d.product_id, name: d.product_name, modelNumber: d.product_model },
    latest:
      d.latest_id !== null
        ? { id: d.latest_id, number: d.latest_number!, status: d.latest_status!, updatedAt: d.latest_updated_at!, verdict: d.latest_verdict! }
        : null,
  };
}

export async function dossierExists(db: Db, id: number): Promise<boolean> {
  return (await db('dossier').where({ id }).first('id')) !== undefined;
}

export async function insertDossier(
  trx: Knex.Transaction,
  row: { productId: number; title: string; requirement: Requirement; createdBy: string },
): Promise<number> {
  const [inserted] = await trx('dossier')
    .insert({
      product_id: row.productId,
      title: row.title,
      requirement: JSON.stringify(row.requirement),
      created_by: row.createdBy,
      created_at: new Date().toISOString(),
    })
    .returning('id');
  return inserted.id as number;
}

/**
 * One dossier with all its revisions, newest first (a dossier has a handful, so they are not paged). For
 * a viewer only the approved ones, and a dossier with none does not exist for them.
 */
export async function dossierWithRevisions(db: Db, id: number, audience: DossierAudience = { approvedOnly: false }) {
  const dossier = await loadDossier(db, id);
  const revisions = await revisionSummaries(
    db,
    { dossierId: id, ...(audience.approvedOnly ? { status: ['approved'] as const } : {}) },
    'number-desc',
    null,
  );
  if (audience.approvedOnly && revisions.items.length === 0) throw notFound('Dossier');
  return { ...dossier, revisions: revisions.items };
}
