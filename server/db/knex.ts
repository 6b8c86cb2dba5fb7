import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import knexFactory, { type Knex } from 'knex';
import { migrationSource } from './migration-source';

export type Db = Knex;

export function databaseFile(dataDir: string): string {
  return join(dataDir, 'voltfall.sqlite3');
}

export function knexConfig(file: string, busyTimeoutMs = 5_000): Knex.Config {
  return {
    client: 'better-sqlite3',
    connection: { filename: file },
    useNullAsDefault: true,
    pool: {
      min: 1,
      max: 1,
      // SQLite settings are per connection, so they are applied as each one opens.
      afterCreate(conn: { pragma: (s: string) => unknown }, done: (err: Error | null, conn: unknown) => void) {
        conn.pragma('journal_mode = WAL');
        conn.pragma('foreign_keys = ON');
        // A writer waits this long for another connection's lock; after that the request answers 503.
        conn.pragma(`busy_timeout = ${Math.round(busyTimeoutMs)}`);
        conn.pragma('synchronous = NORMAL');
        done(null, conn);
      },
    },
    migrations: { migrationSource },
  };
}

export async function openDatabase(dataDir: string, busyTimeoutMs?: number): Promise<Db> {
  mkdirSync(dataDir, { recursive: true });
  const db = knexFactory(knexConfig(databaseFile(dataDir), busyTimeoutMs));
  await db.migrate.latest();
  return db;
}
