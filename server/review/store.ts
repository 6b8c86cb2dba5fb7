import type { Knex } from 'knex';
import type { ReviewQueueItem } from '../../shared/schema/api';
import type { Page, PageQuery } from '../../shared/schema/lists';
import type { SignedInUser } from '../auth/middleware';
import { revisionSummaries } from '../revisions/store';

/** Revisions awaiting a decision, oldest submission first; `mayDecide` says whether this user may decide each one. */
export async function reviewQueue(db: Knex, user: SignedInUser, page: PageQuery): Promise<Page<ReviewQueueItem>> {
  const summaries = await revisionSummaries(db, { status: ['in_review'] }, 'submitted-asc', page);
  return { ...summaries, items: summaries.items.map((r) => ({ ...r, mayDecide: user.role === 'reviewer' && r.author.id !== user.id })) };
}
