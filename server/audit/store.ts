import type { Db } from '../db/knex';

/** Every user's display name by id, for naming the actors of audit events. */
export async function userNames(db: Db): Promise<Map<string, string>> {
  return new Map((await db('user').select('id', 'name')).map((u: { id: string; name: string }) => [u.id, u.name]));
}
