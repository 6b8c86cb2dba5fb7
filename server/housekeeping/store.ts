import type { Knex } from 'knex';
import { dialectOf } from '../db/knex';

/**
 * Takes SQLite's write lock at the start of the caller's transaction (a write that changes nothing still
 * takes it), so no upload or approval can commit a row for a file while the sweep decides about it. A
 * PostgreSQL transaction took the shared write lock when it began (server/db/knex.ts).
 */
export async function holdWriteLock(trx: Knex.Transaction): Promise<void> {
  if (dialectOf(trx) === 'sqlite') await trx.raw('DELETE FROM evidence_release WHERE 0');
}

export async function referencedEvidenceFiles(trx: Knex.Transaction): Promise<Set<string>> {
  return new Set((await trx('evidence').distinct('storage_key')).map((r: { storage_key: string }) => r.storage_key));
}

export async function referencedSignedDossiers(trx: Knex.Transaction): Promise<Set<string>> {
  return new Set((await trx('signed_dossier').select('storage_key')).map((r: { storage_key: string }) => r.storage_key));
}

/** When each unreferenced file was released by a draft (its grace period runs from then). */
export async function fileReleases(trx: Knex.Transaction): Promise<Map<string, string>> {
  return new Map(
    (await trx('evidence_release').select('sha256', 'released_at')).map((r: { sha256: string; released_at: string }) => [r.sha256, r.released_at]),
  );
}

export async function forgetReleases(trx: Knex.Transaction, sha256s: string[]): Promise<void> {
  for (let i = 0; i < sha256s.length; i += 500)
    await trx('evidence_release')
      .whereIn('sha256', sha256s.slice(i, i + 500))
      .delete();
}
