// Data access of the signing component: the development PKI's row (Knex only here).
import type { Db } from '../db/knex';
import type { PkiStorage } from './dev-pki';

const ROW = 1;

/**
 * The development PKI in the database, for several instances on one PostgreSQL database: the first
 * instance's insert stores it, a concurrent one's loses (ON CONFLICT DO NOTHING) and reads the winner's.
 */
export function databasePkiStorage(db: Db, databaseUrl: string): PkiStorage {
  return {
    id: `${databaseUrl}#dev_pki`,
    async read() {
      const row = await db('dev_pki').where({ id: ROW }).first('pki');
      return (row?.pki as string | undefined) ?? null;
    },
    async createIfAbsent(text) {
      await db('dev_pki').insert({ id: ROW, pki: text, created_at: new Date().toISOString() }).onConflict('id').ignore();
    },
    async replace(text) {
      await db('dev_pki').where({ id: ROW }).update({ pki: text });
    },
  };
}
