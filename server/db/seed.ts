import { randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import type { Logger } from 'pino';
import { hashPassword } from '../auth/passwords';
import type { Db } from './knex';
import { seedDemoDossiers } from './seed-dossiers';

export const DEMO_PASSWORD = 'voltfall-demo';

export const DEMO_USERS = [
  { email: 'admin@fennel.test', name: 'Ada Okafor', role: 'admin' },
  { email: 'engineer@fennel.test', name: 'Jonas Lindqvist', role: 'engineer' },
  { email: 'engineer2@fennel.test', name: 'Priya Raman', role: 'engineer' },
  { email: 'reviewer@fennel.test', name: 'Marta Kowalczyk', role: 'reviewer' },
  { email: 'viewer@fennel.test', name: 'Tomás Ibarra', role: 'viewer' },
] as const;

const hasUsers = async (db: Db | Knex.Transaction) => Number((await db('user').count({ n: '*' }).first())?.n ?? 0) > 0;

/**
 * The invented Fennel Grid Labs scenario, written only into an empty database and never in production.
 * Instances that start together on one database seed it once: the write transaction holds the write
 * lock, and the database is checked again inside it.
 */
export async function seedDemo(db: Db, log?: Logger): Promise<void> {
  if (await hasUsers(db)) return;
  const hash = await hashPassword(DEMO_PASSWORD);
  const now = new Date().toISOString();
  const ids: Record<string, string> = {};
  const seeded = await db.transaction(async (trx) => {
    if (await hasUsers(trx)) return false;
    for (const user of DEMO_USERS) {
      const id = randomUUID();
      ids[user.role === 'engineer' && user.email.startsWith('engineer2') ? 'engineer2' : user.role] = id;
      await trx('user').insert({ id, ...user, password_hash: hash, disabled_at: null, created_at: now });
    }
    await seedDemoDossiers(trx, ids);
    return true;
  });
  if (seeded) log?.info('seeded the demo scenario (Fennel Grid Labs)');
}
