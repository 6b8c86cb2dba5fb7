// Data access of the users component (Knex only here).
import type { Knex } from 'knex';
import type { UserRow } from '../auth/store';

type Db = Knex | Knex.Transaction;

export const listUsers = (db: Db) => db<UserRow>('user').orderBy('name');
export const findUser = (db: Db, id: string) => db<UserRow>('user').where({ id }).first();
export const findUserByEmail = (db: Db, email: string) => db<UserRow>('user').where({ email }).first();
export const insertUser = (db: Db, row: UserRow) => db('user').insert(row);
export const updateUser = (db: Db, id: string, changes: Partial<Pick<UserRow, 'role' | 'disabled_at'>>) => db('user').where({ id }).update(changes);
