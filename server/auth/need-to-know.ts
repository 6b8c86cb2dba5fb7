// Need-to-know for viewers (external assessors, managers): approved work only. Anything else answers
// 404 to them, as if it did not exist, so a viewer cannot even learn that a draft is there.
import type { Knex } from 'knex';
import type { RevisionStatus } from '../../shared/schema/workflow';
import { notFound } from '../errors';
import type { SignedInUser } from './middleware';

export const seesOnlyApproved = (user: SignedInUser) => user.role === 'viewer';

export const maySee = (user: SignedInUser, status: RevisionStatus) => !seesOnlyApproved(user) || status === 'approved';

/** 404 for a revision (or its evidence, diff or PDF) this user may not see. */
export function assertMaySee(user: SignedInUser, status: RevisionStatus, what = 'Revision'): void {
  if (!maySee(user, status)) throw notFound(what);
}

/** Narrows a revision query to what the user may see; `column` names the revision status column. */
export function visibleRevisions<Q extends Knex.QueryBuilder>(user: SignedInUser, query: Q, column = 'revision.status'): Q {
  return seesOnlyApproved(user) ? (query.where(column, 'approved') as Q) : query;
}
