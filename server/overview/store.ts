import type { Knex } from 'knex';
import { OVERVIEW_LISTS, type Overview, type OverviewList, type RevisionSummary } from '../../shared/schema/api';
import type { Page, PageQuery } from '../../shared/schema/lists';
import type { SignedInUser } from '../auth/middleware';
import { seesOnlyApproved } from '../auth/need-to-know';
import { loadReturnAnswered, loadReturnNote, revisionSummaries, type RevisionFilter, type RevisionOrder } from '../revisions/store';

/** Each Overview list as a filter and an order of the one revision-summary query. */
function listQuery(user: SignedInUser, list: OverviewList): { filter: RevisionFilter; order: RevisionOrder } | null {
  // A viewer sees approved work only; the other lists are about work in progress.
  if (seesOnlyApproved(user) && list !== 'recentlyApproved') return null;
  switch (list) {
    case 'myDrafts':
      return { filter: { authorId: user.id, status: ['draft'] }, order: 'updated-desc' };
    case 'returnedToMe':
      // A returned revision stays "returned to me" until a newer revision of that dossier exists.
      return { filter: { authorId: user.id, status: ['returned'], latestOnly: true }, order: 'updated-desc' };
    case 'awaitingMyReview':
      return user.role === 'reviewer' ? { filter: { status: ['in_review'], notAuthorId: user.id }, order: 'submitted-asc' } : null;
    case 'recentlyApproved':
      return { filter: { status: ['approved'] }, order: 'decided-desc' };
  }
}

const EMPTY: Page<RevisionSummary> = { items: [], nextCursor: null, total: 0 };

export async function overviewList(db: Knex, user: SignedInUser, list: OverviewList, page: PageQuery): Promise<Page<RevisionSummary>> {
  const query = listQuery(user, list);
  if (!query) return EMPTY;
  const found = await revisionSummaries(db, query.filter, query.order, page);
  if (list !== 'myDrafts' && list !== 'returnedToMe') return found;
  // The reviewer's reason travels with the returned revision and with the draft that answers it.
  const items = await Promise.all(
    found.items.map(async (r) => ({
      ...r,
      returnNote: list === 'myDrafts' ? await loadReturnAnswered(db, r) : await loadReturnNote(db, r.dossierId, r.number),
    })),
  );
  return { ...found, items };
}

/** The first page of every Overview list. */
export async function overview(db: Knex, user: SignedInUser, limit: number): Promise<Overview> {
  const pages = await Promise.all(OVERVIEW_LISTS.map((list) => overviewList(db, user, list, { limit })));
  return Object.fromEntries(OVERVIEW_LISTS.map((list, i) => [list, pages[i]])) as Overview;
}
