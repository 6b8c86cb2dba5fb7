import type { Db } from '../db/knex';
import type { RevisionStatus } from '../../shared/schema/workflow';

/** What naming and choosing a revision's PDF needs: its status, its number and its dossier. */
export function findPdfSubject(db: Db, revisionId: number): Promise<{ status: RevisionStatus; number: number; dossier_id: number } | undefined> {
  return db('revision')
    .join('dossier', 'dossier.id', 'revision.dossier_id')
    .where('revision.id', revisionId)
    .first('revision.status', 'revision.number', 'dossier.id as dossier_id');
}
