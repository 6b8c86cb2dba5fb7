import type { Knex } from 'knex';

type Db = Knex | Knex.Transaction;

/** True when some evidence row (of any revision, frozen ones included) still points at the stored file. */
export async function fileIsReferenced(db: Db, storageKey: string): Promise<boolean> {
  return Boolean(await db('evidence').where({ storage_key: storageKey }).first('id'));
}

/** Starts the grace period of a stored file that no evidence row references any more. */
export async function markFileReleased(db: Db, storageKey: string): Promise<void> {
  await db('evidence_release').insert({ sha256: storageKey, released_at: new Date().toISOString() }).onConflict('sha256').merge();
}

/** An evidence row with the status of its revision, for deciding who may download it. */
export function findEvidenceWithStatus(db: Db, id: number) {
  return db('evidence')
    .join('revision', 'revision.id', 'evidence.revision_id')
    .where('evidence.id', id)
    .first('evidence.*', 'revision.status as revision_status');
}
